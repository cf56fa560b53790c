"""Charger sizing for the target year: ports by energy balance and by peak-hour queueing.

Every corridor is sized as a coverage network: it gets
``ceil(length / spacing)`` sites (at least one) whatever its traffic, and
every site gets at least ``min_ports_per_site`` ports. Demand can only
add ports, by the larger of two rules:

* **energy balance** over the day: enough ports that the day's en-route
  energy fits in the open hours at the planned utilisation;
* **peak-hour queueing**: at each site, the smallest number of ports
  for which an M/M/c (Erlang C) queue in the busiest hour meets the waiting
  target (probability of waiting, or mean wait).

``governing_rule`` names the rule that set the count (``energy``, ``queue``
or ``minimum``; ties go to the rule named first).
"""

from __future__ import annotations

from collections.abc import Callable

import numpy as np


def _ceil(x: np.ndarray) -> np.ndarray:
    # Round away binary noise first, so that 100 / 50 * (1 + 1e-16) is not 3 sites.
    return np.ceil(np.round(np.asarray(x, dtype=float), 9))


def en_route_energy_per_day(
    trucks_per_day: np.ndarray,
    electric_share: float | np.ndarray,
    energy_kwh_per_pass: np.ndarray,
    *,
    en_route_share: float,
) -> np.ndarray:
    """Compute the energy electric trucks take at corridor chargers per day [kWh/day].

    Parameters
    ----------
    trucks_per_day : array_like
        Heavy trucks, both directions [trucks/day].
    electric_share : float or array_like
        Electric share of the trucks on the road [-].
    energy_kwh_per_pass : array_like
        Battery energy of one full-length pass [kWh].
    en_route_share : float
        Share of the energy taken at corridor chargers, not depots [-].

    Returns
    -------
    ndarray
        ``trucks_per_day * electric_share * energy_kwh_per_pass *
        en_route_share`` [kWh/day].

    References
    ----------
    .. [1] Common practice: daily vehicle-miles (count x length) times
       energy per mile.

    Examples
    --------
    >>> en_route_energy_per_day([1000.0], 0.1, [180.0], en_route_share=0.3)
    array([5400.])
    """
    return (
        np.asarray(trucks_per_day, float)
        * electric_share
        * np.asarray(energy_kwh_per_pass, float)
        * en_route_share
    )


def ports_energy_balance(
    energy_kwh_per_day: np.ndarray,
    *,
    charger_power_kw: float,
    operating_hours_per_day: float,
    target_utilization: float,
) -> np.ndarray:
    """Compute the ports whose planned daily delivery covers the day's energy [-].

    Parameters
    ----------
    energy_kwh_per_day : array_like
        En-route energy to deliver [kWh/day].
    charger_power_kw : float
        Power per port [kW].
    operating_hours_per_day : float
        Open hours [h/day].
    target_utilization : float
        Planned share of open hours a port delivers at full power [-].

    Returns
    -------
    ndarray
        ``ceil(E / (P H U))`` (whole ports, as float) [-].

    References
    ----------
    .. [1] Common practice: capacity planning at a target utilisation.

    Examples
    --------
    >>> ports_energy_balance([5400.0], charger_power_kw=350.0,
    ...                      operating_hours_per_day=24.0, target_utilization=0.25)
    array([3.])
    """
    per_port = charger_power_kw * operating_hours_per_day * target_utilization
    return _ceil(np.asarray(energy_kwh_per_day, float) / per_port)


def sites_spacing(length_mi: np.ndarray, *, site_spacing_mi: float) -> np.ndarray:
    """Compute the charging sites along a corridor at a maximum spacing [-].

    Parameters
    ----------
    length_mi : array_like
        Corridor length [mi].
    site_spacing_mi : float
        Largest distance between sites [mi].

    Returns
    -------
    ndarray
        ``max(1, ceil(length / spacing))`` [-].

    References
    ----------
    .. [1] 23 CFR 680.106(b) (US, 2023): fast-charging sites no more than
       50 miles apart along designated corridors (light-duty rule, used as
       the default convention).

    Examples
    --------
    >>> sites_spacing([10.0, 100.0, 120.0], site_spacing_mi=50.0)
    array([1., 2., 3.])
    """
    return np.maximum(1.0, _ceil(np.asarray(length_mi, float) / site_spacing_mi))


