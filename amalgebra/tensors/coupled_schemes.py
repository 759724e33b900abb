r"""Reduced matrix elements in coupled schemes :math:`|(j_1 j_2) J\rangle`, and the projection theorem.

Explanation
===========

Operators acting on part 1 or part 2 of a coupled pair, tensor products
:math:`[T^{k_1}(1) \times U^{k_2}(2)]^k` and scalar products
:math:`T^k(1)\cdot U^k(2)`, between :math:`|(j_1' j_2') J' M'\rangle` and
:math:`|(j_1 j_2) J M\rangle` (coupling order 1 then 2, Condon-Shortley
Clebsch-Gordan coefficients).  Edmonds (1957) normalisation of the reduced
elements (see :mod:`amalgebra.tensors.wigner_eckart`):

* tensor product (Edmonds eq. 7.1.5)

  .. math::

      \langle j_1' j_2' J' \| [T^{k_1} \times U^{k_2}]^{k} \| j_1 j_2 J\rangle
        = \sqrt{(2J+1)(2J'+1)(2k+1)}
          \begin{Bmatrix} j_1' & j_1 & k_1 \\ j_2' & j_2 & k_2 \\ J' & J & k \end{Bmatrix}
          \langle j_1' \| T^{k_1} \| j_1\rangle \langle j_2' \| U^{k_2} \| j_2\rangle ;

* scalar product :math:`T\cdot U = \sum_q (-1)^q T_q U_{-q}` (Edmonds eq. 7.1.6), a full
  matrix element, diagonal in :math:`J, M`:

  .. math::

      \langle j_1' j_2' J M | T^k(1)\cdot U^k(2) | j_1 j_2 J M\rangle
        = (-1)^{j_1 + j_2' + J}
          \begin{Bmatrix} J & j_2' & j_1' \\ k & j_1 & j_2 \end{Bmatrix}
          \langle j_1' \| T^k \| j_1\rangle \langle j_2' \| U^k \| j_2\rangle ;

* part 1 only (Edmonds eq. 7.1.7), with :math:`\delta_{j_2 j_2'}`:

  .. math::

      \langle j_1' j_2 J' \| T^k(1) \| j_1 j_2 J\rangle
        = (-1)^{j_1' + j_2 + J + k} \sqrt{(2J+1)(2J'+1)}
          \begin{Bmatrix} j_1' & J' & j_2 \\ J & j_1 & k \end{Bmatrix}
          \langle j_1' \| T^k \| j_1\rangle ;

* part 2 only (Edmonds eq. 7.1.8), with :math:`\delta_{j_1 j_1'}`:

  .. math::

      \langle j_1 j_2' J' \| U^k(2) \| j_1 j_2 J\rangle
        = (-1)^{j_1 + j_2 + J' + k} \sqrt{(2J+1)(2J'+1)}
          \begin{Bmatrix} j_2' & J' & j_1 \\ J & j_2 & k \end{Bmatrix}
          \langle j_2' \| U^k \| j_2\rangle .

The equation numbers are quoted from memory; every formula is checked in
``tests/tensors/test_coupled_schemes.py`` against explicit matrices built from
the definitions (Clebsch-Gordan coupling of uncoupled matrices), and the
module's output is what those tests pin.  With ``convention="cg"`` inputs
and output are in the Clebsch-Gordan-form normalisation; they are converted
through :func:`amalgebra.tensors.wigner_eckart.convert_reduced`.

Projection theorem (vector operators, Edmonds eq. 5.4.3 style):
:math:`\langle j m'|V_q|j m\rangle = \langle j m'|J_q|j m\rangle \langle \mathbf{J}\cdot\mathbf{V}\rangle_j/(j(j+1))`.

Examples
========

>>> from sympy import Rational, sqrt
>>> from amalgebra.tensors.coupled_schemes import reduced_part1, scalar_product_element
>>> reduced_part1(1, "1/2", "3/2", 1, "1/2", "3/2", 1)
sqrt(10)*<1||T^(1)||1>/3

An identity: :math:`\mathbf{L}\cdot\mathbf{S}` in :math:`|(1, 1/2) J\rangle` is
:math:`[J(J+1) - 2 - 3/4]/2`, from :math:`\langle l\|L\|l\rangle = \sqrt{l(l+1)(2l+1)}`:

>>> h = Rational(1, 2)
>>> red_L, red_S = sqrt(1*2*3), sqrt(h*(h + 1)*2)
>>> [scalar_product_element(1, h, J, 1, h, J, 1, red_L, red_S) for J in (h, 3*h)]
[-1, 1/2]

References
==========

.. [1] A. R. Edmonds, *Angular Momentum in Quantum Mechanics*, Princeton (1957), section 7.1.
"""

