"""Every assumption key: default, unit, allowed range and source, in one table.

The template's ``Assumptions`` sheet is written from this table, the reader
checks typed values against it, and the outputs list it. A source is a
published reference, or "common practice" where the value is a convention of
the trade with no single source.
"""

from __future__ import annotations

import difflib
from dataclasses import dataclass


@dataclass(frozen=True)
class Assumption:
    """One assumption key.

    Attributes
    ----------
    key : str
        Key typed in the ``Assumptions`` sheet (lower case).
    default : object
        Value used when the planner leaves the key out.
    unit : str
        Unit in the one notation of the docs (``[kWh/mi]``, ``[-]``).
    kind : str
        ``"float"``, ``"int"``, ``"choice"`` (one of ``choices``), ``"list"``
        (comma-separated ``choices``), ``"names"`` (comma-separated free text)
        or ``"bool"`` (yes/no).
    note : str
        One line: what it means and where the default comes from.
    group : str
        Section of the table (for the template and the docs).
    low, high : float or None
        Allowed closed range for numbers.
    low_open : bool
        True where ``low`` itself is not allowed (a utilisation of 0).
    choices : tuple of str
        Allowed words for ``choice`` and ``list``.
    """

    key: str
    default: object
    unit: str
    kind: str
    note: str
    group: str
    low: float | None = None
    high: float | None = None
    low_open: bool = False
    choices: tuple[str, ...] = ()


def _a(key, default, unit, kind, note, group, **kw) -> Assumption:
    return Assumption(key, default, unit, kind, note, group, **kw)