def blocking_probability_erlang_b(
    servers: np.ndarray, offered_load_erlang: np.ndarray
) -> np.ndarray:
    """Compute the Erlang B blocking probability of an M/M/c/c system [-].

    ``B(c, A) = (A^c / c!) / sum_{k=0}^{c} A^k / k!``. Up to
    :data:`RECURSION_MAX_SERVERS` servers it is evaluated by the recursion
    ``B(0) = 1``, ``B(k) = A B(k-1) / (k + A B(k-1))`` [3], which never
    overflows (one array step per server, each over only the sites with at
    least that many servers), so a run need not import scipy. Beyond that,
    where the recursion would take too many steps: for ``c > A`` the Poisson
    ratio ``pmf(c; A) / cdf(c; A)`` with scipy's regularised incomplete gamma
    function; for ``A >= c`` the series ``1 / B = sum_j c! / ((c - j)! A^j)``
    [2], whose terms fall from the first, summed until they no longer count.
    Tests check all three agree.

    Parameters
    ----------
    servers : array_like
        Number of servers ``c`` (whole, >= 0) [-].
    offered_load_erlang : array_like
        Offered load ``A = lambda / mu`` (>= 0) [Erlang].

    Returns
    -------
    ndarray
        Blocking probability [-].
    References
    ----------
    .. [1] A. K. Erlang, "Solution of some problems in the theory of
       probabilities of significance in automatic telephone exchanges",
       Post Office Electrical Engineers' Journal 10:189-197, 1917.
    .. [2] L. Kleinrock, "Queueing Systems, Volume 1: Theory", Wiley, 1975,
       sec. 3.5 (M/M/m).
    .. [3] D. Gross, J. F. Shortle, J. M. Thompson and C. M. Harris,
       "Fundamentals of Queueing Theory", 4th ed., Wiley, 2008, sec. 2.3.

    Examples
    --------
    >>> round(float(blocking_probability_erlang_b(3, 2.0)), 4)
    0.2105
    """
    c, a = np.broadcast_arrays(
        np.asarray(servers, dtype=float), np.asarray(offered_load_erlang, dtype=float)
    )
    finite = np.isfinite(a)  # no finite answer: blocked (1), as the limit A -> inf
    big = finite & (c > RECURSION_MAX_SERVERS)
    if not big.any():
        return _erlang_b_recursion(c, a, finite)
    out = _erlang_b_recursion(np.where(big, 0.0, c), a, finite)
    light = big & (c > a)
    out[light] = _erlang_b_poisson(c[light], a[light])
    heavy = big & ~light
    out[heavy] = _erlang_b_overloaded(c[heavy], a[heavy])
    return out


#: Most servers for which Erlang B is evaluated by recursion [-].
RECURSION_MAX_SERVERS = 400


def _erlang_b_recursion(c: np.ndarray, a: np.ndarray, finite: np.ndarray) -> np.ndarray:
    """Erlang B by the recursion of Gross et al. (2008, sec. 2.3) [-]."""
    flat_c = np.where(finite, c, 0.0).ravel()
    order = np.argsort(-flat_c, kind="stable")  # most servers first
    cs = flat_c[order]
    load = np.where(finite, a, 0.0).ravel()[order]
    b = np.ones(cs.size)
    top = int(cs[0]) if cs.size else 0
    # active[k - 1]: how many sites have at least k servers (a prefix of the order)
    active = np.searchsorted(-cs, -np.arange(1.0, top + 1.0), side="right")
    for k in range(1, top + 1):
        m = active[k - 1]
        x = load[:m] * b[:m]
        b[:m] = x / (k + x)  # Erlang's loss formula [1] by the recursion of [3]
    out = np.empty(cs.size)
    out[order] = b
    return np.where(finite, out.reshape(c.shape), 1.0)


