"""The float path: correctly rounded doubles of the exact values, checked against mpmath.

Expected values: the exact signed square from the independent ``racah_reference.py``
(Python ``Fraction``), square-rooted by mpmath at 320 bits and rounded once to 53 bits
(round half to even); each reference double is certified by checking that the 320-bit
value is not within 2^-300 of a rounding boundary.  Source: mpmath (independent library).
"""

import importlib.util
import math
import pathlib
import random
from fractions import Fraction

import mpmath
import pytest
from mpmath import libmp
from sympy import Rational

from amalgebra.coupling import cg_float, ninej_float, sixj_float, threej, threej_float
from amalgebra.coupling.floats import triple_to_float

_spec = importlib.util.spec_from_file_location("coupling_racah_reference_f", pathlib.Path(__file__).with_name("racah_reference.py"))
ref = importlib.util.module_from_spec(_spec)
_spec.loader.exec_module(ref)


def mpmath_double(signed_square):
    """The double nearest to sign * sqrt(|q|) for an exact Fraction q, via mpmath."""
    if signed_square == 0:
        return 0.0
    q = abs(signed_square)
    with mpmath.workprec(320):
        x = mpmath.sqrt(mpmath.mpf(q.numerator) / q.denominator)
        eps = mpmath.mpf(2) ** -300
        lo, hi = x * (1 - eps), x * (1 + eps)
        rounded = [libmp.to_float(libmp.mpf_pos(v._mpf_, 53, "n")) for v in (lo, x, hi)]
    assert rounded[0] == rounded[1] == rounded[2], "reference too close to a rounding boundary"
    return rounded[1] if signed_square > 0 else -rounded[1]


def half(*ts):
    return [Rational(t, 2) for t in ts]


def random_threej(rng, tmax):
    while True:
        t1, t2 = rng.randint(0, tmax), rng.randint(0, tmax)
        t3 = rng.randrange(abs(t1 - t2), min(t1 + t2, tmax) + 1, 2)
        m1, m2 = rng.randrange(-t1, t1 + 1, 2), rng.randrange(-t2, t2 + 1, 2)
        if abs(m1 + m2) <= t3:
            return t1, t2, t3, m1, m2, -m1 - m2


def random_sixj(rng, tmax, tmin=0):
    while True:
        t1, t2, t5 = (rng.randint(tmin, tmax) for _ in range(3))
        c3 = [t for t in range(abs(t1 - t2), min(t1 + t2, tmax) + 1, 2) if t >= tmin]
        c6 = [t for t in range(abs(t1 - t5), min(t1 + t5, tmax) + 1, 2) if t >= tmin]
        if not c3 or not c6:
            continue
        t3, t6 = rng.choice(c3), rng.choice(c6)
        c4 = [t for t in range(tmin, tmax + 1) if ref._tri(t2, t6, t) and ref._tri(t5, t3, t)]
        if c4:
            return t1, t2, t3, rng.choice(c4), t5, t6


def test_triple_to_float_known_cases():
    # IEEE 754 correctly rounded sqrt (Python's math.sqrt is correctly rounded) and division.
    assert triple_to_float(1, 1, 2) == math.sqrt(2)
    assert triple_to_float(-1, 1, 3) == -math.sqrt(3)
    assert triple_to_float(5, 7, 1) == 5 / 7
    assert triple_to_float(0, 1, 1) == 0.0
    # 1/sqrt(3): mpmath says 0.57735026918962576450..., nearest double is ...257 (1/math.sqrt(3) is ...258).
    assert triple_to_float(1, 3, 3) == mpmath_double(Fraction(1, 3)) == 0.5773502691896257


@pytest.mark.parametrize("seed", range(4))
def test_threej_float_up_to_j_200(seed):
    rng = random.Random(100 + seed)
    for tmax in (20, 100, 400) * 8:
        args = random_threej(rng, tmax)
        assert threej_float(*half(*args)) == mpmath_double(ref.ref_threej_sq(*args)), args


