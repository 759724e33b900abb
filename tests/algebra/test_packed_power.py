"""Powers on packed integers (amalgebra/algebra/packed.py) and the integer output builder.

The packed route and the ``sympy.polys`` route must give the same kernel element
(term for term) and the same SymPy expression (args, types, srepr); the integer
output builder must give exactly what generic ``Add``/``Mul``/``Rational`` give.
Every expected value here comes from a second, independent route of the library
(the ``sympy.polys`` kernel route, or SymPy's generic constructors), not from
stored numbers.
"""

import pytest
from hypothesis import given
from hypothesis import strategies as st
from sympy import Add, Integer, Mul, Rational, S, Symbol, srepr

from amalgebra.algebra import AngularMomentum, canonical
from amalgebra.algebra import packed as packed_module
from amalgebra.algebra import shiftform
from amalgebra.algebra.convert import kernel_of
from amalgebra.algebra.packed import packed_power
from amalgebra.bosons import boson_modes
from amalgebra.testing.strategies import operator_polynomials

J, S_, L = AngularMomentum("J"), AngularMomentum("S"), AngularMomentum("L")
a_mode, = boson_modes("a")

rational_one_label = operator_polynomials(labels=("J",), max_terms=4, max_weight=3, gaussian=False)
rational_two_labels = operator_polynomials(labels=("J", "S"), max_terms=3, max_weight=2, gaussian=False)
powers = st.integers(1, 6)


def _both_routes(expr):
    """canonical(expr) with the packed route allowed and with it switched off."""
    packed_module.ENABLED = True
    try:
        fast = canonical(expr)
        packed_module.ENABLED = False
        slow = canonical(expr)
    finally:
        packed_module.ENABLED = True
    return fast, slow


def _same_expression(x, y):
    assert x == y
    assert type(x) is type(y) and x.args == y.args and srepr(x) == srepr(y)


def _generic_expr(algebra, element):
    """The output through SymPy's generic constructors (Rational, Mul, Add with its own sort)."""
    terms = []
    for key, mon, coeff in algebra.sorted_items(element):
        terms.append(Mul(Rational(int(coeff), element.den), *algebra.term_factors(key, mon)))
    return Add(*terms)


@given(rational_one_label, powers)
def test_packed_power_equals_polys_route(p, n):
    algebra, (x,) = kernel_of(p)
    if not algebra.domain.is_ZZ or not x:
        return
    fast = packed_power(algebra, x, n)
    assert fast is not None          # one label over ZZ: the packed route is taken
    slow = algebra.power(x, n, packed=False)
    assert dict(fast) == dict(slow) and fast.den == slow.den
    assert algebra.equal(fast, slow)


@given(rational_one_label, powers)
def test_canonical_is_the_same_expression_on_both_routes(p, n):
    fast, slow = _both_routes(p**n)
    _same_expression(fast, slow)


@given(rational_two_labels, st.integers(1, 4))
def test_two_labels_decline_and_agree(p, n):
    # several labels make the dense layout sparse: the route declines, results agree anyway
    algebra, (x,) = kernel_of(p)
    if algebra.domain.is_ZZ and len(algebra.labels) > 1 and any(any(s) for s in x) and \
            len({i for s in x for i, d in enumerate(s) if d}) > 1:
        assert packed_power(algebra, x, n) is None
    fast, slow = _both_routes(p**n)
    _same_expression(fast, slow)


@pytest.mark.parametrize("expr, n", [
    (J.plus + J.minus + J.z, 12),
    (J.x, 15),                                   # denominator 2**15
    (10**30 * J.plus - 3 * J.z**2 + Rational(7, 3), 5),   # slots of many bytes, signs
    (J.z * J.plus - J.plus * J.z + J.minus, 6),   # cancellation inside the base
    (J.squared - J.z**2, 7),                     # no shifts at all
    (J.plus**3 + J.minus**2 * J.z, 5),
    (-J.minus, 9),                               # a single term
])
def test_fixed_cases_agree(expr, n):
    algebra, (x,) = kernel_of(expr)
    assert algebra.domain.is_ZZ
    fast = packed_power(algebra, x, n)
    assert fast is not None
    slow = algebra.power(x, n, packed=False)
    assert dict(fast) == dict(slow) and fast.den == slow.den
    _same_expression(*_both_routes(expr**n))


