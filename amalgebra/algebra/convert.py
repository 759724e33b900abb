"""Crossing the boundary: SymPy expressions into the shift-form kernel.

Explanation
===========

:func:`to_kernel` walks ``Add``/``Mul``/``Pow`` once, collecting the
generators (by label, through :func:`~amalgebra.algebra.modes.mode_of`) and
the commutative coefficients; it then picks ONE exact coefficient domain for
all the expressions given together and converts them.  Domain strategy
(measured: integer work is the common fast case):

* rational numbers: numerators in ``ZZ`` (Python ints) over an integer
  denominator per element; with ``I`` or a ``y`` component: ``ZZ_I``;
* anything else (symbols, ``I`` with symbols, radicals, ``exp``/``sin``/``cos``
  of symbols, opaque atoms): the normal-form domain of
  :mod:`amalgebra.algebra.coefficients`, integer polynomials in generators
  (or their fraction field) whose relations (``i^2 = -1``, ``sqrt(2)^2 = 2``,
  ``E E^-1 = 1``) are applied when coefficients leave the kernel, so that every
  coefficient has one normal form and zero is decided exactly.

Bad input raises :class:`~amalgebra.errors.OperatorError`: negative,
non-integer or symbolic powers of operators, unknown noncommutative objects,
one label used by two kinds of mode.

Examples
========

>>> from sympy import I, Symbol
>>> from amalgebra.algebra import AngularMomentum
>>> from amalgebra.algebra.convert import kernel_of
>>> J = AngularMomentum("J")
>>> algebra, (x, y) = kernel_of(J.x, I*J.y)
>>> algebra.domain                      # Gaussian integers, over a denominator 2
ZZ_I
>>> algebra.to_expr(algebra.sub(algebra.mul(x, x), algebra.mul(y, y)))   # Jx^2 + Jy^2
J.squared - J.z**2
>>> algebra, (a,) = kernel_of(Symbol("a")*(1 + I)*J.z/2)
>>> algebra.to_expr(a)                  # coefficient c*N with N primitive (module coefficients)
a*(1 + I)*J.z/2
"""

from math import lcm

from sympy import Expr, Float, I, Mul, S, default_sort_key, expand
from sympy.polys.constructor import construct_domain
from sympy.polys.domains import ZZ, ZZ_I
from sympy.polys.polyerrors import CoercionFailed

from ..errors import OperatorError
from ..limits import check_limit
from .coefficients import scalar_domain
from .modes import ANGULAR_MOMENTUM, mode_of
from .shiftform import Element, ShiftAlgebra

__all__ = ["kernel_of", "build_algebra", "to_kernel", "scan", "operator_power_base", "choose_domain",
           "angular_momentum_kernel"]


def _check_expr(expr, name="expr"):
    if isinstance(expr, bool) or not isinstance(expr, (Expr, int)):
        from fractions import Fraction
        if isinstance(expr, Fraction):
            return S(expr)
        raise OperatorError(f"{name}={expr!r} must be a SymPy expression built from operators, "
                            f"got {type(expr).__name__}")
    return S(expr) if isinstance(expr, int) else expr


def operator_power_base(node):
    """The base of an operator power ``node``; the exponent must be a nonnegative integer.

    An exponent above ``max_power`` of :mod:`amalgebra.limits` (default 1000) raises
    :class:`~amalgebra.errors.LimitError` before any work.
    """
    base, exp = node.args
    if not (exp.is_Integer and exp >= 0):
        raise OperatorError(f"exponent={exp} of {base} must be a nonnegative integer: "
                            f"operators have no inverses or roots here")
    # refused before any work: canonical(J.x**n) has of the order of n^3 terms (amalgebra.limits)
    check_limit("max_power", int(exp), "exponent", "an operator power is expanded term by term")
    return base


def scan(expr, modes, scalars):
    """Record labels (into ``modes``) and commutative coefficients (into ``scalars``)."""
    stack = [expr]
    seen = set()
    while stack:
        node = stack.pop()
        if node in seen:
            continue
        seen.add(node)
        if node.is_commutative:
            scalars[node] = None
            continue
        if node.is_Add or node.is_Mul:
            stack.extend(node.args)
            continue
        if node.is_Pow:
            stack.append(operator_power_base(node))
            continue
        found = mode_of(node)
        if found is None:
            raise OperatorError(f"expr={node} must be built from angular-momentum components; "
                                f"{type(node).__name__} is not a known operator")
        mode, label, component = found
        known = modes.get(label)
        if known is not None and known[0] is not mode:
            raise OperatorError(f"label={label!r} must name one kind of operator only")
        if known is None:
            modes[label] = (mode, set())
        modes[label][1].add(component)


def _gaussian_rational(value):
    """``(re, im)`` as Rationals when ``value`` is a Gaussian rational, else ``None``."""
    if value.is_Rational:
        return value, S.Zero
    if value is I:
        return S.Zero, S.One
    if not value.is_number:
        return None
    re, im = expand(value).as_real_imag()
    if re.is_Rational and im.is_Rational:
        return re, im
    return None