def _erlang_b_overloaded(c: np.ndarray, a: np.ndarray) -> np.ndarray:
    """Erlang B where ``A >= c``: ``1 / B = sum_{j=0}^{c} prod_{i<j} (c - i) / A`` [-].

    Every factor is at most 1, so the terms fall and the sum stops once a
    term is below 1e-17 of the total (Kleinrock 1975, sec. 3.5, the sum
    read from the top term down).
    """
    total = np.ones(c.size)
    term = np.ones(c.size)
    live = np.arange(c.size)
    j = 0
    while live.size:
        term[live] *= (c[live] - j) / a[live]
        total[live] += term[live]
        j += 1
        live = live[(term[live] > 1e-17 * total[live]) & (c[live] > j)]
    return 1.0 / total


def _erlang_b_poisson(c: np.ndarray, a: np.ndarray) -> np.ndarray:
    """Erlang B as the Poisson ratio ``pmf(c; A) / cdf(c; A)``, in any ``c`` at once [-].

    ``cdf(c; A) = Q(c + 1, A)``, the regularised upper incomplete gamma
    function (Abramowitz and Stegun 1964, eq. 26.4.21), from scipy.
    """
    from scipy.special import gammaincc, gammaln, xlogy

    log_pmf = xlogy(c, a) - a - gammaln(c + 1.0)
    cdf = gammaincc(c + 1.0, a)
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        b = np.exp(log_pmf) / cdf  # Erlang's loss formula
    return np.where(cdf > 0.0, np.minimum(b, 1.0), 1.0)


def wait_probability_erlang_c(servers: np.ndarray, offered_load_erlang: np.ndarray) -> np.ndarray:
    """Compute the Erlang C probability that an arrival waits in an M/M/c queue [-].

    ``C = B / (1 - rho (1 - B))`` with ``rho = A / c`` and ``B`` the
    Erlang B probability; 1 where ``A >= c`` (the queue grows without
    bound) and 0 where there is no load.

    Parameters
    ----------
    servers : array_like
        Number of servers ``c`` (whole, >= 0) [-].
    offered_load_erlang : array_like
        Offered load ``A`` [Erlang].

    Returns
    -------
    ndarray
        Probability of waiting [-].
    References
    ----------
    .. [1] A. K. Erlang, "Solution of some problems in the theory of
       probabilities of significance in automatic telephone exchanges",
       Post Office Electrical Engineers' Journal 10:189-197, 1917.
    .. [2] L. Kleinrock, "Queueing Systems, Volume 1: Theory", Wiley, 1975,
       sec. 3.5 (M/M/m).
    .. [3] D. Gross, J. F. Shortle, J. M. Thompson and C. M. Harris,
       "Fundamentals of Queueing Theory", 4th ed., Wiley, 2008, sec. 2.3.

    Examples
    --------
    >>> round(float(wait_probability_erlang_c(3, 2.0)), 4)
    0.4444
    """
    c = np.asarray(servers, dtype=float)
    a = np.asarray(offered_load_erlang, dtype=float)
    b = blocking_probability_erlang_b(c, a)
    with np.errstate(divide="ignore", invalid="ignore"):
        rho = a / c
        wait = b / (1.0 - rho * (1.0 - b))  # Erlang C from Erlang B, [3] sec. 2.3
    wait = np.where(a >= c, 1.0, wait)
    return np.where(a == 0.0, 0.0, wait)


def mean_wait_erlang_c(
    servers: np.ndarray, offered_load_erlang: np.ndarray, service_time_h: np.ndarray
) -> np.ndarray:
    """Compute the mean wait in queue of an M/M/c queue [h].

    ``Wq = C / (c mu - lambda) = C T / (c - A)`` with ``T = 1 / mu``;
    infinite where ``A >= c``.

    Parameters
    ----------
    servers : array_like
        Number of servers ``c`` [-].
    offered_load_erlang : array_like
        Offered load ``A`` [Erlang].
    service_time_h : array_like
        Mean service time ``T`` [h].

    Returns
    -------
    ndarray
        Mean wait before service, over all arrivals [h].
    References
    ----------
    .. [1] A. K. Erlang, "Solution of some problems in the theory of
       probabilities of significance in automatic telephone exchanges",
       Post Office Electrical Engineers' Journal 10:189-197, 1917.
    .. [2] L. Kleinrock, "Queueing Systems, Volume 1: Theory", Wiley, 1975,
       sec. 3.5 (M/M/m).
    .. [3] D. Gross, J. F. Shortle, J. M. Thompson and C. M. Harris,
       "Fundamentals of Queueing Theory", 4th ed., Wiley, 2008, sec. 2.3.

    Examples
    --------
    >>> round(float(mean_wait_erlang_c(3, 2.0, 1.0)), 4)
    0.4444
    """
    c = np.asarray(servers, dtype=float)
    a = np.asarray(offered_load_erlang, dtype=float)
    wait = wait_probability_erlang_c(c, a)
    with np.errstate(divide="ignore", invalid="ignore"):
        wq = wait * np.asarray(service_time_h, float) / (c - a)  # [2] eq. for W of M/M/m
    return np.where(a >= c, np.where(a == 0.0, 0.0, np.inf), wq)


