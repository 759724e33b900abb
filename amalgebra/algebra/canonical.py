r"""Canonical (normal-ordered) form of angular-momentum operator polynomials.

Explanation
===========

Every polynomial in the components of any number of labels has one and only
one expression as

.. math::

    \sum c \; J_{\pm}^{|d_J|} L_{\pm}^{|d_L|} \cdots \;
    (J^2)^{a} J_z^{b} (L^2)^{a'} L_z^{b'} \cdots

(the *m-shift form*): ladder powers of the labels in sorted order on the
left, then for each label (sorted) a power of its Casimir and of its
:math:`z` component, one term per operator monomial, its coefficient in the
one normal form of the coefficient domain (:mod:`amalgebra.algebra.coefficients`:
rational functions over :math:`\mathbb{Q}(i)` and radicals, ``exp``/``sin``/``cos`` of
symbols as Laurent polynomials in :math:`e^{ix}`).  Two
expressions are equal as operators exactly when their canonical forms are
structurally equal (``==``).  With spherical tensor and vector operator
components (:mod:`amalgebra.tensors.mixedform`, reached through the hooks of
:mod:`amalgebra.algebra.extensions`) the form is
:math:`\sum_W A_W\, W`: angular-momentum factors (in the form above) to the
left of tensor components, tensor components in the order written.  The
matrix element of one angular-momentum term is read off directly:

.. math::

    \langle j, m + d | J_+^d\, p(J^2, J_z) | j m \rangle
      = p(j(j+1), m) \prod_{k=0}^{d-1} \sqrt{(j - m - k)(j + m + k + 1)} .

Examples
========

>>> from amalgebra.algebra import AngularMomentum
>>> from amalgebra.algebra.canonical import canonical   # (the package exports it too)
>>> J = AngularMomentum("J")
>>> canonical(J.plus*J.minus)         # Sakurai (3.5.x): J+J- = J^2 - Jz^2 + Jz
J.squared + J.z - J.z**2
>>> canonical(J.z*J.plus)             # f(Jz) J+ = J+ f(Jz + 1)
J.plus + J.plus*J.z
>>> canonical(J.x*J.y - J.y*J.x)      # [Jx, Jy] = i Jz
I*J.z

See Also
========

amalgebra.algebra.commutators.commutator, amalgebra.matrices.explicit.to_matrix

References
==========

.. [1] J. J. Sakurai, *Modern Quantum Mechanics*, section 3.5.
"""

from sympy import Add, Dummy, Expr, I, Mul, Rational, S, default_sort_key, expand
from sympy.core.mul import _mulsort
from sympy.core.sympify import _sympify
from sympy.polys.polyerrors import CoercionFailed, GeneratorsError, PolynomialError

from ..errors import OperatorError
from .convert import angular_momentum_kernel, kernel_of
from .extensions import kernel_for
from .modes import ANGULAR_MOMENTUM
from .shiftform import _IOTA, _ring, _sum

_UNUSED = Dummy("unused")  # a ring needs one generator even for numeric eigenvalues

__all__ = ["canonical", "ladder_terms", "collect_casimir", "shift_form", "operator_coefficients"]


