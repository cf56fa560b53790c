"""TOPSIS scores of chosen rows (ranker.stress.rows), checked on their own.

* The aircraft example of Hwang & Yoon (1981), Multiple Attribute Decision
  Making, pp. 133-134: printed closeness 0.643, 0.268, 0.613, 0.312 (three
  decimals; grade B, seen in secondary sources citing the book), each row
  scored alone.
* pymcdm's TOPSIS (vector normalisation) on random matrices, each corridor
  under its own weight vector.
* The kernel :func:`ranker.score.topsis.topsis` for every normalisation, so
  the row formula changes no score.
"""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from ranker.score.normalize import NORMALIZATIONS
from ranker.score.topsis import topsis
from ranker.stress.rows import ROW_SCORERS, TopsisRows

# pymcdm warns about dominant or dominated alternatives; they are legal input here.
pytestmark = pytest.mark.filterwarnings("ignore:Alternatives with indices")

AIRCRAFT = np.array(
    [
        [2.0, 1500, 20000, 5.5, 5, 9],
        [2.5, 2700, 18000, 6.5, 3, 5],
        [1.8, 2000, 21000, 4.5, 7, 7],
        [2.2, 1800, 20000, 5.0, 5, 5],
    ]
)
AIRCRAFT_W = np.array([0.2, 0.1, 0.1, 0.1, 0.2, 0.3])
AIRCRAFT_BENEFIT = np.array([True, True, True, False, True, True])


def test_topsis_is_the_registered_row_scorer():
    assert ROW_SCORERS[topsis] is TopsisRows


def test_rows_hwang_yoon_1981_aircraft():
    """Hwang & Yoon (1981) pp. 133-134: closeness 0.643, 0.268, 0.613, 0.312 (atol 1e-3)."""
    scorer = TopsisRows(AIRCRAFT, AIRCRAFT_BENEFIT)
    # One corridor per row of choices, each under the book's weights.
    got = scorer(np.tile(AIRCRAFT_W, (4, 1)), np.arange(4)[:, None])
    assert got.shape == (4, 1)
    np.testing.assert_allclose(got[:, 0], [0.643, 0.268, 0.613, 0.312], atol=1e-3)
    # All four in one row of choices.
    both = scorer(AIRCRAFT_W[None, :], np.array([[2, 0, 3, 1]]))
    np.testing.assert_allclose(both[0], [0.613, 0.643, 0.312, 0.268], atol=1e-3)


def test_rows_two_corridors_by_hand():
    # x = [[3, 4], [4, 3]], both benefit, w = (0.6, 0.4). Vector-normalised:
    # r = [[0.6, 0.8], [0.8, 0.6]]; corridor 0: d+ = 0.6 * 0.2 = 0.12, d- = 0.4 * 0.2
    # = 0.08, C = 0.08 / 0.20 = 0.4; corridor 1 mirrors it, C = 0.6 (Hwang & Yoon
    # 1981, Steps 2-6).
    scorer = TopsisRows(np.array([[3.0, 4.0], [4.0, 3.0]]), np.array([True, True]))
    got = scorer(np.array([[0.6, 0.4], [0.4, 0.6]]), np.array([[0, 1], [0, 1]]))
    np.testing.assert_allclose(got, [[0.4, 0.6], [0.6, 0.4]], atol=1e-12)


def test_rows_identical_corridors_score_one_half():
    # Ideal and anti-ideal coincide: d+ = d- = 0, closeness 0.5 by the documented rule.
    scorer = TopsisRows(np.ones((3, 2)), np.array([True, False]))
    got = scorer(np.array([[0.5, 0.5]]), np.array([[0, 1, 2]]))
    np.testing.assert_array_equal(got, [[0.5, 0.5, 0.5]])


def test_rows_one_corridor():
    # One corridor is its own ideal and anti-ideal: 0.5.
    scorer = TopsisRows(np.array([[7.0, 2.0]]), np.array([True, False]))
    np.testing.assert_array_equal(scorer(np.array([[0.3, 0.7]]), np.array([[0]])), [[0.5]])