_TABLE = [
    # -- time frame -----------------------------------------------------------------------
    _a(
        "analysis_year",
        2027,
        "[year]",
        "int",
        "First year of the analysis: year 0 of the adoption path and of the NPV (undiscounted).",
        "time",
        low=2000,
        high=2100,
    ),
    _a(
        "target_year",
        2035,
        "[year]",
        "int",
        "Design year the chargers are sized for; not before analysis_year (common practice).",
        "time",
        low=2000,
        high=2150,
    ),
    _a(
        "horizon_years",
        15,
        "[years]",
        "int",
        "Years of charging margin counted in the revenue NPV (analysis_year onward); 15 years is a common asset life for DC chargers (common practice).",
        "time",
        low=1,
        high=60,
    ),
    _a(
        "discount_rate",
        0.07,
        "[1/yr]",
        "float",
        "Real discount rate; 7 % is the base rate of US OMB Circular A-4 (2003) and A-94 (1992).",
        "time",
        low=0.0,
        high=0.5,
    ),
    # -- adoption -------------------------------------------------------------------------
    _a(
        "adoption_model",
        "bass",
        "[-]",
        "choice",
        "How the electric share of trucks on the road is forecast: table (Adoption sheet), bass or cost_logit; an Adoption sheet, when present, is used instead.",
        "adoption",
        choices=("table", "bass", "cost_logit"),
    ),
    _a(
        "bass_p",
        0.005,
        "[1/yr]",
        "float",
        "Bass (1969) coefficient of innovation for the electric share of new heavy-truck sales; below the 0.03 mean of Sultan, Farley & Lehmann (1990) for a slow-starting capital good; with the defaults about 0.5 % of 2023 and 1.3 % of 2024 sales are electric (from memory).",
        "adoption",
        low=0.0,
        high=1.0,
        low_open=True,
    ),
    _a(
        "bass_q",
        0.35,
        "[1/yr]",
        "float",
        "Bass (1969) coefficient of imitation; near the 0.38 mean of Sultan, Farley & Lehmann (1990) (from memory).",
        "adoption",
        low=0.0,
        high=2.0,
    ),
    _a(
        "bass_market_potential",
        0.9,
        "[-]",
        "float",
        "Share of new heavy-truck sales electric at saturation; duty cycles beyond battery range keep some diesel (common practice).",
        "adoption",
        low=0.0,
        high=1.0,
        low_open=True,
    ),
    _a(
        "bass_start_year",
        2022,
        "[year]",
        "int",
        "Year electric heavy-truck sales start in the Bass model (t = 0) (common practice).",
        "adoption",
        low=1990,
        high=2100,
    ),
    _a(
        "service_life_years",
        15.0,
        "[years]",
        "float",
        "Mean service life of a heavy truck in the stock-turnover model (Weibull survival) (common practice).",
        "adoption",
        low=1.0,
        high=50.0,
    ),
    _a(
        "survival_shape",
        3.0,
        "[-]",
        "float",
        "Weibull (1951) shape of the truck survival curve: 1 = memoryless, higher = retirements bunch near the mean life (common practice).",
        "adoption",
        low=0.5,
        high=20.0,
    ),
    _a(
        "fleet_growth_rate",
        0.01,
        "[1/yr]",
        "float",
        "Annual growth of the heavy-truck fleet in the stock-turnover model (common practice).",
        "adoption",
        low=-0.5,
        high=0.5,
    ),
    _a(
        "initial_electric_share",
        0.01,
        "[-]",
        "float",
        "Electric share of the trucks on the road in analysis_year; about what the default Bass path leaves in 2027 when run from bass_start_year (computed).",
        "adoption",
        low=0.0,
        high=1.0,
    ),
    _a(
        "ev_truck_price_usd",
        300_000.0,
        "[USD]",
        "float",
        "Battery-electric tractor price in analysis_year (cost_logit) (common practice).",
        "adoption",
        low=0.0,
        low_open=True,
    ),
    _a(
        "diesel_truck_price_usd",
        160_000.0,
        "[USD]",
        "float",
        "Diesel tractor price (cost_logit) (common practice).",
        "adoption",
        low=0.0,
        low_open=True,
    ),
    _a(
        "ev_price_floor_usd",
        180_000.0,
        "[USD]",
        "float",
        "Lowest electric tractor price the decline approaches; not above ev_truck_price_usd (cost_logit) (common practice).",
        "adoption",
        low=0.0,
    ),
    _a(
        "price_path",
        "annual",
        "[-]",
        "choice",
        "How the electric price falls: annual (fixed rate toward the floor) or learning (Wright 1936: by learning_rate per doubling of cumulative electric sales).",
        "adoption",
        choices=("annual", "learning"),
    ),
    _a(
        "ev_price_decline_rate",
        0.07,
        "[1/yr]",
        "float",
        "Annual decline of the electric price's gap above the floor (price_path = annual) (common practice).",
        "adoption",
        low=0.0,
        high=1.0,
    ),
    _a(
        "learning_rate",
        0.15,
        "[-]",
        "float",
        "Drop of the electric price's gap above the floor per doubling of cumulative electric sales (price_path = learning); Wright (1936) form (common practice).",
        "adoption",
        low=0.0,
        high=0.9,
    ),
    _a(
        "electricity_price_usd_per_kwh",
        0.25,
        "[USD/kWh]",
        "float",
        "Price an electric truck operator pays per kWh, blending depot (about 0.17) and en-route charging (cost_logit) (common practice).",
        "adoption",
        low=0.0,
    ),
    _a(
        "diesel_price_usd_per_gal",
        4.0,
        "[USD/gal]",
        "float",
        "Diesel price (cost_logit) (common practice).",
        "adoption",
        low=0.0,
    ),
    _a(
        "diesel_mpg",
        6.5,
        "[mi/gal]",
        "float",
        "Diesel tractor fuel economy (cost_logit) (common practice).",
        "adoption",
        low=0.0,
        low_open=True,
    ),
    _a(
        "annual_miles",
        60_000.0,
        "[mi/yr]",
        "float",
        "Miles a tractor drives per year (cost_logit) (common practice).",
        "adoption",
        low=0.0,
        low_open=True,
    ),
    _a(
        "logit_spread_usd",
        8_000.0,
        "[USD/yr]",
        "float",
        "Scale of the binary logit (McFadden 1974): a yearly cost gap of this size moves the odds by e (cost_logit) (common practice).",
        "adoption",
        low=0.0,
        low_open=True,
    ),
    _a(
        "ev_preference_offset_usd",
        -12_000.0,
        "[USD/yr]",
        "float",
        "Non-cost preference for electric per year (negative = reluctance: range, charging time, payload) (cost_logit) (common practice).",
        "adoption",
    ),
    # -- energy and terrain ---------------------------------------------------------------
    _a(
        "energy_kwh_per_mi",
        1.8,
        "[kWh/mi]",
        "float",
        "Flat-road battery energy of a loaded battery-electric tractor; NACFE Run on Less - Electric DEPOT (2023) reports about 1.7 kWh/mi in regional service; rounded up for highway speed.",
        "energy",
        low=0.0,
        low_open=True,
        high=10.0,
    ),
    _a(
        "gross_weight_lb",
        80_000.0,
        "[lb]",
        "float",
        "Gross combination weight climbing the grades; 80,000 lb is the US federal limit (23 CFR 658.17), a conservative choice for sizing.",
        "energy",
        low=0.0,
        low_open=True,
    ),
    _a(
        "drivetrain_efficiency",
        0.88,
        "[-]",
        "float",
        "Battery-to-wheel efficiency while climbing; 0.85-0.90 is commonly reported (from memory).",
        "energy",
        low=0.0,
        high=1.0,
        low_open=True,
    ),
    _a(
        "regen_fraction",
        0.5,
        "[-]",
        "float",
        "Share of a descent's potential energy returned to the battery, counting the road load it covers while coasting and regenerative braking; conservative (common practice).",
        "energy",
        low=0.0,
        high=1.0,
    ),
    # -- charger sizing -------------------------------------------------------------------
    _a(
        "en_route_share",
        0.3,
        "[-]",
        "float",
        "Share of the corridor's electric-truck energy taken at corridor chargers rather than depots (common practice).",
        "sizing",
        low=0.0,
        high=1.0,
    ),
    _a(
        "truck_traffic_growth_rate",
        0.0,
        "[1/yr]",
        "float",
        "Yearly growth of trucks_per_day after analysis_year, for sizing and revenue; 0 keeps today's counts (common practice).",
        "sizing",
        low=-0.5,
        high=0.5,
    ),
    _a(
        "charger_power_kw",
        350.0,
        "[kW]",
        "float",
        "Power per port; CCS DC fast charging spans 150-350 kW, MCS up to 3,750 kW (CharIN).",
        "sizing",
        low=0.0,
        low_open=True,
        high=4000.0,
    ),
    _a(
        "operating_hours_per_day",
        24.0,
        "[h/day]",
        "float",
        "Hours per day the chargers are open (common practice).",
        "sizing",
        low=0.0,
        high=24.0,
        low_open=True,
    ),
    _a(
        "target_utilization",
        0.25,
        "[-]",
        "float",
        "Planned share of open hours a port delivers at full power; public heavy-duty chargers are often planned at 15-30 % (common practice).",
        "sizing",
        low=0.0,
        high=1.0,
        low_open=True,
    ),
    _a(
        "site_spacing_mi",
        50.0,
        "[mi]",
        "float",
        "Largest distance between charging sites; 50 mi is the US corridor rule for fast-charging sites, 23 CFR 680.106(b) (light-duty; common practice for trucks).",
        "sizing",
        low=0.0,
        low_open=True,
    ),
    _a(
        "min_ports_per_site",
        1,
        "[-]",
        "int",
        "Ports every site gets whatever the traffic (coverage minimum); 2 adds redundancy (common practice).",
        "sizing",
        low=1,
        high=100,
    ),
    _a(
        "session_kwh",
        300.0,
        "[kWh]",
        "float",
        "Energy per en-route charging session, about 20-80 % of a 500 kWh pack (common practice).",
        "sizing",
        low=0.0,
        low_open=True,
    ),
    _a(
        "peak_hour_share",
        0.10,
        "[-]",
        "float",
        "Share of a day's en-route sessions arriving in the busiest hour; near the design-hour K factor of highway design, about 8-12 % of daily traffic (AASHTO Green Book, from memory).",
        "sizing",
        low=0.0,
        high=1.0,
        low_open=True,
    ),
    _a(
        "queue_metric",
        "wait_probability",
        "[-]",
        "choice",
        "Peak-hour queueing target: wait_probability (Erlang C probability that a truck waits) or mean_wait (M/M/c mean wait).",
        "sizing",
        choices=("wait_probability", "mean_wait"),
    ),
    _a(
        "max_wait_probability",
        0.2,
        "[-]",
        "float",
        "Largest acceptable peak-hour probability that an arriving truck waits (queue_metric = wait_probability) (common practice).",
        "sizing",
        low=0.0,
        high=1.0,
        low_open=True,
    ),
    _a(
        "max_mean_wait_min",
        10.0,
        "[min]",
        "float",
        "Largest acceptable peak-hour mean wait (queue_metric = mean_wait) (common practice).",
        "sizing",
        low=0.0,
        low_open=True,
    ),
    # -- capital cost ---------------------------------------------------------------------
    _a(
        "port_cost_usd",
        200_000.0,
        "[USD]",
        "float",
        "Installed cost per 350 kW port: charger, dispenser and cable, and the port's own installation and electrical work; not the site's works (site_cost_usd). Split so that a six-port site totals about 1.73 million USD, recalled as a US DOE/INL evaluation in the US DOT ITS JPO cost database, ID 2017-SC00381 (from memory, unconfirmed; predates most 350 kW hardware).",
        "cost",
        low=0.0,
    ),
    _a(
        "site_cost_usd",
        530_000.0,
        "[USD]",
        "float",
        "Fixed cost per charging site: land preparation, civil works, canopy, switchgear and transformer, and the customer-side service connection; not the ports (port_cost_usd) nor the utility-side upgrade (grid_upgrade_usd_per_mw). With six ports at port_cost_usd the site totals about 1.73 million USD (from memory, unconfirmed).",
        "cost",
        low=0.0,
    ),
    _a(
        "grid_upgrade_usd_per_mw",
        1_000_000.0,
        "[USD/MW]",
        "float",
        "Utility-side upgrade cost per MW of new load above headroom (common practice).",
        "cost",
        low=0.0,
    ),
    _a(
        "coincidence_factor",
        0.8,
        "[-]",
        "float",
        "Share of the ports' rated power drawn at the same time at the peak (Kersting, Distribution System Modeling and Analysis: coincidence factor) (common practice).",
        "cost",
        low=0.0,
        high=1.0,
        low_open=True,
    ),
    # -- revenue --------------------------------------------------------------------------
    _a(
        "charging_price_usd_per_kwh",
        0.45,
        "[USD/kWh]",
        "float",
        "Price charged to trucks at corridor chargers (common practice).",
        "revenue",
        low=0.0,
    ),
    _a(
        "energy_cost_usd_per_kwh",
        0.15,
        "[USD/kWh]",
        "float",
        "Energy cost to the charging operator (common practice).",
        "revenue",
        low=0.0,
    ),
    _a(
        "demand_charge_usd_per_kw_month",
        15.0,
        "[USD/kW-month]",
        "float",
        "Utility demand charge on the corridor's peak load, billed 12 times a year; US commercial tariffs commonly charge about 5 to 30 USD/kW-month (from memory, unconfirmed; use your utility's tariff). The US DOE Alternative Fuels Data Center notes DC fast charging is likely to trigger demand charges.",
        "revenue",
        low=0.0,
    ),
    _a(
        "port_opex_usd_per_yr",
        6_000.0,
        "[USD/yr]",
        "float",
        "Operating cost per port per year: maintenance and repairs, network and software fees. The US DOE Alternative Fuels Data Center suggests budgeting up to 400 USD a year per (light-duty) charger for maintenance alone, before network fees and repairs; for 350 kW heavy-duty ports about 3,000 to 10,000 USD a year (from memory, unconfirmed).",
        "revenue",
        low=0.0,
    ),
    _a(
        "utilization_ceiling",
        0.30,
        "[-]",
        "float",
        "Largest share of open hours a sized port can deliver at full power; energy sold in a year is capped at ports x power x hours x this share (upper end of the 15-30 % planning range, common practice). Sales above it would need ports the capital cost does not include.",
        "revenue",
        low=0.0,
        high=1.0,
        low_open=True,
    ),
    # -- policy readiness -----------------------------------------------------------------
    _a(
        "miles_warn_tolerance",
        0.02,
        "[-]",
        "float",
        "Relative gap between a corridor's Corridor miles total and its length_mi above which a warning is given (common practice).",
        "readiness",
        low=0.0,
        high=1.0,
    ),
    _a(
        "miles_error_tolerance",
        0.10,
        "[-]",
        "float",
        "Relative gap above which the run stops with an error; not below miles_warn_tolerance (common practice).",
        "readiness",
        low=0.0,
        high=1.0,
    ),
    # -- scoring --------------------------------------------------------------------------
    _a(
        "primary_method",
        "topsis",
        "[-]",
        "choice",
        "Method whose score decides rank.",
        "scoring",
        choices=("topsis", "weighted_sum", "weighted_product", "vikor"),
    ),
    _a(
        "methods",
        "topsis, weighted_sum",
        "[-]",
        "list",
        "Methods run side by side (comma-separated).",
        "scoring",
        choices=("topsis", "weighted_sum", "weighted_product", "vikor"),
    ),
    _a(
        "grid_headroom_full_credit_at",
        2.0,
        "[-]",
        "float",
        "Headroom ratio at which grid_headroom stops earning credit when its Criteria full_credit_at is blank: headroom beyond twice the new peak load counts as twice (common practice: the load fits with margin); 0 = no level.",
        "scoring",
        low=0.0,
    ),
    _a(
        "topsis_normalization",
        "vector",
        "[-]",
        "choice",
        "Normalisation before TOPSIS; vector is Hwang & Yoon (1981).",
        "scoring",
        choices=("vector", "minmax", "sum", "max"),
    ),
    _a(
        "weighted_sum_normalization",
        "minmax",
        "[-]",
        "choice",
        "Normalisation before the weighted sum.",
        "scoring",
        choices=("vector", "minmax", "sum", "max"),
    ),
    _a(
        "vikor_v",
        0.5,
        "[-]",
        "float",
        "VIKOR weight of the group-utility strategy; 0.5 per Opricovic & Tzeng (2004).",
        "scoring",
        low=0.0,
        high=1.0,
    ),
    _a(
        "rank_weights",
        "roc",
        "[-]",
        "choice",
        "How rank-order weight columns become weights: roc (Barron & Barrett 1996), rank_sum or reciprocal.",
        "scoring",
        choices=("roc", "rank_sum", "reciprocal"),
    ),
    # -- robustness -----------------------------------------------------------------------
    _a(
        "weight_sampling",
        "dirichlet",
        "[-]",
        "choice",
        "Weight sampling for rank acceptability: dirichlet (around the chosen set) or uniform (whole simplex).",
        "robustness",
        choices=("dirichlet", "uniform"),
    ),
    _a(
        "weight_concentration",
        50.0,
        "[-]",
        "float",
        "Dirichlet concentration: alpha = concentration x weights x number of criteria; larger = tighter around the chosen set (common practice).",
        "robustness",
        low=0.0,
        low_open=True,
    ),
    _a(
        "tier_confidence",
        0.9,
        "[-]",
        "float",
        "Share of samples in which every corridor of a higher tier must rank above every corridor of a lower tier; inside a tier the order is not settled (common practice: a 90% level).",
        "robustness",
        low=0.5,
        high=1.0,
        low_open=True,
    ),
    # -- phasing --------------------------------------------------------------------------
    _a(
        "budget_carry_over",
        "yes",
        "[-]",
        "bool",
        "Whether unspent capital carries into the next year of the plan.",
        "phasing",
    ),
    _a(
        "allow_split",
        "no",
        "[-]",
        "bool",
        "Whether a corridor may be funded across several years.",
        "phasing",
    ),
    _a(
        "plan_objective",
        "score",
        "[-]",
        "choice",
        "What the optimised plan maximises: score (weighted score delivered) or truck_miles (electric truck-miles served).",
        "phasing",
        choices=("score", "truck_miles"),
    ),
    _a(
        "coverage_endpoints",
        "",
        "[-]",
        "names",
        "Places the coverage view must see joined by funded corridors, comma-separated; "
        "empty = every place named in the Corridors connects column.",
        "phasing",
    ),
]