from sympy import Add, Rational, S, sqrt

from .._validation import as_expression
from ..coupling import ninej, sixj
from ..errors import QuantumNumberError
from ..qnumbers import quantum_number, triangle
from .wigner_eckart import (ReducedMatrixElement, check_convention, convert_reduced,
                       wigner_eckart_factor)
from .tree_elements import part_one_factor, part_two_factor, product_factor

__all__ = [
    "reduced_part1",
    "reduced_part2",
    "reduced_tensor_product",
    "tensor_product_table",
    "reduced_product_same_space",
    "scalar_product_element",
    "projection_theorem",
    "projected_reduced",
    "angular_momentum_reduced",
]


def _js(values, names):
    return [quantum_number(v, n, nonnegative=True) for v, n in zip(values, names)]


def _sign(exponent):
    exponent = as_expression(exponent)
    if exponent.is_Integer:
        return S.NegativeOne if int(exponent) % 2 else S.One
    return S.NegativeOne ** exponent


def _check_couplings(j1, j2, J, name):
    if all(x.is_number for x in (j1, j2, J)) and not triangle(j1, j2, J):
        raise QuantumNumberError(f"{name}=({j1}, {j2}, {J}) must satisfy the triangle rule: "
                                 f"no such coupled state")


def _default(reduced, name, k, jp, j, convention):
    if reduced is None:
        return ReducedMatrixElement(name, k, jp, j, convention)
    return as_expression(reduced)


def _to_edmonds(value, jp, j, convention):
    if convention == "edmonds" or isinstance(value, ReducedMatrixElement):
        # a symbol stands for the number in its own convention: rescale by hand
        return value if convention == "edmonds" else sqrt(2 * jp + 1) * value
    return convert_reduced(value, jp, j, convention, "edmonds")


def reduced_part1(j1p, j2p, Jp, j1, j2, J, k, reduced=None, *, name="T", convention="edmonds"):
    r"""Reduced element of :math:`T^k(1)` between :math:`|(j_1' j_2') J'\rangle` and :math:`|(j_1 j_2)J\rangle`.

    ``reduced`` is :math:`\langle j_1'\|T^k\|j_1\rangle` (default: a
    :class:`~amalgebra.tensors.wigner_eckart.ReducedMatrixElement` named ``name``).  Zero
    unless ``j2p == j2``.  Edmonds eq. 7.1.7 (see the module docstring).

    Examples
    ========

    >>> from amalgebra.tensors.coupled_schemes import reduced_part1
    >>> reduced_part1(1, 1, 1, 1, 0, 1, 1)   # j2' != j2
    0
    """
    convention = check_convention(convention)
    j1p, j2p, Jp, j1, j2, J, k = _js((j1p, j2p, Jp, j1, j2, J, k),
                                     ("j1p", "j2p", "Jp", "j1", "j2", "J", "k"))
    _check_couplings(j1p, j2p, Jp, "(j1p, j2p, Jp)")
    _check_couplings(j1, j2, J, "(j1, j2, J)")
    red = _default(reduced, name, k, j1p, j1, convention)
    if j2p != j2:
        return S.Zero
    coefficient = part_one_factor(j1p, j2, Jp, j1, J, k)
    return _from_edmonds(coefficient * _to_edmonds(red, j1p, j1, convention), Jp, convention)