def canonical(expr, components="ladder"):
    r"""Return the unique normal-ordered form of ``expr`` (see the module docstring).

    Coefficients are collected, one term per operator monomial, each in the normal form
    of :mod:`amalgebra.algebra.coefficients` (rational functions over Q(i) and radicals;
    ``exp``, ``sin``, ``cos`` of symbols as Laurent polynomials in ``exp(i x)``, printed
    in Fourier form), so equal operators give ``==`` results:

    >>> from sympy import I, Symbol, cos, sin
    >>> from amalgebra.algebra import AngularMomentum
    >>> J = AngularMomentum("J")
    >>> b, t = Symbol("b"), Symbol("t")
    >>> canonical(b*J.x + b*J.y)
    b*(1 + I)*J.minus/2 + b*(1 - I)*J.plus/2
    >>> canonical((sin(t)**2 + cos(t)**2 - 1)*J.z)
    0
    >>> canonical(J.plus**2, components="cartesian")   # the same form, J+- = Jx +- i Jy
    (J.x + I*J.y)**2

    Examples
    ========

    >>> from sympy import Symbol
    >>> from amalgebra.algebra import AngularMomentum
    >>> J, S = AngularMomentum("J"), AngularMomentum("S")
    >>> a = Symbol("a")
    >>> canonical(S.z*J.plus*a)
    a*J.plus*S.z
    >>> e = J.plus**2*J.minus**2
    >>> canonical(e) == canonical(canonical(e))    # idempotent
    True

    Components of spherical tensors and vector operators (after
    ``import amalgebra.tensors``) are accepted too.  Convention of the mixed
    normal form: angular-momentum factors to the left of tensor components,
    tensor components in the order written (never reordered among
    themselves); see :mod:`amalgebra.tensors.mixedform`.

    >>> from amalgebra.tensors import VectorOperator
    >>> r = VectorOperator("r", "J")
    >>> canonical(r.z*J.plus)                  # z J+ = J+ z - [J+, z] = J+ z + x + i y
    J.plus*r[J].z + r[J].x + I*r[J].y
    >>> canonical(r.x*S.z*r.y) == S.z*r.x*r.y  # another label commutes; x, y keep their order
    True

    Parameters
    ==========

    expr : Expr
        A polynomial (nonnegative integer powers only) in components of
        :class:`~amalgebra.algebra.AngularMomentum` (and of spherical tensors
        and vector operators, see above) with commutative coefficients.
    components : ``"ladder"`` (default) or ``"cartesian"``
        How the unique form is presented: ladder powers :math:`J_\pm^d`, or the same
        terms with :math:`J_\pm = J_x \pm i J_y` (``(J.x + I*J.y)**d``; ``J.z``, ``J.squared``
        unchanged).  Both are deterministic functions of the operator.

    Raises
    ======

    OperatorError
        For negative/non-integer/symbolic powers of operators, unknown
        noncommutative objects, unsupported coefficients, or input that is not an
        expression.
    """
    if components not in ("ladder", "cartesian"):
        raise OperatorError(f"components={components!r} must be 'ladder' or 'cartesian'")
    algebra, (element,) = kernel_for(expr)
    out = algebra.to_expr(element)
    if components == "cartesian":
        from .rewrite import to_cartesian
        out = to_cartesian(out)
    return out


def operator_coefficients(expr):
    r"""The coefficients of ``expr`` as data: ``{operator monomial: coefficient}``.

    Explanation
    ===========

    Keys are the operator monomials of the canonical form (``J.plus**2*J.z``,
    ``J.minus*S.z``, ...; ``1`` for the identity), values their coefficients in
    the normal form of :mod:`amalgebra.algebra.coefficients`; zero coefficients
    are left out and keys are in SymPy's sort order.  Two operators are equal
    exactly when these dicts are equal, so an operator equation ``lhs = rhs``
    with unknown coefficients is the system ``operator_coefficients(lhs - rhs)``
    of ordinary equations, ready for ``sympy.solve``.  (``solve`` on the operator
    expression itself finds nothing: SymPy does not split noncommutative terms.)

    Examples
    ========

    >>> from sympy import solve, symbols
    >>> from amalgebra.algebra import AngularMomentum, operator_coefficients
    >>> J = AngularMomentum("J")
    >>> a, b = symbols("a b")
    >>> eqs = operator_coefficients(J.x**2 + J.y**2 + a*J.z**2 + b*J.z - J.squared)
    >>> eqs
    {J.z: b, J.z**2: a - 1}
    >>> solve(list(eqs.values()), [a, b], dict=True)       # J^2 = Jx^2 + Jy^2 + Jz^2
    [{a: 1, b: 0}]

    Unknown coefficients of a commutator (:math:`[J_z, X] = J_+` for
    :math:`X = a J_+ + b J_- + c J_z`):

    >>> from amalgebra.algebra import commutator
    >>> c = symbols("c")
    >>> solve(list(operator_coefficients(commutator(J.z, a*J.plus + b*J.minus + c*J.z) - J.plus).values()),
    ...       [a, b], dict=True)
    [{a: 1, b: 0}]

    Parameters
    ==========

    expr : Expr
        Anything :func:`canonical` accepts.
    """
    from .coefficients import normal_or_expanded

    out = {}
    for term in Add.make_args(canonical(expr)):
        if term == 0:
            continue
        c, nc = term.args_cnc()
        key = Mul(*nc) if nc else S.One
        out.setdefault(key, []).append(Mul(*c))
    result = {}
    for key in sorted(out, key=default_sort_key):
        value = normal_or_expanded(Add(*out[key]))[0]
        if value != 0:
            result[key] = value
    return result


def shift_form(expr):
    """The kernel view: ``{shift key: coefficient polynomial}`` as SymPy objects.

    Keys are ``tuple((label, d) ...)`` over the labels of ``expr`` (sorted);
    values are commutative-looking SymPy expressions in the operators
    ``L.squared`` and ``L.z`` (which commute with one another).

    >>> from amalgebra.algebra import AngularMomentum
    >>> J = AngularMomentum("J")
    >>> shift_form(J.x)
    {(('J', -1),): 1/2, (('J', 1),): 1/2}
    """
    algebra, (element,) = kernel_of(expr)
    out = {}
    for key in sorted(element):
        poly = element[key]
        terms = [Mul(algebra.coefficient(element, c), *algebra.term_factors(algebra.identity_shift, mon))
                 for mon, c in sorted(algebra.terms(poly), key=lambda item: item[0], reverse=True)]
        out[tuple(zip(algebra.labels, key))] = Add(*terms)
    return out