# A value equal to its target meets it, whatever the last bit of rounding says.
_TIE = 1.0 + 1e-12


def _meets_wait_probability(c, a, t, *, max_wait_probability, max_mean_wait_min):
    return wait_probability_erlang_c(c, a) <= max_wait_probability * _TIE


def _meets_mean_wait(c, a, t, *, max_wait_probability, max_mean_wait_min):
    return mean_wait_erlang_c(c, a, t) * 60.0 <= max_mean_wait_min * _TIE


#: Queue target name (``queue_metric``) to its test ``(c, A, T, **limits) -> bool array``.
QUEUE_METRICS: dict[str, Callable] = {
    "wait_probability": _meets_wait_probability,
    "mean_wait": _meets_mean_wait,
}


def ports_erlang_c(
    offered_load_erlang: np.ndarray,
    service_time_h: np.ndarray,
    *,
    queue_metric: str = "wait_probability",
    max_wait_probability: float = 0.2,
    max_mean_wait_min: float = 10.0,
) -> np.ndarray:
    """Compute the fewest ports per site meeting a peak-hour queueing target [-].

    Starts every site at the smallest stable count ``floor(A) + 1`` and
    raises, as one array, the count of the sites that still miss the
    target until none do (both targets fall monotonically with ``c``). A
    site with no load needs no port for queueing (0).

    Parameters
    ----------
    offered_load_erlang : array_like
        Peak-hour offered load per site ``A`` [Erlang].
    service_time_h : array_like
        Mean charging session ``T`` [h].
    queue_metric : str
        Key of :data:`QUEUE_METRICS`: ``wait_probability`` (Erlang C
        probability of waiting) or ``mean_wait``.
    max_wait_probability : float
        Target for ``wait_probability`` [-].
    max_mean_wait_min : float
        Target for ``mean_wait`` [min].

    Returns
    -------
    ndarray
        Ports per site (whole, as float) [-].

    References
    ----------
    .. [1] D. Gross, J. F. Shortle, J. M. Thompson and C. M. Harris,
       "Fundamentals of Queueing Theory", 4th ed., Wiley, 2008, sec. 2.3
       (M/M/c measures; choosing c).

    Examples
    --------
    >>> ports_erlang_c([0.0, 2.0], 1.0, max_wait_probability=0.2)
    array([0., 4.])
    """
    a = np.asarray(offered_load_erlang, dtype=float)
    t = np.broadcast_to(np.asarray(service_time_h, dtype=float), a.shape)
    meets = QUEUE_METRICS[queue_metric]
    limits = {"max_wait_probability": max_wait_probability, "max_mean_wait_min": max_mean_wait_min}
    c = np.where(a > 0.0, np.floor(a) + 1.0, 0.0)
    todo = np.flatnonzero(a > 0.0)
    todo = todo[~meets(c[todo], a[todo], t[todo], **limits)]
    while todo.size:
        c[todo] += 1.0
        todo = todo[~meets(c[todo], a[todo], t[todo], **limits)]
    return c


#: Labels of :func:`governing_rule`, in tie-break order.
RULES = ("energy", "queue", "minimum")