def test_threej_float_many_small():
    rng = random.Random(7)
    for _ in range(150):
        args = random_threej(rng, 30)
        assert threej_float(*half(*args)) == mpmath_double(ref.ref_threej_sq(*args)), args


def test_cg_float_matches_exact():
    rng = random.Random(8)
    for _ in range(100):
        t1, t2, t3, m1, m2, m3 = random_threej(rng, 40)
        # cg^2 = (2J+1) * 3j^2 (design.md definition), exact
        square = (t3 + 1) * ref.ref_threej_sq(t1, t2, t3, m1, m2, m3)
        if ((t1 - t2 - m3) // 2) % 2:
            square = -square
        assert cg_float(*half(t1, m1, t2, m2, t3, -m3)) == mpmath_double(square)


@pytest.mark.parametrize("seed", range(3))
def test_sixj_float_up_to_j_200(seed):
    rng = random.Random(200 + seed)
    for tmax, tmin in ((30, 0), (120, 60), (400, 300), (400, 0)) * 5:
        args = random_sixj(rng, tmax, tmin)
        assert sixj_float(*half(*args)) == mpmath_double(ref.ref_sixj_sq(*args)), args


def test_sixj_float_many_small():
    rng = random.Random(9)
    for _ in range(150):
        args = random_sixj(rng, 30)
        assert sixj_float(*half(*args)) == mpmath_double(ref.ref_sixj_sq(*args)), args


def test_ninej_float():
    rng = random.Random(10)
    checked = 0
    while checked < 12:
        a, b, d, e = (rng.randint(0, 16) for _ in range(4))
        c = rng.randrange(abs(a - b), a + b + 1, 2)
        g = rng.randrange(abs(d - e), d + e + 1, 2)
        hh = rng.randrange(abs(a - d), a + d + 1, 2)
        i = rng.randrange(abs(b - e), b + e + 1, 2)
        ks = [k for k in range(0, 33) if ref._tri(c, g, k) and ref._tri(hh, i, k)]
        if not ks:
            continue
        args = (a, b, c, d, e, g, hh, i, rng.choice(ks))
        assert ninej_float(*half(*args)) == mpmath_double(ref.ref_ninej_sq(*args)), args
        checked += 1


@pytest.mark.slow
def test_threej_and_sixj_float_sweep_j_200():
    rng = random.Random(11)
    for _ in range(60):
        args = random_threej(rng, 400)
        assert threej_float(*half(*args)) == mpmath_double(ref.ref_threej_sq(*args)), args
    for _ in range(30):
        args = random_sixj(rng, 400, 200)
        assert sixj_float(*half(*args)) == mpmath_double(ref.ref_sixj_sq(*args)), args


def test_float_equals_rounding_of_exact_value():
    # The float path rounds the same exact number the exact path returns (mpmath, 320 bits).
    value = threej(40, 35, 20, 3, -7, 4)
    with mpmath.workprec(320):
        x = mpmath.mpf(str(value.evalf(100)))
    assert threej_float(40, 35, 20, 3, -7, 4) == libmp.to_float(libmp.mpf_pos(x._mpf_, 53, "n"))


def test_float_path_inputs_and_zeros():
    # common practice, no source: the float path validates like the exact path and returns 0.0 for
    # selection-rule zeros.
    from sympy import Symbol

    from amalgebra.errors import NotNumericError, ProjectionError
    assert threej_float(1, 1, 3, 0, 0, 0) == 0.0
    assert cg_float(1, 1, 1, 1, 2, 0) == 0.0
    assert sixj_float("1/2", "1/2", "1/2", "1/2", "1/2", "1/2") == 0.0
    with pytest.raises(NotNumericError):
        sixj_float(Symbol("a"), 1, 1, 1, 1, 1)
    with pytest.raises(ProjectionError):
        threej_float(1, 1, 1, "1/2", 0, 0)