def reduced_part2(j1p, j2p, Jp, j1, j2, J, k, reduced=None, *, name="U", convention="edmonds"):
    r"""Reduced element of :math:`U^k(2)` between :math:`|(j_1' j_2') J'\rangle` and :math:`|(j_1 j_2)J\rangle`.

    ``reduced`` is :math:`\langle j_2'\|U^k\|j_2\rangle`.  Zero unless
    ``j1p == j1``.  Edmonds eq. 7.1.8 (see the module docstring).

    Examples
    ========

    >>> from amalgebra.tensors.coupled_schemes import reduced_part2
    >>> reduced_part2(1, "1/2", "1/2", 1, "1/2", "3/2", 1, 1)
    2*sqrt(2)/3
    """
    convention = check_convention(convention)
    j1p, j2p, Jp, j1, j2, J, k = _js((j1p, j2p, Jp, j1, j2, J, k),
                                     ("j1p", "j2p", "Jp", "j1", "j2", "J", "k"))
    _check_couplings(j1p, j2p, Jp, "(j1p, j2p, Jp)")
    _check_couplings(j1, j2, J, "(j1, j2, J)")
    red = _default(reduced, name, k, j2p, j2, convention)
    if j1p != j1:
        return S.Zero
    coefficient = part_two_factor(j1, j2p, Jp, j2, J, k)
    return _from_edmonds(coefficient * _to_edmonds(red, j2p, j2, convention), Jp, convention)


def _from_edmonds(value, Jp, convention):
    return value if convention == "edmonds" else value / sqrt(2 * Jp + 1)


def reduced_tensor_product(j1p, j2p, Jp, j1, j2, J, k1, k2, k, reduced1=None, reduced2=None, *,
                           names=("T", "U"), convention="edmonds"):
    r"""Reduced element of :math:`[T^{k_1}(1)\times U^{k_2}(2)]^k` in the coupled scheme (9j formula).

    Edmonds eq. 7.1.5 (see the module docstring); the tensor product is
    :math:`[T\times U]^k_q = \sum_{q_1 q_2} \langle k_1 q_1 k_2 q_2|k q\rangle T_{q_1} U_{q_2}`.

    Examples
    ========

    >>> from amalgebra.tensors.coupled_schemes import reduced_tensor_product
    >>> reduced_tensor_product(1, 1, 0, 1, 1, 0, 1, 1, 0)
    sqrt(3)*<1||T^(1)||1>*<1||U^(1)||1>/9
    """
    convention = check_convention(convention)
    j1p, j2p, Jp, j1, j2, J, k1, k2, k = _js(
        (j1p, j2p, Jp, j1, j2, J, k1, k2, k), ("j1p", "j2p", "Jp", "j1", "j2", "J", "k1", "k2", "k"))
    _check_couplings(j1p, j2p, Jp, "(j1p, j2p, Jp)")
    _check_couplings(j1, j2, J, "(j1, j2, J)")
    red1 = _to_edmonds(_default(reduced1, names[0], k1, j1p, j1, convention), j1p, j1, convention)
    red2 = _to_edmonds(_default(reduced2, names[1], k2, j2p, j2, convention), j2p, j2, convention)
    coefficient = product_factor(j1p, j1, k1, j2p, j2, k2, Jp, J, k)
    return _from_edmonds(coefficient * red1 * red2, Jp, convention)


def _coupled_range(a, b):
    low = abs(a - b)
    return [low + n for n in range(int(a + b - low) + 1)]


