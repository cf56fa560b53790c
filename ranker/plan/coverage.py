"""Coverage view: the year the funded corridors first join the named places.

Each corridor may say which two places it joins (``connects`` on the
``Corridors`` sheet, text such as ``Northport-Lakeside``). The funded
corridors of a plan, year by year, form a graph whose nodes are places and
whose edges are corridors; the endpoints are joined when they all lie in one
connected component. Components are kept by a disjoint-set forest (union
by size, path halving [2]) as corridors are added year by year; a test
checks it against :func:`scipy.sparse.csgraph.connected_components`.

The endpoints are the places named in ``coverage_endpoints``; when that is
empty, every place named in any corridor's ``connects`` (the whole network
must be joined up).

References
----------
.. [1] R. Tarjan, "Depth-first search and linear graph algorithms", SIAM
   Journal on Computing 1(2):146-160, 1972. doi:10.1137/0201010
.. [2] R. E. Tarjan and J. van Leeuwen, "Worst-case analysis of set union
   algorithms", Journal of the ACM 31(2):245-281, 1984.
"""

from __future__ import annotations

import numpy as np
import pandas as pd

from ..input_warnings import warning
from ..workbook.schema import split_connects


def parse_connects(text: object) -> tuple[str, str] | None:
    """Split a ``connects`` text into the two places it joins, as the reader does.

    One rule for the whole product: :func:`ranker.workbook.schema.split_connects`,
    which the reader checks every Corridors cell with (a spaced dash splits
    first, so a name may hold a hyphen; en and em dashes count as the
    joining dash). Blank or NaN: no places.

    Parameters
    ----------
    text : object
        The cell's value.

    Returns
    -------
    tuple of str or None
        The two place names, runs of spaces inside a name made one; None
        when blank.

    Raises
    ------
    ValueError
        When the text does not name two different places.

    Examples
    --------
    >>> parse_connects("Northport-Lakeside")
    ('Northport', 'Lakeside')
    >>> parse_connects("Port-Ville - Lakeside")
    ('Port-Ville', 'Lakeside')
    """
    if text is None or (isinstance(text, float) and np.isnan(text)):
        return None
    if not str(text).strip():
        return None
    a, b = split_connects(str(text))
    return " ".join(a.split()), " ".join(b.split())  # "North  port" is "North port"


def first_joined(
    edges: np.ndarray,
    n_nodes: int,
    ends: np.ndarray,
    completed: np.ndarray,
    n_years: int,
) -> int:
    """Return the first plan year in which the funded corridors join all ends.

    Parameters
    ----------
    edges : ndarray of int, shape (m, 2)
        Node pair of each corridor; a row of -1 where the corridor names
        none [-].
    n_nodes : int
        Number of places [-].
    ends : ndarray of int, shape (k,)
        Nodes that must be joined, k >= 2 [-].
    completed : ndarray of int, shape (m,)
        Plan-year index each corridor is complete, -1 if never [-].
    n_years : int
        Number of plan years [-].

    Returns
    -------
    int
        Plan-year index, or -1 if the ends are never joined [-].

    References
    ----------
    .. [1] R. E. Tarjan and J. van Leeuwen, "Worst-case analysis of set union
       algorithms", Journal of the ACM 31(2):245-281, 1984.

    Examples
    --------
    >>> first_joined(np.array([[0, 1], [1, 2]]), 3, np.array([0, 2]), np.array([0, 1]), 2)
    1
    """
    parent = list(range(n_nodes))
    size = [1] * n_nodes

    def root(a: int) -> int:
        while parent[a] != a:
            parent[a] = parent[parent[a]]  # path halving of [1]
            a = parent[a]
        return a

    has = (edges[:, 0] >= 0) & (completed >= 0)
    by_year = [edges[has & (completed == t)].tolist() for t in range(n_years)]
    targets = [int(e) for e in ends]
    for t in range(n_years):
        for a, b in by_year[t]:
            ra, rb = root(a), root(b)
            if ra != rb:  # union by size of [1]
                if size[ra] < size[rb]:
                    ra, rb = rb, ra
                parent[rb] = ra
                size[ra] += size[rb]
        first = root(targets[0])
        if all(root(e) == first for e in targets[1:]):
            return t
    return -1


def coverage_view(
    connects: pd.Series,
    ids: list[str],
    endpoints: list[str],
    completed: dict[str, np.ndarray],
    years: np.ndarray,
) -> tuple[dict | None, list[dict]]:
    """Build the coverage view of each plan.

    Parameters
    ----------
    connects : Series
        ``connects`` text per corridor, index ``corridor_id`` (blank allowed).
    ids : list of str
        Corridor ids in plan order.
    endpoints : list of str
        Places that must be joined; empty for every place named.
    completed : dict of str to ndarray of int
        Plan name to completion year index per corridor, -1 unfunded [-].
    years : ndarray of int
        Plan years [year].

    Returns
    -------
    coverage : dict or None
        ``endpoints``, ``rule`` (``"named"`` or ``"all places"``),
        ``connected_year`` (plan to year or None), ``funded_set`` (plan to
        corridor ids complete by then, or None), ``possible`` (whether all
        corridors together join them); None when no corridor names its
        places. The words are :func:`ranker.report.words.plan.coverage_sentence`.
    warnings : list of dict
        Why the view is missing: records of
        :data:`ranker.input_warnings.WARNING_KINDS`.
    """
    text = connects.copy()
    text.index = text.index.map(str)
    text = text.reindex(ids)
    pairs: list[tuple[str, str] | None] = []
    for cid, t in text.items():
        try:
            pairs.append(parse_connects(t))
        except ValueError as err:
            raise ValueError(f"connects of corridor {cid}, '{t}': {err}") from None
    spelling: dict[str, str] = {}
    for p in pairs:
        for name in p or ():
            spelling.setdefault(name.casefold(), name)
    if not spelling:
        return None, [warning("endpoints_without_connects" if endpoints else "no_connects")]
    node = {k: j for j, k in enumerate(spelling)}
    edges = np.full((len(ids), 2), -1, dtype=int)
    for i, p in enumerate(pairs):
        if p:
            edges[i] = node[p[0].casefold()], node[p[1].casefold()]
    if endpoints:
        unknown = [e for e in endpoints if e.casefold() not in node]
        if unknown:  # the reader checks them against every corridor: these were screened out
            return None, [warning("endpoints_not_planned", places=list(unknown))]
        rule = "named"
        names = [spelling[e.casefold()] for e in endpoints]
    else:
        rule = "all places"
        names = list(spelling.values())
    ends = np.array(sorted({node[n.casefold()] for n in names}), dtype=int)
    if ends.size < 2:
        return None, [warning("endpoints_too_few", places=list(names))]
    every = np.zeros(len(ids), dtype=int)
    every[edges[:, 0] < 0] = -1
    possible = first_joined(edges, len(node), ends, every, 1) == 0
    year_of: dict[str, int | None] = {}
    funded: dict[str, list[str] | None] = {}
    for plan, done in completed.items():
        t = first_joined(edges, len(node), ends, np.asarray(done), len(years)) if possible else -1
        year_of[plan] = int(years[t]) if t >= 0 else None
        funded[plan] = (
            [ids[i] for i in np.flatnonzero((done >= 0) & (done <= t))] if t >= 0 else None
        )
    view = {
        "endpoints": names,
        "rule": rule,
        "connected_year": year_of,
        "funded_set": funded,
        "possible": possible,
    }
    return view, []