def choose_domain(scalars, constants):
    """Pick the exact coefficient domain (for numerators) of the given coefficients.

    Rational and Gaussian-rational coefficients give ``ZZ``/``ZZ_I``: elements
    carry an integer denominator, see :class:`~amalgebra.algebra.shiftform.Element`.
    Anything else (symbols, radicals, exp/sin/cos of symbols, opaque atoms) gets
    the normal-form domain of :mod:`amalgebra.algebra.coefficients`; float input
    keeps SymPy's float domain (no normal form is promised for floats).
    """
    values = list(scalars) + list(constants)
    if all(v.is_Rational for v in values):
        return ZZ
    if all(_gaussian_rational(v) is not None for v in values):
        return ZZ_I
    values = sorted(set(values), key=default_sort_key)  # generator order must not depend on the hash seed
    if any(v.has(Float) for v in values):
        return construct_domain(values)[0]
    return scalar_domain(values).domain


def build_algebra(*exprs, extra_labels=()):
    """Scan ``exprs`` and return the kernel algebra that can hold all of them."""
    modes, scalars = {}, {}
    for expr in exprs:
        scan(expr, modes, scalars)
    for label in extra_labels:
        modes.setdefault(label, (ANGULAR_MOMENTUM, set()))
    constants = []
    for label in sorted(modes):
        mode, components = modes[label]
        for component in sorted(components):
            constants.extend(mode.atom_constants(component))
    domain = choose_domain(list(scalars), constants)
    return ShiftAlgebra([(label, modes[label][0]) for label in modes], domain)


def to_kernel(algebra, expr):
    """Convert one expression into an element of ``algebra``."""
    memo = {}
    return _convert(algebra, expr, memo)


def _convert(algebra, node, memo):
    hit = memo.get(node)
    if hit is not None:
        return hit
    if node.is_commutative:
        result = algebra.scalar(*_scalar(algebra.domain, node))
    elif node.is_Add:
        result = algebra.add(*[_convert(algebra, arg, memo) for arg in node.args])
    elif node.is_Mul:
        commutative = [arg for arg in node.args if arg.is_commutative]
        factors = [arg for arg in node.args if not arg.is_commutative]
        num, den = (_scalar(algebra.domain, commutative[0] if len(commutative) == 1 else Mul(*commutative))
                    if commutative else (algebra.domain.one, 1))
        result = _direct(algebra, factors, memo, num, den)
        if result is None:
            result = _convert(algebra, factors[-1], memo)
            for factor in reversed(factors[:-1]):
                result = algebra.mul(_convert(algebra, factor, memo), result)
            if commutative:
                result = algebra.scale(result, num, den)
    else:
        result = _direct(algebra, (node,), memo)
        if result is None:
            if node.is_Pow:
                base, exp = node.args
                result = algebra.power(_convert(algebra, base, memo), int(exp))
            else:
                _, label, component = mode_of(node)
                result = algebra.atom(label, component)
    memo[node] = result
    return result


def _scalar(domain, value):
    """``(numerator, den)`` of a commutative SymPy value for ``domain``."""
    scalars = getattr(domain, "scalars", None)
    if scalars is not None:
        return scalars.convert(value)
    if domain.is_ZZ:
        return domain(int(value.p)), int(value.q)
    if domain.is_GaussianRing:
        re, im = _gaussian_rational(value)
        den = lcm(int(re.q), int(im.q))
        return domain.new(int(re * den), int(im * den)), den
    try:
        return domain.from_sympy(value), 1
    except CoercionFailed:  # e.g. I*(1 + I): the domain wants a + b*I
        return domain.from_sympy(expand(value)), 1


def _factor_info(algebra, factor, memo):
    """``(label index, how, exponent)`` of one factor, cached in ``memo``."""
    key = ("factor", factor)
    info = memo.get(key)
    if info is None:
        if factor.is_Pow:
            base, exp = factor.args
            exp = int(exp)
        else:
            base, exp = factor, 1
        found = mode_of(base)
        how = None if found is None else found[0].direct(found[2])
        info = memo[key] = (None if how is None else algebra.position[found[1]], how, exp)
    return info


def _direct(algebra, factors, memo, num=None, den=1):
    """Fast path: a product already in output order (ladders before variables per label)."""
    shift = list(algebra.identity_shift)
    mon = [0] * algebra.ring.ngens
    closed = set()
    for factor in factors:
        i, how, exp = _factor_info(algebra, factor, memo)
        if how is None:
            return None
        if how[0] == "shift":
            if i in closed or shift[i] * how[1] < 0:
                return None
            shift[i] += how[1] * exp
        else:
            closed.add(i)
            mon[algebra.var_index[i][how[1]]] += exp
    if num is None:
        num = algebra.domain.one
    if not num:
        return Element()
    return Element({tuple(shift): algebra.lift(num, tuple(mon))}, den)


def angular_momentum_kernel(expr, labels, purpose, given):
    """``(algebra, element)`` of ``expr`` over ``labels`` (sorted), which must cover every
    label of ``expr``, each an angular momentum; ``purpose`` and ``given`` word the errors."""
    algebra, (element,) = kernel_of(expr, extra_labels=labels)
    missing = [label for label in algebra.labels if label not in labels]
    if missing:
        raise OperatorError(f"label={missing[0]!r} of expr must be given {given} (given: {list(labels)})")
    for label, mode in zip(algebra.labels, algebra.modes):
        if mode is not ANGULAR_MOMENTUM:
            raise OperatorError(f"label={label!r} must be an angular momentum for {purpose} "
                                f"(it is a {mode.kind} mode)")
    return algebra, element


def kernel_of(*exprs, extra_labels=()):
    """``(algebra, [elements])`` for expressions converted together (one domain)."""
    checked = [_check_expr(expr) for expr in exprs]
    algebra = build_algebra(*checked, extra_labels=extra_labels)
    return algebra, [to_kernel(algebra, expr) for expr in checked]