def tensor_product_table(js1, js2, k1, k2, ranks, *, symbolic=False, names=("T", "U")):
    r"""All reduced elements of :math:`[T^{k_1}(1)\times U^{k_2}(2)]^k` between coupled states, at once.

    Explanation
    ===========

    For every :math:`j_1, j_1' \in` ``js1``, :math:`j_2, j_2' \in` ``js2`` with
    :math:`(j_1' k_1 j_1)` and :math:`(j_2' k_2 j_2)` triangles, every coupled
    :math:`J, J'` and every ``k`` in ``ranks`` allowed by :math:`(J' k J)`, the
    entry ``(j1p, j2p, Jp, j1, j2, J, k)`` is the geometric coefficient
    :math:`\sqrt{(2J+1)(2J'+1)(2k+1)}\,\{9j\}` of Edmonds eq. 7.1.5 (Edmonds
    normalisation), or with ``symbolic=True`` that coefficient times the two
    symbolic reduced elements.  Zero entries (a vanishing 9j) are kept.

    Examples
    ========

    >>> from amalgebra.tensors.coupled_schemes import tensor_product_table, reduced_tensor_product
    >>> table = tensor_product_table([1], ["1/2"], 1, 1, [0, 1, 2], symbolic=True)
    >>> len(table)
    9
    >>> all(value == reduced_tensor_product(*key[:6], 1, 1, key[6]) for key, value in table.items())
    True
    """
    from sympy import Mul
    from sympy.core.add import _args_sortkey

    from ..coupling.coefficients import _to_sympy
    from ..coupling.kernels import multiply_sqrt, ninej_kernel

    hs1 = sorted({quantum_number(j, "js1", nonnegative=True) for j in js1})
    hs2 = sorted({quantum_number(j, "js2", nonnegative=True) for j in js2})
    k1, k2 = _js((k1, k2), ("k1", "k2"))
    ranks = sorted({quantum_number(k, "ranks", nonnegative=True) for k in ranks})
    # doubled ints from here on: the kernel's triples are turned into SymPy numbers once per entry
    t1s, t2s = [int(2 * j) for j in hs1], [int(2 * j) for j in hs2]
    tk1, tk2 = int(2 * k1), int(2 * k2)
    tks = [int(2 * k) for k in ranks]
    half = {t: Rational(t, 2) for t in range(0, 2 * max(t1s + t2s + tks + [tk1, tk2]) + 2)}

    def tri(a, b, c):
        return not (a + b + c) & 1 and abs(a - b) <= c <= a + b

    pairs1 = [(a, b) for a in t1s for b in t1s if tri(a, tk1, b)]
    pairs2 = [(a, b) for a in t2s for b in t2s if tri(a, tk2, b)]
    table = {}
    for t1p, t1 in pairs1:
        for t2p, t2 in pairs2:
            factors = None
            if symbolic:
                product = (ReducedMatrixElement(names[0], k1, half[t1p], half[t1])
                           * ReducedMatrixElement(names[1], k2, half[t2p], half[t2]))
                factors = product.args if isinstance(product, Mul) else (product,)
            for tJ in range(abs(t1 - t2), t1 + t2 + 1, 2):
                for tJp in range(abs(t1p - t2p), t1p + t2p + 1, 2):
                    for tk in tks:
                        if not tri(tJp, tk, tJ):
                            continue
                        if tri(tk1, tk2, tk):
                            # every row and column is a triad here, so the raw kernel applies; it is
                            # cheaper than the symmetry reduction that would let a cache hit
                            triple = multiply_sqrt(ninej_kernel(t1p, t1, tk1, t2p, t2, tk2, tJp, tJ, tk),
                                                   (tJ + 1) * (tJp + 1) * (tk + 1))
                        else:
                            triple = (0, 1, 1)
                        value = _to_sympy(triple)
                        if factors is not None:
                            value = _times_symbols(value, factors, Mul, _args_sortkey)
                        table[(half[t1p], half[t2p], half[tJp], half[t1], half[t2], half[tJ], half[tk])] = value
    return table