def collect_casimir(expr, label):
    """Collect the canonical form of ``expr`` by powers of ``label``'s :math:`J^2`.

    Returns a dict ``{k: coefficient}`` (k ascending) with
    ``canonical(expr) == sum(J.squared**k * coefficient)``; the coefficients
    are canonical and free of that Casimir.  As :math:`J^2` is central, one
    may then put :math:`j(j+1)` in its place.

    Examples
    ========

    >>> from amalgebra.algebra import AngularMomentum
    >>> J = AngularMomentum("J")
    >>> collect_casimir(J.plus*J.minus, "J")
    {0: J.z - J.z**2, 1: 1}
    """
    algebra, (element,) = kernel_of(expr, extra_labels=(label,))
    i = algebra.position[label]
    if algebra.modes[i] is not ANGULAR_MOMENTUM:
        raise OperatorError(f"label={label!r} must be an angular momentum to collect its J^2")
    g = algebra.var_index[i][0]
    groups = {}
    for key, mon, coeff in algebra.sorted_items(element):
        k = mon[g]
        rest = mon[:g] + (0,) + mon[g + 1:]
        groups.setdefault(k, []).append(
            Mul(algebra.coefficient(element, coeff), *algebra.term_factors(key, rest)))
    return {k: Add(*groups[k]) for k in sorted(groups)}


def _values(mapping, name):
    if not isinstance(mapping, dict):
        raise OperatorError(f"{name}={mapping!r} must be a dict label -> SymPy expression")
    out = {}
    for label, value in mapping.items():
        if not isinstance(label, str):
            raise OperatorError(f"{name} key {label!r} must be a label str")
        try:
            value = _sympify(value)  # safe: strict conversion, a str raises SympifyError
        except Exception as exc:  # SympifyError: strings are never parsed
            raise OperatorError(f"{name}[{label!r}]={value!r} must be a SymPy expression or number") from exc
        if not isinstance(value, Expr) or value.is_commutative is False:
            raise OperatorError(f"{name}[{label!r}]={value!r} must be a commutative SymPy expression")
        out[label] = value
    return out


def ladder_terms(expr, jsq, mz):
    r"""Matrix-element data of ``expr``: ``{shift key: p_d(eigenvalues)}``.

    Explanation
    ===========

    With ``expr`` in canonical form :math:`\sum_d R^{(d)} p_d(J^2, J_z)`,
    returns ``{key: p_d}`` where ``key = tuple((label, d) for label in
    sorted(jsq))`` (``d > 0`` a raising power, ``d < 0`` a lowering power)
    and :math:`p_d` is evaluated at :math:`J^2 \to` ``jsq[label]``,
    :math:`J_z \to` ``mz[label]`` and expanded.  Then
    :math:`\langle j, m+d|\,\mathrm{expr}\,|j m\rangle` is ``p_d`` times the
    Condon-Shortley factors :math:`\prod_{k<d} \sqrt{(j-m-k)(j+m+k+1)}`
    (for :math:`J_-^{|d|}`: :math:`\prod_{k<|d|} \sqrt{(j+m-k)(j-m+k+1)}`).
    Keys with a zero coefficient are left out.

    Examples
    ========

    >>> from sympy import symbols
    >>> from amalgebra.algebra import AngularMomentum, ladder_terms
    >>> j, m = symbols("j m")
    >>> J = AngularMomentum("J")
    >>> ladder_terms(J.x**2, {"J": j*(j + 1)}, {"J": m})
    {(('J', -2),): 1/4, (('J', 0),): j**2/2 + j/2 - m**2/2, (('J', 2),): 1/4}

    Parameters
    ==========

    expr : Expr
    jsq : dict
        label -> value of :math:`J^2` (e.g. ``j*(j+1)``).
    mz : dict
        label -> value of :math:`J_z` (e.g. ``m``); must have the same keys.

    Raises
    ======

    OperatorError
        If ``expr`` has a label missing from ``jsq`` or ``mz``.
    """
    jsq = _values(jsq, "jsq")
    mz = _values(mz, "mz")
    if sorted(jsq) != sorted(mz):
        raise OperatorError(f"mz keys {sorted(mz)} must equal jsq keys {sorted(jsq)}")
    algebra, element = angular_momentum_kernel(expr, sorted(jsq), "ladder_terms", "in jsq and mz")
    values = []
    for i, label in enumerate(algebra.labels):
        values.append((algebra.var_index[i][0], jsq[label]))
        values.append((algebra.var_index[i][1], mz[label]))
    evaluate = _evaluator(algebra, values)
    out = {}
    for key in sorted(element):
        value = evaluate(element[key], element.den)
        if value != 0:
            out[tuple(zip(algebra.labels, key))] = value
    return out


