"""``--weight KEY=SHARE``: set a criterion's final share of the weight.

One meaning for every kind of weight set (points, ranks, pairwise,
objective): the share is the criterion's final weight in percent, and the
criteria not named keep their proportions to one another.
"""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence

from ..errors import InputError, Problems
from ..input_warnings import warning

WHERE = "--weight"


def parse_shares(pairs: Sequence[str]) -> dict[str, float]:
    """Parse ``KEY=SHARE`` pairs into criterion key to share in percent [%].

    ``40`` and ``40%`` both mean 40 %. Keys match case-insensitively,
    spaces read as ``_``.

    Raises
    ------
    InputError
        For a pair that is not ``KEY=NUMBER``, a share outside 0-100, a key
        given twice, or shares summing above 100; every problem is listed.
    """
    problems = Problems()
    out: dict[str, float] = {}
    for pair in pairs:
        key, sep, text = pair.partition("=")
        key = key.strip().lower().replace(" ", "_")
        text = text.strip()
        number = text[:-1].strip() if text.endswith("%") else text
        try:
            if not sep or not key:
                raise ValueError
            share = float(number)
        except ValueError:
            problems.add(
                WHERE,
                f"{pair!r} is not KEY=SHARE",
                "write the criterion's final share in percent, for example "
                "--weight capital_cost=30",
            )
            continue
        if key in out:
            problems.add(
                WHERE,
                f"{key} is given twice",
                "give each criterion at most one --weight",
            )
            continue
        if not math.isfinite(share) or not 0.0 <= share <= 100.0:
            problems.add(
                WHERE,
                f"{key}={text} is outside 0-100 %",
                "give the criterion's final share in percent, from 0 to 100",
            )
            continue
        out[key] = share
    if not problems and sum(out.values()) > 100.0 + 1e-9:
        problems.add(
            WHERE,
            f"the shares sum to {sum(out.values()):g} %, above 100 %",
            "lower the shares so that they sum to 100 or less",
        )
    problems.raise_if_any()
    return out


def small_share_warnings(shares: Mapping[str, float]) -> list[dict]:
    """Warn where a share of 1 or less may have been meant as a fraction.

    Returns one ``small_share`` record (:data:`ranker.input_warnings.WARNING_KINDS`)
    per such share [%], in the order given; the words are
    :func:`ranker.report.narrative.input_warnings`.

    Examples
    --------
    >>> small_share_warnings({"risk": 0.4, "cost": 30.0})
    [{'kind': 'small_share', 'criterion': 'risk', 'share': 0.4}]
    """
    return [
        warning("small_share", criterion=k, share=float(v))
        for k, v in shares.items()
        if 0 < v <= 1
    ]


def apply_shares(
    weights: Mapping[str, float], shares: Mapping[str, float], keys: Sequence[str]
) -> dict[str, float]:
    """Return the weights with the named criteria at their shares, the rest in proportion.

    With ``S`` the named shares' sum (as a fraction), every other criterion
    ``j`` gets ``w_j * (1 - S) / sum(w_other)``, so the others keep their
    ratios to one another and the weights sum to 1.

    Parameters
    ----------
    weights : mapping of str to float
        The chosen set's weights, summing to 1 [-].
    shares : mapping of str to float
        Criterion key to its final share [%].
    keys : sequence of str
        The included criteria, in sheet order.

    Returns
    -------
    dict of str to float
        Final weights over ``keys``, summing to 1 [-].

    Raises
    ------
    InputError
        For a key that is not an included criterion, or shares that cannot
        be met (the others have no weight left to scale, or every criterion
        is named and the shares do not sum to 100).
    """
    problems = Problems()
    for key in shares:
        if key not in keys:
            problems.add(
                WHERE, f"{key} is not an included criterion", "use one of " + ", ".join(keys)
            )
    problems.raise_if_any()
    fixed = sum(shares.values()) / 100.0
    others = [k for k in keys if k not in shares]
    rest = sum(float(weights.get(k, 0.0)) for k in others)
    if others and rest <= 0 and fixed < 1 - 1e-12:
        raise InputError.one(
            WHERE,
            f"the criteria not named ({', '.join(others)}) have no weight to share the "
            f"remaining {100 - fixed * 100:g} %",
            "name every criterion with a weight, or give shares that sum to 100",
        )
    if not others and abs(fixed - 1.0) > 1e-9:
        raise InputError.one(
            WHERE,
            f"every criterion is named and the shares sum to {fixed * 100:g} %, not 100 %",
            "make the shares sum to 100, or leave one criterion out",
        )
    out = {}
    for k in keys:
        if k in shares:
            out[k] = shares[k] / 100.0
        else:
            out[k] = float(weights.get(k, 0.0)) * (1.0 - fixed) / rest if rest > 0 else 0.0
    if sum(out.values()) <= 0:
        raise InputError.one(
            WHERE, "every weight would be zero", "give at least one criterion a share above 0"
        )
    return out