def _times_symbols(value, factors, Mul, sortkey):
    """``value * Mul(*factors)`` for a number ``value`` and commutative non-number factors, built once.

    The same expression as generic ``*``: the Rational part first, the other factors sorted as
    ``Mul`` sorts them (nothing to collect: the factors are distinct symbols and one square root).
    """
    if value == 0:
        return S.Zero
    if value.is_Rational:
        rest = ()
        coeff = value
    elif isinstance(value, Mul):
        coeff, rest = value.args[0], value.args[1:]
    else:
        coeff, rest = S.One, (value,)
    others = sorted((*rest, *factors), key=sortkey)
    args = tuple(others) if coeff == 1 else (coeff, *others)
    return args[0] if len(args) == 1 else Mul._from_args(args)


def reduced_product_same_space(jp, j, k1, k2, k, intermediate, *, convention="edmonds"):
    r"""Reduced element of :math:`[T^{k_1}\times U^{k_2}]^k` with both factors acting on one space.

    Explanation
    ===========

    Edmonds eq. 7.1.1 (number from memory; checked against explicit matrices in the tests):

    .. math::

        \langle j'\|[T^{k_1}\times U^{k_2}]^k\|j\rangle = (-1)^{j'+k+j}\sqrt{2k+1}
          \sum_{j''} \begin{Bmatrix} k_1 & k_2 & k \\ j & j' & j'' \end{Bmatrix}
          \langle j'\|T^{k_1}\|j''\rangle\langle j''\|U^{k_2}\|j\rangle .

    ``intermediate`` maps each intermediate :math:`j''` to the pair
    ``(<j'||T||j''>, <j''||U||j>)``; pairs are given in ``convention``.

    Examples
    ========

    :math:`[J\times J]^1 = -J/\sqrt{2}`, from :math:`[A\times B]^1 = i(\mathbf{A}\times\mathbf{B})/\sqrt{2}`
    and :math:`\mathbf{J}\times\mathbf{J} = i\mathbf{J}`:

    >>> from sympy import sqrt
    >>> from amalgebra.tensors.coupled_schemes import reduced_product_same_space
    >>> red = sqrt(15)          # <3/2||J||3/2> = sqrt(j(j+1)(2j+1))
    >>> reduced_product_same_space("3/2", "3/2", 1, 1, 1, {"3/2": (red, red)}) == -red / sqrt(2) != 0
    True
    """
    convention = check_convention(convention)
    jp, j, k1, k2, k = _js((jp, j, k1, k2, k), ("jp", "j", "k1", "k2", "k"))
    terms = []
    for key in sorted(intermediate, key=lambda x: quantum_number(x, "j''", nonnegative=True)):
        jpp = quantum_number(key, "j''", nonnegative=True)
        red1, red2 = (as_expression(x) for x in intermediate[key])
        red1 = _to_edmonds(red1, jp, jpp, convention)
        red2 = _to_edmonds(red2, jpp, j, convention)
        terms.append(sixj(k1, k2, k, j, jp, jpp) * red1 * red2)
    total = _sign(jp + k + j) * sqrt(2 * k + 1) * Add(*terms)
    return _from_edmonds(total, jp, convention)


def scalar_product_element(j1p, j2p, Jp, j1, j2, J, k, reduced1=None, reduced2=None, *,
                           names=("T", "U"), convention="edmonds"):
    r"""The matrix element :math:`\langle (j_1'j_2')J'M|T^k(1)\cdot U^k(2)|(j_1j_2)JM\rangle` (6j formula).

    Not a reduced element: the scalar product is diagonal in ``J`` and ``M``
    and independent of ``M``; zero when ``Jp != J``.  Edmonds eq. 7.1.6 (see
    the module docstring), scalar product
    :math:`T\cdot U = \sum_q (-1)^q T_q U_{-q}`.

    Examples
    ========

    >>> from amalgebra.tensors.coupled_schemes import scalar_product_element
    >>> scalar_product_element(1, 1, 0, 1, 1, 0, 1)
    -<1||T^(1)||1>*<1||U^(1)||1>/3
    """
    convention = check_convention(convention)
    j1p, j2p, Jp, j1, j2, J, k = _js((j1p, j2p, Jp, j1, j2, J, k),
                                     ("j1p", "j2p", "Jp", "j1", "j2", "J", "k"))
    _check_couplings(j1p, j2p, Jp, "(j1p, j2p, Jp)")
    _check_couplings(j1, j2, J, "(j1, j2, J)")
    red1 = _to_edmonds(_default(reduced1, names[0], k, j1p, j1, convention), j1p, j1, convention)
    red2 = _to_edmonds(_default(reduced2, names[1], k, j2p, j2, convention), j2p, j2, convention)
    if Jp != J:
        return S.Zero
    return _sign(j1 + j2p + J) * sixj(J, j2p, j1p, k, j1, j2) * red1 * red2


