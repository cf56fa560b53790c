"""Names, units and one-line meanings of every derived quantity, and the doc tables.

:data:`COLUMNS` is the single table the derivation's ``units`` and
``notes`` are drawn from, and from which ``docs/derivation.md`` gets its
glossary; :func:`assumptions_markdown` writes the assumption table of the
same document from :data:`ranker.assumptions.ASSUMPTIONS`. Regenerate the
generated blocks of the document with::

    python -m ranker.derive.write_docs docs/derivation.md
"""

from __future__ import annotations

from collections.abc import Iterable
from pathlib import Path

from ..assumptions import ASSUMPTIONS, Assumption
from ..builtin import BUILTIN_CRITERIA
from .needs import NEEDS

#: Assumption groups the derivation reads, in document order.
DERIVATION_GROUPS = ("time", "adoption", "energy", "sizing", "cost", "revenue", "readiness")

_M = "m g (climb_ft + descent_ft) / 2 x (1 / drivetrain_efficiency - regen_fraction)"

#: Column name to (unit, one-line formula or meaning), for ``sizing``, ``adoption`` and the
#: derived criteria.
COLUMNS: dict[str, tuple[str, str]] = {
    # -- energy per pass --------------------------------------------------------------------
    "climb_ft": ("[ft]", "Total ascent in one direction as used (0 where not given)."),
    "descent_ft": (
        "[ft]",
        "Total descent in the same direction as used (climb_ft where not given).",
    ),
    "flat_energy_kwh": (
        "[kWh]",
        "Level-road energy of one full-length pass: energy_kwh_per_mi x length_mi.",
    ),
    "climb_energy_kwh": (
        "[kWh]",
        f"Extra energy of terrain per pass, mean of both directions: {_M}.",
    ),
    "energy_per_pass_kwh": (
        "[kWh]",
        "Battery energy of one pass: flat_energy_kwh + climb_energy_kwh.",
    ),
    "terrain_penalty": (
        "[-]",
        "Extra energy of terrain as a share of flat-road energy: "
        "climb_energy_kwh / flat_energy_kwh (criterion).",
    ),
    # -- sizing -----------------------------------------------------------------------------
    "trucks_per_day_target": (
        "[trucks/day]",
        "trucks_per_day x (1 + truck_traffic_growth_rate)^(target_year - analysis_year).",
    ),
    "electric_share_target": (
        "[-]",
        "Electric share of the trucks on the road in target_year, from the adoption path.",
    ),
    "electric_trucks_per_day": ("[trucks/day]", "trucks_per_day_target x electric_share_target."),
    "en_route_kwh_per_day": (
        "[kWh/day]",
        "electric_trucks_per_day x energy_per_pass_kwh x en_route_share.",
    ),
    "sessions_per_day": ("[sessions/day]", "en_route_kwh_per_day / session_kwh."),
    "sites": ("[-]", "Charging sites: max(1, ceil(length_mi / site_spacing_mi))."),
    "ports_energy": (
        "[-]",
        "Ports by energy balance: ceil(en_route_kwh_per_day / "
        "(charger_power_kw x operating_hours_per_day x target_utilization)).",
    ),
    "peak_arrivals_per_site_h": (
        "[1/h]",
        "Busiest-hour arrivals per site: sessions_per_day x peak_hour_share / sites.",
    ),
    "session_hours": ("[h]", "Mean charging session: session_kwh / charger_power_kw."),
    "offered_load_erlang": (
        "[Erlang]",
        "Peak-hour load per site: peak_arrivals_per_site_h x session_hours.",
    ),
    "ports_per_site_queue": (
        "[-]",
        "Fewest ports per site meeting the queue target (Erlang C, M/M/c; queue_metric).",
    ),
    "ports_queue": ("[-]", "Ports by queueing: sites x ports_per_site_queue."),
    "ports_minimum": ("[-]", "Coverage minimum: sites x min_ports_per_site."),
    "ports": ("[-]", "Ports built: max(ports_energy, ports_queue, ports_minimum)."),
    "governing_rule": ("[-]", "Rule that set ports: energy, queue or minimum."),
    "wait_probability": (
        "[-]",
        "Peak-hour Erlang C probability that an arriving truck waits, at the least-equipped site.",
    ),
    "mean_wait_min": ("[min]", "Peak-hour mean wait before charging, at the least-equipped site."),
    "planned_utilization": (
        "[-]",
        "Share of open hours the ports deliver at full power: "
        "en_route_kwh_per_day / (ports x charger_power_kw x "
        "operating_hours_per_day).",
    ),
    # -- grid and cost ----------------------------------------------------------------------
    "peak_load_mw": (
        "[MW]",
        "New peak charging load: ports x charger_power_kw x coincidence_factor / 1000.",
    ),
    "grid_upgrade_mw": ("[MW]", "Load above headroom: max(0, peak_load_mw - grid_headroom_mw)."),
    "ports_cost_usd": ("[USD]", "ports x port_cost_usd."),
    "sites_cost_usd": ("[USD]", "sites x site_cost_usd."),
    "grid_upgrade_cost_usd": ("[USD]", "grid_upgrade_mw x grid_upgrade_usd_per_mw."),
    "grid_headroom_mw": ("[MW]", "Spare grid capacity for new load, as given on Corridors."),
    "capital_cost_usd": ("[USD]", "ports_cost_usd + sites_cost_usd + grid_upgrade_cost_usd."),
    "headroom_ratio": ("[-]", "grid_headroom_mw / peak_load_mw (1 = the new load just fits)."),
    # -- revenue ----------------------------------------------------------------------------
    "en_route_kwh_first_year": (
        "[kWh/yr]",
        "En-route energy sold in analysis_year: 365 x "
        "trucks_per_day x electric_share x energy_per_pass_kwh x "
        "en_route_share, at most energy_capacity_kwh_per_yr.",
    ),
    "en_route_kwh_horizon": (
        "[kWh]",
        "En-route energy sold over the horizon, undiscounted, each year at most "
        "energy_capacity_kwh_per_yr.",
    ),
    "margin_npv_usd": (
        "[USD]",
        "NPV at discount_rate of (charging_price_usd_per_kwh - "
        "energy_cost_usd_per_kwh) x yearly kWh; analysis_year undiscounted.",
    ),
    "demand_charge_npv_usd": (
        "[USD]",
        "NPV of 12 x demand_charge_usd_per_kw_month x peak_load_mw x 1000 per year.",
    ),
    "revenue_npv_usd": (
        "[USD]",
        "margin_npv_usd - demand_charge_npv_usd - operating_cost_npv_usd.",
    ),
    "operating_cost_npv_usd": (
        "[USD]",
        "NPV of ports x port_opex_usd_per_yr per year over the horizon.",
    ),
    "energy_capacity_kwh_per_yr": (
        "[kWh/yr]",
        "ports x charger_power_kw x operating_hours_per_day x 365 x utilization_ceiling: the "
        "most the sized ports sell in a year.",
    ),
    "energy_capped_from_year": (
        "[year]",
        "First year in which the trucks would buy more than the ports can deliver (blank: never).",
    ),
    "energy_capped_last_year": (
        "[year]",
        "Last year of the horizon in which the cap binds (blank: never).",
    ),
    "energy_capped_kwh_horizon": (
        "[kWh]",
        "Energy over the horizon the trucks would buy but the sized ports cannot deliver.",
    ),
    # -- readiness --------------------------------------------------------------------------
    "policy_readiness": (
        "[0-100]",
        "Mileage-weighted readiness: sum(miles x readiness) / "
        "sum(miles) over the corridor's Corridor miles rows (criterion).",
    ),
    "jurisdiction_miles": ("[mi]", "Sum of the corridor's miles on Corridor miles."),
    "jurisdictions": ("[-]", "Jurisdictions the corridor crosses."),
    "miles_gap": ("[-]", "|jurisdiction_miles - length_mi| / length_mi."),
    # -- criteria (values), from the registry ------------------------------------------------
    **{
        k: (c.unit, f"Criterion ({c.direction}): {c.column}.")
        for k, c in BUILTIN_CRITERIA.items()
        if c.column != k
    },
    # -- adoption path (one row per year) ---------------------------------------------------
    "year": ("[year]", "Calendar year; the first row is analysis_year."),
    "electric_share": ("[-]", "Electric share of the heavy trucks on the road (the stock)."),
    "new_sales_share": (
        "[-]",
        "Electric share of new heavy-truck sales (first row: the "
        "analysis-year stock is given by initial_electric_share).",
    ),
    "fleet_index": (
        "[-]",
        "Trucks on the road relative to analysis_year: (1 + fleet_growth_rate)^t.",
    ),
    "new_sales_index": (
        "[1/yr]",
        "New trucks per year relative to the analysis-year fleet (replacements + growth).",
    ),
    "electric_sales_index": (
        "[1/yr]",
        "New electric trucks per year relative to the analysis-year fleet.",
    ),
    "extrapolated": (
        "[-]",
        "True where the year is outside the Adoption table (value held flat).",
    ),
    "ev_price_usd": ("[USD]", "Electric tractor price (cost_logit; price_path)."),
    "annual_cost_ev_usd": (
        "[USD/yr]",
        "Electric tractor yearly cost: price x CRF(discount_rate,"
        " service_life_years) + electricity_price_usd_per_kwh x "
        "energy_kwh_per_mi x annual_miles.",
    ),
    "annual_cost_diesel_usd": (
        "[USD/yr]",
        "Diesel tractor yearly cost: price x CRF + "
        "diesel_price_usd_per_gal / diesel_mpg x annual_miles.",
    ),
    "cumulative_electric_sales_index": (
        "[-]",
        "Electric trucks sold so far (before the year), "
        "relative to the analysis-year fleet; starts at "
        "initial_electric_share.",
    ),
    "traffic_index": (
        "[-]",
        "Truck traffic relative to analysis_year: (1 + truck_traffic_growth_rate)^t.",
    ),
    "in_horizon": ("[-]", "True for the horizon_years counted in charging_revenue."),
    "discount_factor": (
        "[-]",
        "(1 + discount_rate)^-t, t = year - analysis_year, in the horizon.",
    ),
}