def _evaluator(algebra, values):
    """A function (poly, den) -> expanded SymPy expression with the variables replaced.

    Fast path: the values are polynomials in their free symbols, so the kernel
    polynomial is composed inside a ``sympy.polys`` ring over the kernel's own
    domain (or its field when the values need fractions).  Anything else (a
    symbol shared with the coefficients, ``EX``, non-polynomial values) goes
    through SymPy expressions.
    """
    symbols = set()
    for _, value in values:
        symbols |= value.free_symbols
    symbols = sorted(symbols, key=default_sort_key)
    domain = algebra.domain
    if algebra.scalars is not None or domain.is_EX:   # normal-form coefficients: through SymPy
        return _expr_evaluator(algebra, values)
    ground = algebra.ground  # ZZ for Gaussian algebras: iota stays a generator, as in the kernel
    extra = (_IOTA,) if algebra.gaussian else ()
    target = images = None
    for candidate in (ground, ground.get_field()):
        try:
            target = _ring(tuple(symbols) + extra or (_UNUSED,), candidate)
            images = [target.from_expr(value) for _, value in values]
            break
        except (CoercionFailed, GeneratorsError, PolynomialError, ValueError):
            target = None
    if target is None:
        return _expr_evaluator(algebra, values)
    convert = target.domain.convert_from
    index = {g: slot for slot, (g, _) in enumerate(values)}
    if algebra.gaussian:
        index[algebra.iota] = len(images)
        images.append(target.gens[len(symbols)])
    power_cache = {}
    gens = target.symbols
    t = len(symbols) if algebra.gaussian else None

    tdom = target.domain
    if tdom.is_ZZ:
        def to_rational(c, den):
            return Rational(int(c), den)
    elif tdom.is_QQ:
        def to_rational(c, den):
            return Rational(int(c.numerator), int(c.denominator) * den)
    else:
        def to_rational(c, den):
            value = tdom.to_sympy(c)
            return value if den == 1 else value / den

    def power(slot, e):
        hit = power_cache.get((slot, e))
        if hit is None:
            hit = power_cache[(slot, e)] = images[slot] ** e
        return hit

    def evaluate(poly, den):
        acc = {}
        get = acc.get
        for mon, coeff in poly.items():
            term = target.ground_new(convert(coeff, ground))
            for g, e in enumerate(mon):
                if e:
                    term = term * power(index[g], e)
            for m2, c2 in term.items():
                prev = get(m2)
                acc[m2] = c2 if prev is None else prev + c2
        merged = {}
        for m2, c2 in acc.items():
            if not c2:
                continue
            value = to_rational(c2, den)
            if t is not None and m2[t]:
                value = I * value
                m2 = m2[:t] + (0,) + m2[t + 1:]
            merged.setdefault(m2, []).append(value)
        terms = []
        for m2 in sorted(merged, reverse=True):
            powers = [power_expr(i, e) for i, e in enumerate(m2) if e]
            for value in merged[m2]:
                for part in (expand(value).args if value.is_Add else (value,)):
                    terms.append(_monomial(part, powers))
        return _sum(terms)

    def power_expr(i, e):
        hit = expr_cache.get((i, e))
        if hit is None:
            hit = expr_cache[(i, e)] = gens[i] ** e
        return hit

    expr_cache = {}

    return evaluate


def _monomial(coeff, powers):
    """``Mul(coeff, *powers)`` for a numeric coefficient and powers of distinct symbols."""
    if not coeff.is_Number or not all(p.is_Symbol or (p.is_Pow and p.base.is_Symbol) for p in powers):
        return Mul(coeff, *powers)
    args = list(powers)
    _mulsort(args)
    if coeff is not S.One:
        args.insert(0, coeff)
    if not args:
        return S.One
    if len(args) == 1:
        return args[0]
    return Mul._from_args(args)


def _expr_evaluator(algebra, values):
    to_sympy = algebra.domain.to_sympy
    ngens = algebra.ring.ngens
    repl = [None] * ngens
    for g, value in values:
        repl[g] = value

    def evaluate(poly, den):
        terms = []
        for mon, coeff in algebra.terms(poly):
            terms.append(Mul(to_sympy(coeff), *[repl[g] ** e for g, e in enumerate(mon) if e]))
        return expand(Add(*terms) / den)

    return evaluate

