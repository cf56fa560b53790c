"""Run the derivation: check the inputs, run the models in order, collect every number.

Data flow, one module per model::

    needs     what each criterion needs; every missing input in one error
    adoption  electric share of the trucks on the road, year by year
              (stock: vintage turnover; choice: prices and logit; finance: NPV, CRF)
    energy    battery energy of one truck pass: flat road + terrain
    sizing    sites and ports for target_year (energy balance, Erlang C)
    grid      new peak load, upgrade above headroom, headroom ratio
    costs     capital cost: ports, sites, grid upgrade
    revenue   NPV of the charging margin along the adoption path
    readiness mileage-weighted readiness of the jurisdictions crossed
    glossary  unit and meaning of every column; the tables of docs/derivation.md

:func:`derive_criteria` checks what the requested criteria need (one
``InputError`` listing everything missing), runs the models, and returns a
:class:`Derivation` holding the criteria, every intermediate number, the
adoption path, and the unit and meaning of every column.
:func:`energy_cap_warnings` turns the years the ports cap the energy sold
into a warning record (:data:`ranker.input_warnings.WARNING_KINDS`).
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field
from functools import cached_property
from typing import TYPE_CHECKING

import numpy as np

from ..builtin import BUILTIN_CRITERIA
from ..errors import Problems
from ..input_warnings import warning
from ..workbook.tables import Inputs
from .adoption import adoption_path
from .costs import capital_cost_unit_rates
from .energy import (
    climb_energy_two_way,
    flat_energy_per_mile,
    terrain_penalty_energy_ratio,
)
from .finance import discount_factor_compound
from .glossary import COLUMNS
from .grid import grid_upgrade_excess, headroom_ratio_peak, peak_load_coincidence
from .needs import Checked, check_inputs
from .readiness import policy_readiness
from .revenue import (
    demand_charge_npv_peak,
    en_route_energy_per_year,
    energy_sold_capped,
    margin_npv_charging,
    operating_cost_npv_ports,
    port_energy_capacity,
)
from .sizing import charger_sizing

if TYPE_CHECKING:  # annotations only: DataFrames are built on request (Derivation.sizing)
    import pandas as pd

#: Built-in criterion key to its direction (from :data:`ranker.builtin.BUILTIN_CRITERIA`).
BUILT_IN: dict[str, str] = {k: c.direction for k, c in BUILTIN_CRITERIA.items()}

#: Built-in criterion key to the ``sizing`` column holding its value.
CRITERION_COLUMN: dict[str, str] = {k: c.column for k, c in BUILTIN_CRITERIA.items()}


@dataclass
class Derivation:
    """Derived criteria with everything behind them.

    The numbers are numpy arrays (``columns``, ``path``); :attr:`values`,
    :attr:`sizing` and :attr:`adoption` are the same numbers as DataFrames,
    built on first use (``ranker check`` never builds them).

    Attributes
    ----------
    ids : list
        Corridor ids in sheet order (the rows of every column).
    columns : dict of str to ndarray
        Every intermediate number per corridor (energy per pass, sizing,
        grid, cost parts, revenue parts, readiness check), the criteria
        among them (:data:`CRITERION_COLUMN`), in the order derived.
    criteria : list of str
        The criteria asked, in the order asked.
    path : dict of str to ndarray
        The adoption path, one value per year from ``analysis_year`` to the
        later of ``target_year`` and the last horizon year; empty when no
        criterion needs the sizing.
    units : dict of str to str
        Column name (``values``, ``sizing`` and ``adoption``) to unit, like
        ``"[kWh/day]"``.
    notes : dict of str to str
        Column name to a one-line formula or meaning.
    warnings : list of dict
        Doubtful but legal input met while deriving: records ``{"kind", ...}``
        of :data:`ranker.input_warnings.WARNING_KINDS`; the words are
        :func:`ranker.report.narrative.input_warnings`.
    """

    ids: list
    columns: dict[str, np.ndarray]
    criteria: list[str]
    path: dict[str, np.ndarray] = field(default_factory=dict)
    units: dict[str, str] = field(default_factory=dict)
    notes: dict[str, str] = field(default_factory=dict)
    warnings: list[dict] = field(default_factory=list)

    def value(self, key: str) -> np.ndarray:
        """Return the derived criterion ``key`` of every corridor [its unit]."""
        return self.columns[CRITERION_COLUMN[key]]

    @cached_property
    def sizing(self) -> pd.DataFrame:
        """:attr:`columns` as a DataFrame, index ``corridor_id``."""
        import pandas as pd

        return pd.DataFrame(
            self.columns, index=pd.Index(self.ids, dtype=object, name="corridor_id")
        )

    @cached_property
    def values(self) -> pd.DataFrame:
        """The criteria asked as a DataFrame, index ``corridor_id``, in the order asked."""
        import pandas as pd

        sizing = self.sizing
        return pd.DataFrame(
            {k: sizing[CRITERION_COLUMN[k]] for k in self.criteria}, index=sizing.index
        )

    @cached_property
    def adoption(self) -> pd.DataFrame:
        """:attr:`path` as a DataFrame, one row per year (empty without sizing)."""
        import pandas as pd

        return pd.DataFrame(self.path) if self.path else pd.DataFrame()


def _energy(plan: Checked, a: dict) -> dict[str, np.ndarray]:
    f = plan.fields
    flat = flat_energy_per_mile(f["length_mi"], energy_kwh_per_mi=a["energy_kwh_per_mi"])
    climb = climb_energy_two_way(
        f["climb_ft"],
        f["descent_ft"],
        gross_weight_lb=a["gross_weight_lb"],
        drivetrain_efficiency=a["drivetrain_efficiency"],
        regen_fraction=a["regen_fraction"],
    )
    return {
        "climb_ft": f["climb_ft"],
        "descent_ft": f["descent_ft"],
        "flat_energy_kwh": flat,
        "climb_energy_kwh": climb,
        "energy_per_pass_kwh": flat + climb,
        "terrain_penalty": terrain_penalty_energy_ratio(climb, flat),
    }


def _adoption(inputs: Inputs, plan: Checked, a: dict) -> dict[str, np.ndarray]:
    start, horizon = int(a["analysis_year"]), int(a["horizon_years"])
    end = max(int(a["target_year"]), start + horizon - 1)
    path = adoption_path(
        model=plan.adoption_model, assumptions=a, end_year=end, table=inputs.adoption
    )
    plan.warnings.extend(path.warnings)
    cols = dict(path.columns)
    t = cols["year"] - start
    cols["traffic_index"] = (1.0 + a["truck_traffic_growth_rate"]) ** t
    cols["in_horizon"] = t < horizon
    cols["discount_factor"] = np.where(
        t < horizon, discount_factor_compound(t, rate_per_yr=a["discount_rate"]), np.nan
    )
    return cols


def _size(plan: Checked, a: dict, energy: dict, path: dict) -> dict[str, np.ndarray]:
    """Charging sites and ports for ``target_year`` (energy balance and Erlang C)."""
    f = plan.fields
    at = int(np.flatnonzero(path["year"] == int(a["target_year"]))[0])
    share = path["electric_share"][at]
    tpd_target = f["trucks_per_day"] * path["traffic_index"][at]
    out = {
        "trucks_per_day_target": tpd_target,
        "electric_share_target": np.full(tpd_target.size, share),
    }
    out.update(
        charger_sizing(
            length_mi=f["length_mi"],
            trucks_per_day=tpd_target,
            electric_share=float(share),
            energy_kwh_per_pass=energy["energy_per_pass_kwh"],
            assumptions=a,
        )
    )
    return out


def _grid_and_cost(plan: Checked, a: dict, sized: dict) -> dict[str, np.ndarray]:
    """New peak load, grid upgrade above headroom, headroom ratio and capital cost."""
    out = {
        "peak_load_mw": peak_load_coincidence(
            sized["ports"],
            charger_power_kw=a["charger_power_kw"],
            coincidence_factor=a["coincidence_factor"],
        )
    }
    headroom = plan.fields.get("grid_headroom_mw")
    given = headroom is not None and bool(np.isfinite(headroom).all())
    upgrade = grid_upgrade_excess(out["peak_load_mw"], headroom) if given else np.nan
    cost = capital_cost_unit_rates(
        sized["ports"],
        sized["sites"],
        upgrade,
        port_cost_usd=a["port_cost_usd"],
        site_cost_usd=a["site_cost_usd"],
        grid_upgrade_usd_per_mw=a["grid_upgrade_usd_per_mw"],
    )
    out.update({"ports_cost_usd": cost.ports, "sites_cost_usd": cost.sites})
    if given:
        out.update(
            {
                "grid_headroom_mw": headroom,
                "grid_upgrade_mw": upgrade,
                "grid_upgrade_cost_usd": cost.grid_upgrade,
                "capital_cost_usd": cost.total,
                "headroom_ratio": headroom_ratio_peak(headroom, out["peak_load_mw"]),
            }
        )
    return out


def _revenue(
    plan: Checked, a: dict, energy: dict, path: dict, sized: dict
) -> dict[str, np.ndarray]:
    """NPV of the charging margin over the horizon, less demand charges and operating cost.

    The energy sold in a year is capped at what the sized ports can deliver
    (ports x power x open hours x ``utilization_ceiling``): ports added for
    later growth are not in the capital cost, so their sales are not counted.
    """
    # En-route energy of a fully electric fleet at today's traffic, scaled by year.
    horizon = path["in_horizon"]
    years_in = int(horizon.sum())
    full = plan.fields["trucks_per_day"] * energy["energy_per_pass_kwh"] * a["en_route_share"]
    wanted = en_route_energy_per_year(
        full, path["electric_share"][horizon], path["traffic_index"][horizon]
    )
    capacity = port_energy_capacity(
        sized["ports"],
        charger_power_kw=a["charger_power_kw"],
        operating_hours_per_day=a["operating_hours_per_day"],
        utilization_ceiling=a["utilization_ceiling"],
    )
    kwh = energy_sold_capped(wanted, capacity)
    binds = wanted > capacity[:, None] * (1.0 + 1e-12)
    years = path["year"][horizon]
    first_capped = np.where(binds.any(axis=1), years[np.argmax(binds, axis=1)], np.nan)
    last_capped = np.where(
        binds.any(axis=1), years[binds.shape[1] - 1 - np.argmax(binds[:, ::-1], axis=1)], np.nan
    )
    margin = margin_npv_charging(
        kwh,
        charging_price_usd_per_kwh=a["charging_price_usd_per_kwh"],
        energy_cost_usd_per_kwh=a["energy_cost_usd_per_kwh"],
        discount_rate=a["discount_rate"],
    )
    demand = demand_charge_npv_peak(
        sized["peak_load_mw"] * 1000.0,
        demand_charge_usd_per_kw_month=a["demand_charge_usd_per_kw_month"],
        years=years_in,
        discount_rate=a["discount_rate"],
    )
    opex = operating_cost_npv_ports(
        sized["ports"],
        port_opex_usd_per_yr=a["port_opex_usd_per_yr"],
        years=years_in,
        discount_rate=a["discount_rate"],
    )
    return {
        "en_route_kwh_first_year": kwh[:, 0],
        "en_route_kwh_horizon": kwh.sum(axis=1),
        "energy_capacity_kwh_per_yr": capacity,
        "energy_capped_from_year": first_capped,
        "energy_capped_last_year": last_capped,
        "energy_capped_kwh_horizon": (wanted - kwh).sum(axis=1),
        "margin_npv_usd": margin,
        "demand_charge_npv_usd": demand,
        "operating_cost_npv_usd": opex,
        "revenue_npv_usd": margin - demand - opex,
    }


def _sizing(plan: Checked, a: dict, energy: dict, path: dict) -> dict[str, np.ndarray]:
    """The sizing stage: sites and ports, then grid and cost, then revenue."""
    out = _size(plan, a, energy, path)
    out.update(_grid_and_cost(plan, a, out))
    out.update(_revenue(plan, a, energy, path, out))
    return out


def derive_criteria(inputs: Inputs, assumptions: dict, keys: Sequence[str]) -> Derivation:
    """Derive the built-in criteria ``keys`` of every corridor.

    Parameters
    ----------
    inputs : Inputs
        Typed workbook (:class:`ranker.workbook.tables.Inputs`).
    assumptions : dict
        Every assumption's value (:func:`ranker.assumptions.resolve`).
    keys : sequence of str
        Keys of :data:`BUILT_IN` to derive. The charger sizing (and the
        adoption path) is computed whenever ``capital_cost``,
        ``charging_revenue`` or ``grid_headroom`` is asked.

    Returns
    -------
    Derivation

    Raises
    ------
    ranker.errors.InputError
        Everything the criteria need and do not find, at once: missing
        sheets and columns (per criterion), empty or invalid cells,
        inconsistent assumptions, unknown jurisdictions, miles that miss
        the corridor length beyond ``miles_error_tolerance``.
    ValueError
        A key that is not a built-in criterion.

    Examples
    --------
    >>> from pathlib import Path
    >>> import pandas as pd
    >>> from ranker.assumptions import resolve
    >>> corridors = pd.DataFrame(
    ...     {"name": ["North"], "length_mi": [120.0], "trucks_per_day": [3000.0],
    ...      "climb_ft": [1500.0], "grid_headroom_mw": [5.0]},
    ...     index=pd.Index(["N1"], name="corridor_id"))
    >>> inp = Inputs(path=Path("x.xlsx"), sha256="0", corridors=corridors, criteria=[],
    ...              weight_sets=[])
    >>> d = derive_criteria(inp, resolve({}), ["capital_cost", "terrain_penalty"])
    >>> list(d.values.columns)
    ['capital_cost', 'terrain_penalty']
    >>> d.units["capital_cost"], d.sizing.loc["N1", "governing_rule"]
    ('[USD]', 'queue')
    """
    keys = list(dict.fromkeys(keys))
    unknown = [k for k in keys if k not in BUILT_IN]
    if unknown:
        raise ValueError(f"not built-in criteria: {unknown}; known: {list(BUILT_IN)}")
    a = assumptions
    problems = Problems()
    plan, readiness_ok = check_inputs(inputs, a, keys, problems)
    readiness = None
    if readiness_ok:
        readiness = policy_readiness(
            inputs,
            miles_warn_tolerance=a["miles_warn_tolerance"],
            miles_error_tolerance=a["miles_error_tolerance"],
            problems=problems,
        )
    problems.raise_if_any()

    stages = {BUILTIN_CRITERIA[k].stage for k in keys}
    cols: dict[str, np.ndarray] = {}
    path: dict[str, np.ndarray] = {}
    if stages & {"energy", "sizing"}:
        energy = _energy(plan, a)
        cols.update(energy)
        if "sizing" in stages:
            path = _adoption(inputs, plan, a)
            cols.update(_sizing(plan, a, energy, path))
    if readiness is not None:
        cols.update(readiness.columns)
        plan.warnings.extend(readiness.warnings)

    names = [*keys, *cols, *path]
    return Derivation(
        ids=list(inputs.corridors.index),
        columns=cols,
        criteria=keys,
        path=path,
        units={k: COLUMNS[k][0] for k in names},
        notes={k: COLUMNS[k][1] for k in names},
        warnings=plan.warnings,
    )


def energy_cap_warnings(ids: Sequence, columns: Mapping[str, np.ndarray]) -> list[dict]:
    """Return the ``energy_capped`` record: where the sized ports cap the energy sold.

    Parameters
    ----------
    ids : sequence
        Corridor ids, in the order of the columns' rows.
    columns : mapping of str to array
        :attr:`Derivation.columns`; its ``energy_capped_from_year`` and
        ``energy_capped_last_year`` [year] (NaN where never capped).

    Returns
    -------
    list of dict
        One record of :data:`ranker.input_warnings.WARNING_KINDS` naming the
        capped corridors, earliest first (ties in sheet order), with the
        first year capped of each and the last capped year of any; empty
        when no corridor is capped or the revenue was not derived.
    """
    if "energy_capped_from_year" not in columns:
        return []
    first = np.asarray(columns["energy_capped_from_year"], dtype=float)
    capped = np.flatnonzero(~np.isnan(first))
    if not capped.size:
        return []
    capped = capped[np.argsort(first[capped], kind="stable")]
    last = (
        int(np.nanmax(np.asarray(columns["energy_capped_last_year"], dtype=float)))
        if "energy_capped_last_year" in columns
        else None
    )
    return [
        warning(
            "energy_capped",
            corridors=[str(ids[i]) for i in capped.tolist()],
            from_years=[int(first[i]) for i in capped.tolist()],
            last_year=last,
        )
    ]