def test_boson_mode_powers_agree():
    # the route is mode-generic: one boson mode (one variable N) goes through it too
    expr = a_mode.create + a_mode.annihilate + 2 * a_mode.number
    algebra, (x,) = kernel_of(expr)
    fast = packed_power(algebra, x, 8)
    assert fast is not None
    assert dict(fast) == dict(algebra.power(x, 8, packed=False))
    _same_expression(*_both_routes(expr**8))


def test_zero_and_first_power():
    algebra, (x,) = kernel_of(J.plus + J.z)
    assert algebra.power(x, 1) == x and algebra.power(x, 0) == algebra.one()
    zero = algebra.sub(x, x)
    assert not packed_power(algebra, zero, 5)


def test_other_domains_never_take_the_route():
    t = Symbol("t")
    for expr in [J.x + J.y, t * J.plus + J.z]:
        algebra, _ = kernel_of(expr)
        assert not packed_module.packable(algebra)


def test_layout_limit_declines(monkeypatch):
    algebra, (x,) = kernel_of(J.plus + J.minus + J.z)
    monkeypatch.setattr(packed_module, "MAX_SLOTS", 4)
    assert packed_power(algebra, x, 6) is None
    assert algebra.power(x, 6) == algebra.power(x, 6, packed=False)   # falls back


# ------------------------------------------------------------------ output builder

@given(st.one_of(rational_one_label, rational_two_labels,
                 operator_polynomials(labels=("J", "L", "S"), max_terms=3, max_weight=3, gaussian=False)))
def test_integer_output_equals_generic_construction(p):
    algebra, (x,) = kernel_of(p)
    if not algebra.domain.is_ZZ:
        return
    _same_expression(algebra.to_expr(x), _generic_expr(algebra, x))


@pytest.mark.parametrize("expr", [
    J.plus + J.minus + J.z, 3 + J.z, Rational(1, 2) + J.x, J.z - J.z, Integer(5) * J.plus,
    -J.minus * S_.z, (J.x + S_.x + L.z) ** 3, (J.plus / 2 + 3 * J.minus + J.z) ** 6,
])
def test_integer_output_fixed_cases(expr):
    algebra, (x,) = kernel_of(expr)
    assert algebra.domain.is_ZZ
    _same_expression(algebra.to_expr(x), _generic_expr(algebra, x))


@given(st.integers(-10**30, 10**30), st.integers(1, 10**12))
def test_integer_number_is_sympys_rational(p, q):
    from math import gcd

    g = gcd(p, q)
    p, q = p // g, q // g
    fast, public = shiftform.integer_number(p, q), Rational(p, q)
    assert type(fast) is type(public) and fast == public and hash(fast) == hash(public)
    assert fast.args == public.args and srepr(fast) == srepr(public)
    assert (p, q) not in {(0, 1), (1, 1), (-1, 1), (1, 2)} or fast is public   # singletons


def test_collector_state_is_restored():
    import gc

    assert gc.isenabled()
    canonical((J.plus + J.z) ** 4)
    assert gc.isenabled()
    gc.disable()
    try:
        canonical((J.plus + J.z) ** 4)
        assert not gc.isenabled()
    finally:
        gc.enable()


@pytest.mark.slow
def test_large_power_agrees():
    # canonical(J.x**n) has of the order of n^3 terms (amalgebra.limits); n = 60 both routes
    fast, slow = _both_routes(J.x**60)
    _same_expression(fast, slow)
    assert S.Zero not in Add.make_args(fast)