def _cell(text: object) -> str:
    return str(text).replace("|", "\\|")


def _allowed(a: Assumption) -> str:
    if a.choices:
        return ", ".join(a.choices)
    if a.kind == "bool":
        return "yes, no"
    if a.low is None and a.high is None:
        return "any"
    lo = "-inf" if a.low is None else f"{a.low:g}"
    hi = "inf" if a.high is None else f"{a.high:g}"
    return f"{'(' if a.low_open else '['}{lo}, {hi}]"


def _default(a: Assumption) -> str:
    big = isinstance(a.default, float) and abs(a.default) >= 1e4
    return f"{a.default:,}" if big else str(a.default)


def assumptions_markdown(groups: Iterable[str] = DERIVATION_GROUPS) -> str:
    """Return the Markdown table of the assumption keys of ``groups``, in registry order.

    Parameters
    ----------
    groups : iterable of str
        Assumption groups to include.

    Returns
    -------
    str
        One table: key, group, default, unit, allowed values, note.

    Examples
    --------
    >>> assumptions_markdown(["time"]).splitlines()[0]
    '| key | group | default | unit | allowed | note |'
    """
    groups = tuple(groups)
    lines = [
        "| key | group | default | unit | allowed | note |",
        "| --- | --- | --- | --- | --- | --- |",
    ]
    for a in ASSUMPTIONS.values():
        if a.group in groups:
            lines.append(
                f"| `{a.key}` | {a.group} | {_cell(_default(a))} | {_cell(a.unit)} | "
                f"{_cell(_allowed(a))} | {_cell(a.note)} |"
            )
    return "\n".join(lines) + "\n"