def test_rows_zero_weight_on_a_criterion_ignores_it():
    # With all weight on criterion 0 (benefit), the best on it scores 1 and the worst 0.
    x = np.array([[1.0, 100.0], [3.0, 0.0], [2.0, 50.0]])
    scorer = TopsisRows(x, np.array([True, True]))
    got = scorer(np.array([[1.0, 0.0]]), np.array([[1, 0]]))
    np.testing.assert_allclose(got, [[1.0, 0.0]], atol=1e-15)


def test_rows_empty_choice():
    scorer = TopsisRows(AIRCRAFT, AIRCRAFT_BENEFIT)
    assert scorer(np.zeros((0, 6)), np.zeros((0, 2), dtype=int)).shape == (0, 2)


@settings(max_examples=40, deadline=None, derandomize=True)
@given(st.integers(2, 12), st.integers(1, 5), st.integers(1, 6), st.integers(0, 10_000))
def test_rows_equal_pymcdm_topsis(n, k, m, seed):
    """pymcdm TOPSIS (vector normalisation) per weight vector, the wanted corridors taken."""
    from pymcdm.methods import TOPSIS
    from pymcdm.normalizations import vector_normalization

    rng = np.random.default_rng(seed)
    x = rng.uniform(1, 10, size=(n, k))
    benefit = rng.random(k) < 0.5
    w = rng.dirichlet(np.ones(k), size=m)
    cols = rng.integers(0, n, size=(m, 3))
    got = TopsisRows(x, benefit)(w, cols)
    ref = TOPSIS(vector_normalization)
    for row in range(m):
        theirs = ref(x, w[row], np.where(benefit, 1, -1))
        np.testing.assert_allclose(got[row], theirs[cols[row]], rtol=0, atol=1e-9)


@pytest.mark.parametrize("normalization", sorted(NORMALIZATIONS))
def test_rows_equal_kernel_for_every_normalization(normalization):
    rng = np.random.default_rng(7)
    x = rng.integers(0, 5, size=(9, 4)).astype(float)  # coarse: ties and equal columns occur
    x[:, 2] = 3.0  # a constant criterion
    benefit = np.array([True, False, True, False])
    w = rng.dirichlet(np.ones(4), size=20)
    cols = rng.integers(0, 9, size=(20, 4))
    got = TopsisRows(x, benefit, normalization=normalization)(w, cols)
    whole = topsis(x, w, benefit, normalization=normalization)  # (20, 9)
    want = np.take_along_axis(whole, cols, axis=1)
    np.testing.assert_allclose(got, want, rtol=0, atol=1e-12)


@settings(max_examples=40, deadline=None, derandomize=True)
@given(st.integers(2, 30), st.integers(2, 7), st.integers(0, 10_000))
def test_along_a_weight_line_equals_rows_at_its_weights(n, k, seed):
    """The closed form on the tipping sweep's line w(t) = t e_c + (1 - t) s equals the
    row scores at w(t), and the kernel's (Hwang & Yoon 1981, pp. 128-134), to rounding."""
    from ranker.stress.tipping import sweep_weights

    rng = np.random.default_rng(seed)
    x = rng.uniform(0.5, 10.0, size=(n, k))
    benefit = rng.random(k) < 0.5
    w = rng.dirichlet(np.ones(k))
    c = int(rng.integers(0, k))
    rows = TopsisRows(x, benefit)
    share = sweep_weights(w, c, np.zeros(1))[0]
    assert share[c] == 0.0 and share.sum() == pytest.approx(1.0)
    t = np.concatenate([[0.0, 1.0, w[c]], rng.random(9)])
    cols = np.tile(np.arange(n), (t.size, 1))
    got = rows.along(share, c)(t, cols)
    weights = sweep_weights(w, c, t)
    assert np.allclose(got, rows(weights, cols), rtol=0, atol=1e-13)
    for m, wt in enumerate(weights):
        assert np.allclose(got[m], topsis(x, wt, benefit), rtol=0, atol=1e-13)
