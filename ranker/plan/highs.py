"""Mixed-integer linear programs solved by HiGHS through its own Python binding.

``scipy.optimize.milp`` runs the same solver, but importing ``scipy.optimize``
costs about a quarter of a second, a sixth of a whole run of the demo;
``highspy`` loads in about 10 ms. :func:`solve_milp` takes the program in the
form ``milp`` takes it (minimise ``c @ x`` subject to ``lo <= A x <= hi``,
``0 <= x <= upper``, some ``x`` integer) and reports the status with
``milp``'s codes; a test solves random programs with both and compares.

References
----------
.. [1] Q. Huangfu and J. A. J. Hall, "Parallelizing the dual revised simplex
   method", Mathematical Programming Computation 10(1):119-142, 2018 (HiGHS).
"""

from __future__ import annotations

import os
import sys
from dataclasses import dataclass

import numpy as np

#: ``scipy.optimize.milp`` status codes [-].
OPTIMAL, LIMIT, INFEASIBLE, UNBOUNDED, OTHER = 0, 1, 2, 3, 4


@dataclass(frozen=True)
class Rows:
    """Constraint rows ``lo <= A x <= hi`` with ``A`` given by its nonzeros.

    Attributes
    ----------
    row, col : ndarray of int
        Position of each nonzero [-].
    value : ndarray of float
        The nonzeros [scaled units].
    lo, hi : ndarray of float
        Row bounds, one per row (``-inf`` / ``inf`` for none) [scaled units].
    """

    row: np.ndarray
    col: np.ndarray
    value: np.ndarray
    lo: np.ndarray
    hi: np.ndarray


@dataclass(frozen=True)
class MilpSolution:
    """What the solver found.

    Attributes
    ----------
    x : ndarray or None
        Best solution found, None when there is none [-].
    status : int
        0 optimal, 1 time limit reached, 2 infeasible, 3 unbounded, 4 other
        (the codes of ``scipy.optimize.milp``) [-].
    message : str
        The status in words, as ``scipy.optimize.milp`` words it.
    mip_dual_bound : float or None
        Best bound on the objective (of the minimisation) [scaled units].
    """

    x: np.ndarray | None
    status: int
    message: str
    mip_dual_bound: float | None


def _status(model_status) -> tuple[int, str]:
    """Map HiGHS's model status to ``milp``'s code and message prefix."""
    import highspy

    s = highspy.HighsModelStatus
    return {
        s.kOptimal: (OPTIMAL, "Optimization terminated successfully. "),
        s.kTimeLimit: (LIMIT, "Time limit reached. "),
        s.kIterationLimit: (LIMIT, "Iteration limit reached. "),
        s.kInfeasible: (INFEASIBLE, "The problem is infeasible. "),
        s.kModelError: (INFEASIBLE, ""),
        s.kUnbounded: (UNBOUNDED, "The problem is unbounded. "),
        s.kUnboundedOrInfeasible: (OTHER, "The problem is unbounded or infeasible. "),
    }.get(model_status, (OTHER, ""))


def _quiet_highs():
    """Return a silent solver; the first one in a process prints a banner to fd 1.

    The banner goes to the null device for that moment. Where there is no
    file descriptor 1 to redirect (a process started without a console),
    there is nothing to keep clean either, and the solver is made as it is.
    """
    import highspy

    try:
        if sys.stdout is not None:
            sys.stdout.flush()
        saved, null = os.dup(1), os.open(os.devnull, os.O_WRONLY)
    except (OSError, ValueError):
        saved = None
    if saved is not None:
        os.dup2(null, 1)
    try:
        h = highspy.Highs()
        h.setOptionValue("output_flag", False)
    finally:
        if saved is not None:
            os.dup2(saved, 1)
            os.close(saved)
            os.close(null)
    return h


def solve_milp(
    cost: np.ndarray,
    *,
    upper: np.ndarray,
    integrality: np.ndarray,
    rows: list[Rows],
    mip_rel_gap: float = 1e-4,
    time_limit: float | None = None,
) -> MilpSolution:
    """Minimise ``cost @ x`` subject to ``rows`` and ``0 <= x <= upper``.

    Parameters
    ----------
    cost : ndarray, shape (m,)
        Objective coefficients [scaled units].
    upper : ndarray, shape (m,)
        Upper bounds (``inf`` for none); lower bounds are 0 [-].
    integrality : ndarray, shape (m,)
        1 where the variable must be whole, 0 where continuous [-].
    rows : list of Rows
        Constraint blocks, stacked in order.
    mip_rel_gap : float
        Stop when the relative gap to the best bound is below this [-].
    time_limit : float or None
        Stop after this long [s].

    Returns
    -------
    MilpSolution
        The best solution, status and bound.
    """
    import highspy

    cost = np.asarray(cost, dtype=float)
    m = cost.size
    offsets = np.cumsum([0] + [r.lo.size for r in rows])
    r_idx = np.concatenate([r.row + o for r, o in zip(rows, offsets, strict=False)] or [[]])
    c_idx = np.concatenate([r.col for r in rows] or [[]]).astype(np.int64)
    vals = np.concatenate([r.value for r in rows] or [[]]).astype(float)
    order = np.lexsort((c_idx, r_idx))
    r_idx, c_idx, vals = r_idx[order].astype(np.int64), c_idx[order], vals[order]
    n_rows = int(offsets[-1])

    lp = highspy.HighsLp()
    lp.num_col_ = m
    lp.num_row_ = n_rows
    lp.col_cost_ = cost
    lp.col_lower_ = np.zeros(m)
    lp.col_upper_ = np.where(np.isinf(upper), highspy.kHighsInf, np.asarray(upper, float))
    lo = np.concatenate([r.lo for r in rows] or [[]]).astype(float)
    hi = np.concatenate([r.hi for r in rows] or [[]]).astype(float)
    lp.row_lower_ = np.where(np.isneginf(lo), -highspy.kHighsInf, lo)
    lp.row_upper_ = np.where(np.isposinf(hi), highspy.kHighsInf, hi)
    lp.a_matrix_.format_ = highspy.MatrixFormat.kRowwise
    lp.a_matrix_.start_ = np.searchsorted(r_idx, np.arange(n_rows + 1)).astype(np.int32)
    lp.a_matrix_.index_ = c_idx.astype(np.int32)
    lp.a_matrix_.value_ = vals
    kinds = highspy.HighsVarType
    lp.integrality_ = [kinds.kInteger if i else kinds.kContinuous for i in integrality]

    h = _quiet_highs()
    h.setOptionValue("mip_rel_gap", float(mip_rel_gap))
    h.setOptionValue("presolve", "on")
    if time_limit is not None:
        h.setOptionValue("time_limit", float(time_limit))
    h.passModel(lp)
    h.run()
    model_status = h.getModelStatus()
    status, words = _status(model_status)
    words += f"(HiGHS Status {int(model_status)}: {h.modelStatusToString(model_status)})"
    info = h.getInfo()
    has_x = info.primal_solution_status == 2  # kSolutionStatusFeasible
    x = np.asarray(h.getSolution().col_value, dtype=float) if has_x else None
    bound = float(info.mip_dual_bound) if np.isfinite(info.mip_dual_bound) else None
    return MilpSolution(x, status, words, bound)