def angular_momentum_reduced(j, convention="edmonds"):
    r""":math:`\langle j\|J\|j\rangle`: :math:`\sqrt{j(j+1)(2j+1)}` (Edmonds), :math:`\sqrt{j(j+1)}` (cg).

    >>> from amalgebra.tensors.coupled_schemes import angular_momentum_reduced
    >>> angular_momentum_reduced(1), angular_momentum_reduced(1, "cg")
    (sqrt(6), sqrt(2))
    """
    convention = check_convention(convention)
    j = quantum_number(j, "j", nonnegative=True)
    value = sqrt(j * (j + 1) * (2 * j + 1))
    return value if convention == "edmonds" else value / sqrt(2 * j + 1)


def projected_reduced(j, jdotv, convention="edmonds"):
    r""":math:`\langle j\|V\|j\rangle` of a vector operator from :math:`\langle \mathbf{J}\cdot\mathbf{V}\rangle_j`.

    :math:`\langle j\|V\|j\rangle = \langle \mathbf{J}\cdot\mathbf{V}\rangle_j\, \langle j\|J\|j\rangle/(j(j+1))`
    (projection theorem); ``j = 0`` raises :class:`~amalgebra.errors.QuantumNumberError`.

    >>> from amalgebra.tensors.coupled_schemes import projected_reduced
    >>> projected_reduced(1, 2)        # V = J: <J.J> = j(j+1) = 2
    sqrt(6)
    """
    j = quantum_number(j, "j", nonnegative=True)
    if j == 0:
        raise QuantumNumberError("j=0 must be positive: the projection theorem divides by j(j+1)")
    return as_expression(jdotv) * angular_momentum_reduced(j, convention) / (j * (j + 1))


def projection_theorem(j, mp, q, m, jdotv):
    r"""The projection theorem: :math:`\langle j m'|V_q|j m\rangle = \langle j m'|J_q|j m\rangle \langle\mathbf{J}\cdot\mathbf{V}\rangle_j / (j(j+1))`.

    ``jdotv`` is :math:`\langle j m|\mathbf{J}\cdot\mathbf{V}|j m\rangle`
    (independent of ``m``).  Spherical components as in design.md.

    Examples
    ========

    The Lande factor of :math:`^2P_{3/2}` (:math:`g_L = 1`, :math:`g_S = 2`):
    :math:`\mathbf{J}\cdot(\mathbf{L} + 2\mathbf{S}) = J^2 + \mathbf{J}\cdot\mathbf{S}`,
    :math:`\langle\mathbf{J}\cdot\mathbf{S}\rangle = [J(J+1) + S(S+1) - L(L+1)]/2`:

    >>> from sympy import Rational
    >>> from amalgebra.tensors.coupled_schemes import projection_theorem
    >>> J, L, Sv = Rational(3, 2), 1, Rational(1, 2)
    >>> jdotv = J*(J + 1) + (J*(J + 1) + Sv*(Sv + 1) - L*(L + 1))/2
    >>> projection_theorem(J, J, 0, J, jdotv) / J          # g_J = 4/3
    4/3
    """
    j = quantum_number(j, "j", nonnegative=True)
    return wigner_eckart_factor(j, mp, 1, q, j, m) * projected_reduced(j, jdotv)