def governing_rule(
    ports_energy: np.ndarray, ports_queue: np.ndarray, ports_minimum: np.ndarray
) -> tuple[np.ndarray, np.ndarray]:
    """Take the largest of the three port counts and name the rule that set it.

    Parameters
    ----------
    ports_energy, ports_queue, ports_minimum : array_like
        Corridor port counts by each rule [-].

    Returns
    -------
    ports : ndarray
        The largest count [-].
    rule : ndarray of str
        ``energy``, ``queue`` or ``minimum``; ties go to the rule named first.

    References
    ----------
    .. [1] Common practice: size to the binding constraint.

    Examples
    --------
    >>> governing_rule([3.0], [2.0], [1.0])
    (array([3.]), array(['energy'], dtype='<U7'))
    """
    stack = np.stack([np.asarray(x, float) for x in (ports_energy, ports_queue, ports_minimum)])
    ports = stack.max(axis=0)
    return ports, np.asarray(RULES)[np.argmax(stack == ports, axis=0)]


def charger_sizing(
    *,
    length_mi: np.ndarray,
    trucks_per_day: np.ndarray,
    electric_share: float,
    energy_kwh_per_pass: np.ndarray,
    assumptions: dict,
) -> dict[str, np.ndarray]:
    """Size the chargers of every corridor for one year; return every intermediate.

    Parameters
    ----------
    length_mi : array_like
        Corridor length [mi].
    trucks_per_day : array_like
        Heavy trucks, both directions, in the sizing year [trucks/day].
    electric_share : float
        Electric share of the trucks on the road in the sizing year [-].
    energy_kwh_per_pass : array_like
        Battery energy of one pass, flat plus terrain [kWh].
    assumptions : dict
        Resolved assumptions (the ``sizing`` group is used).

    Returns
    -------
    dict of str to ndarray
        Columns ``electric_trucks_per_day`` .. ``planned_utilization``
        (see :mod:`ranker.derive.glossary` for units and meaning).

    Examples
    --------
    >>> from ranker.assumptions import resolve
    >>> out = charger_sizing(length_mi=[100.0], trucks_per_day=[2000.0], electric_share=0.2,
    ...                      energy_kwh_per_pass=[180.0], assumptions=resolve({}))
    >>> out["ports"], out["governing_rule"]
    (array([12.]), array(['queue'], dtype='<U7'))
    """
    a = assumptions
    power = a["charger_power_kw"]
    e_trucks = np.asarray(trucks_per_day, float) * electric_share
    kwh_day = en_route_energy_per_day(
        trucks_per_day, electric_share, energy_kwh_per_pass, en_route_share=a["en_route_share"]
    )
    ports_e = ports_energy_balance(
        kwh_day,
        charger_power_kw=power,
        operating_hours_per_day=a["operating_hours_per_day"],
        target_utilization=a["target_utilization"],
    )
    sites = sites_spacing(length_mi, site_spacing_mi=a["site_spacing_mi"])
    sessions = kwh_day / a["session_kwh"]
    arrivals = sessions * a["peak_hour_share"] / sites
    service_h = np.full_like(arrivals, a["session_kwh"] / power)
    load = arrivals * service_h  # A = lambda / mu
    per_site = ports_erlang_c(
        load,
        service_h,
        queue_metric=a["queue_metric"],
        max_wait_probability=a["max_wait_probability"],
        max_mean_wait_min=a["max_mean_wait_min"],
    )
    ports_q = sites * per_site
    ports_min = sites * a["min_ports_per_site"]
    ports, rule = governing_rule(ports_e, ports_q, ports_min)
    fewest = np.floor(ports / sites)  # ports at the least-equipped site
    return {
        "electric_trucks_per_day": e_trucks,
        "en_route_kwh_per_day": kwh_day,
        "sessions_per_day": sessions,
        "sites": sites,
        "ports_energy": ports_e,
        "peak_arrivals_per_site_h": arrivals,
        "session_hours": service_h,
        "offered_load_erlang": load,
        "ports_per_site_queue": per_site,
        "ports_queue": ports_q,
        "ports_minimum": ports_min,
        "ports": ports,
        "governing_rule": rule,
        "wait_probability": wait_probability_erlang_c(fewest, load),
        "mean_wait_min": mean_wait_erlang_c(fewest, load, service_h) * 60.0,
        "planned_utilization": kwh_day / (ports * power * a["operating_hours_per_day"]),
    }