def glossary_markdown() -> str:
    """Return the Markdown glossary of :data:`COLUMNS`: name, unit, meaning.

    Examples
    --------
    >>> glossary_markdown().splitlines()[0]
    '| name | unit | meaning |'
    """
    lines = ["| name | unit | meaning |", "| --- | --- | --- |"]
    lines += [f"| `{k}` | {_cell(u)} | {_cell(n)} |" for k, (u, n) in COLUMNS.items()]
    return "\n".join(lines) + "\n"


def needs_markdown() -> str:
    """Return the Markdown table of what each built-in criterion needs.

    Examples
    --------
    >>> needs_markdown().splitlines()[0]
    '| criterion | sheet | fields |'
    """
    lines = ["| criterion | sheet | fields |", "| --- | --- | --- |"]
    for key, needs in NEEDS.items():
        for sheet, fields in needs:
            lines.append(f"| `{key}` | {sheet} | {', '.join(f'`{f}`' for f in fields)} |")
    return "\n".join(lines) + "\n"


#: Generated block name to the function writing it.
BLOCKS = {
    "needs": needs_markdown,
    "assumptions": assumptions_markdown,
    "glossary": glossary_markdown,
}


def generated_block(text: str, name: str) -> str:
    """Return the text between ``<!-- BEGIN name -->`` and ``<!-- END name -->``."""
    begin, end = f"<!-- BEGIN {name} -->\n", f"<!-- END {name} -->"
    start = text.index(begin) + len(begin)
    return text[start : text.index(end, start)]


def update_doc(path: Path) -> None:
    """Rewrite every generated block of the Markdown file at ``path``."""
    text = path.read_text(encoding="utf-8")
    for name, make in BLOCKS.items():
        old = generated_block(text, name)
        text = text.replace(f"<!-- BEGIN {name} -->\n{old}", f"<!-- BEGIN {name} -->\n{make()}")
    path.write_text(text, encoding="utf-8")