#: Key to :class:`Assumption`, in table order.
ASSUMPTIONS: dict[str, Assumption] = {a.key: a for a in _TABLE}

#: Former key to the key that replaced it. A workbook written before a key was
#: renamed still reads: the former name gives the same value to the new key.
ALIASES: dict[str, str] = {
    "station_spacing_mi": "site_spacing_mi",
    "min_ports_per_station": "min_ports_per_site",
}


def current_key(key: str) -> str:
    """Return the key that ``key`` now goes by (``key`` itself unless renamed).

    Examples
    --------
    >>> current_key("station_spacing_mi"), current_key("site_cost_usd")
    ('site_spacing_mi', 'site_cost_usd')
    """
    return ALIASES.get(key, key)


def suggest(key: str) -> str | None:
    """Return the known key nearest to ``key``, or None if nothing is close."""
    near = difflib.get_close_matches(key, ASSUMPTIONS, n=1, cutoff=0.6)
    return near[0] if near else None


def _current(values: dict[str, object]) -> dict[str, object]:
    """Return ``values`` under the current keys; a former and a current name must agree."""
    out: dict[str, object] = {}
    named: dict[str, str] = {}
    for key, value in values.items():
        new = current_key(key)
        if new in out and out[new] != value:
            raise ValueError(
                f"{named[new]} and {key} name the same assumption ({new}) with different "
                f"values ({out[new]!r} and {value!r}); give it once"
            )
        out[new], named[new] = value, key
    return out


def resolve(given: dict[str, object], overrides: dict[str, object] | None = None) -> dict:
    """Return every key's value: defaults, then ``given``, then ``overrides``.

    Values in ``given`` and ``overrides`` are already typed by the reader;
    ``list`` values are tuples of words and ``bool`` values are bools. A
    former key name (:data:`ALIASES`) sets the key that replaced it.

    Raises
    ------
    ValueError
        Where ``given`` (or ``overrides``) names a key under its former and
        its current name with different values.
    """
    values = {k: parse_default(a) for k, a in ASSUMPTIONS.items()}
    values.update(_current(given))
    if overrides:
        values.update(_current(overrides))
    return values


def parse_default(a: Assumption) -> object:
    """Return an assumption's default in its typed form."""
    if a.kind in ("list", "names"):
        return tuple(w.strip() for w in str(a.default).split(",") if w.strip())
    if a.kind == "bool":
        return str(a.default).lower() == "yes"
    return a.default
