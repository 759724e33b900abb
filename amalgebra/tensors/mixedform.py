r"""Exact normal form of polynomials in angular-momentum AND tensor/vector operator components.

Explanation
===========

Convention of the normal form: every polynomial in the components of angular
momenta (:class:`~amalgebra.algebra.AngularMomentum`), of spherical tensors
(:class:`~amalgebra.tensors.spherical.SphericalTensor`) and of vector
operators (:class:`~amalgebra.tensors.vectors.VectorOperator`) is written
uniquely as

.. math::

    \sum_{W} A_W \, W, \qquad W = X_1 X_2 \cdots X_n ,

with **angular-momentum factors to the left** of the tensor components: each
:math:`A_W` is in the canonical m-shift form of
:func:`~amalgebra.algebra.canonical` (ladder powers, then :math:`J^2` and
:math:`J_z` powers), and :math:`W` is a word of tensor components **in the
order written**.  The library never reorders tensor components among
themselves (``x`` and ``p`` do not commute); only angular-momentum factors
move, using the commutation rules built into the definition of a tensor
operator under its label :math:`\mathbf{J}` (Racah; Sakurai sec. 3.10-3.11):

.. math::

    [J_z, T^k_q] = q\, T^k_q, \qquad
    [J_\pm, T^k_q] = \sqrt{(k \mp q)(k \pm q + 1)}\; T^k_{q \pm 1}, \qquad
    [J_a, V_b] = i \epsilon_{abc} V_c .

Moving a component right past angular-momentum factors of its own label:
:math:`T_q f(J_z) = f(J_z - q)\, T_q`,
:math:`T_q J_+^d = \sum_n \binom{d}{n} J_+^{d-n} (-\mathrm{ad}_{J_+})^n(T_q)`
(same for :math:`J_-`), and, since :math:`J^2` is not central in the mixed
algebra,

.. math::

    T_q J^2 = J^2 T_q - [J^2, T_q], \qquad
    [J^2, T_q] = c_+ J_- T_{q+1} + c_- J_+ T_{q-1} + (2 q J_z - k(k+1)) T_q ,

:math:`c_\pm = \sqrt{(k \mp q)(k \pm q + 1)}` (derived from
:math:`J^2 = J_- J_+ + J_z^2 + J_z`; checked against explicit matrices in the
tests).  Components of other labels commute with the tensor.

Internals: the kernel works in a rescaled *weight basis* whose ladder
coefficients are integers, :math:`\tilde T_q = \sqrt{(k-q)!/(k+q)!}\, T_q`
(:math:`[J_+, \tilde T_q] = (k-q)(k+q+1) \tilde T_{q+1}`,
:math:`[J_-, \tilde T_q] = \tilde T_{q-1}`) and for vectors
:math:`V_\pm = V_x \pm i V_y`, :math:`V_z`
(:math:`[J_+, V_z] = -V_+`, :math:`[J_+, V_-] = 2 V_z`, :math:`[J_-, V_+] = -2 V_z`,
:math:`[J_-, V_z] = V_-`).  The square roots :math:`\sqrt{(k+q)!/(k-q)!}` that
enter with the input components are kept outside the kernel as a squarefree
integer :math:`m` per term (an element is a dict ``(m, word) -> kernel
element`` meaning :math:`\sqrt m \, A\, \tilde W`), so kernel coefficients stay
in ``ZZ``/``ZZ_I`` (or the user's symbolic domain).  Output converts back:
spherical components as ``T[q]``, vector components as ``r.x, r.y, r.z``.

Examples
========

>>> from sympy import I, sqrt
>>> from amalgebra.algebra import AngularMomentum, canonical, commutator
>>> from amalgebra.tensors import SphericalTensor, VectorOperator
>>> L, r = AngularMomentum("L"), VectorOperator("r", "L")
>>> commutator(L.plus, r.z)                      # Sakurai (3.10.x): [L+, z] = -(x + i y)
-r[L].x - I*r[L].y
>>> canonical(r.z*L.plus)
L.plus*r[L].z + r[L].x + I*r[L].y
>>> T = SphericalTensor("T", 1, "L")
>>> canonical(T[0]*L.plus)                       # T0 L+ = L+ T0 - sqrt(2) T1
L.plus*T^(1)[L]_(0) - sqrt(2)*T^(1)[L]_(1)

An identity: :math:`[L^2, T^k_q]` from the formula above, for k = 1, q = 0:

>>> k, q = 1, 0
>>> commutator(L.squared, T[q]) == canonical(
...     sqrt(2)*L.minus*T[1] + sqrt(2)*L.plus*T[-1] + (2*q*L.z - k*(k + 1))*T[q]) != 0
True

References
==========

.. [1] J. J. Sakurai, *Modern Quantum Mechanics*, sections 3.10 and 3.11.
.. [2] G. Racah, Phys. Rev. 62, 438 (1942).
"""

from math import comb, gcd

from sympy import Add, I, Integer, Mul, Rational, S, default_sort_key, sqrt
from sympy.ntheory import factorint

from ..algebra.coefficients import scalar_terms
from ..algebra.convert import _check_expr, _scalar, choose_domain, operator_power_base, to_kernel
from ..algebra.extensions import register_extension
from ..algebra.modes import ANGULAR_MOMENTUM, mode_of
from ..algebra.shiftform import Element, ShiftAlgebra
from ..errors import OperatorError
from .spherical import TensorComponent
from .vectors import VectorComponent, VectorOperator

__all__ = ["MixedAlgebra", "mixed_kernel", "TENSOR_EXTENSION"]

# vector weight basis (doubled q): V+ = Vx + i Vy (2), Vz (0), V- = Vx - i Vy (-2)
_VECTOR_RAISE = {0: -1, -2: 2}   # [J+, u_q] = a(q) u_{q+1}
_VECTOR_LOWER = {2: -2, 0: 1}    # [J-, u_q] = b(q) u_{q-1}


_RADICAL_LIMIT = 2 ** 64   # larger radicands stay in the coefficient domain (no factoring)


def _prime_exponents(n, out, sign=1):
    """Add the prime exponents of the positive int ``n`` (times ``sign``) into ``out``."""
    for prime, e in factorint(n).items():
        out[prime] = out.get(prime, 0) + sign * e
    return out


def _split_root(exponents):
    """``sqrt(prod p^e) = (num/den) * sqrt(m)`` with ``m`` squarefree: returns ``(num, den, m)``."""
    num = den = m = 1
    for p in sorted(exponents):
        e = exponents[p]
        half, odd = e // 2, e % 2  # floor: p^(-3/2) = p^-2 * sqrt(p)
        if half > 0:
            num *= p ** half
        elif half < 0:
            den *= p ** (-half)
        if odd:
            m *= p
    return num, den, m


class _Family:
    """Kernel data of one tensor or vector family: weights, ladder coefficients, scales."""

    def __init__(self, obj):
        self.obj = obj
        self.vector = isinstance(obj, VectorOperator)
        self.label = obj.label
        self.tk = 2 if self.vector else int(2 * obj.rank)

    def raise_coeff(self, tq):
        if tq >= self.tk:
            return 0
        if self.vector:
            return _VECTOR_RAISE[tq]
        return ((self.tk - tq) // 2) * ((self.tk + tq + 2) // 2)   # (k - q)(k + q + 1)

    def lower_coeff(self, tq):
        if tq <= -self.tk:
            return 0
        return _VECTOR_LOWER[tq] if self.vector else 1

    def scale_exponents(self, tq):
        """Prime exponents of s(q)^2 = (k+q)!/(k-q)!, where T_q = s(q) T~_q."""
        out = {}
        up, down = (self.tk + tq) // 2, (self.tk - tq) // 2
        for n in range(2, up + 1):
            _prime_exponents(n, out)
        for n in range(2, down + 1):
            _prime_exponents(n, out, -1)
        return out

    def user_atom(self, tq):
        return self.obj[Rational(tq, 2)]


def _radical(node):
    """Prime exponents ``e`` with ``node = sqrt(prod p^e)`` for ``node = (p/q)^(+-1/2)``, else None."""
    if (node.is_Pow and node.base.is_Rational and node.base.is_positive and node.exp in (S.Half, -S.Half)
            and node.base.p < _RADICAL_LIMIT and node.base.q < _RADICAL_LIMIT):
        sign = 1 if node.exp is S.Half else -1
        out = _prime_exponents(int(node.base.p), {}, sign)
        return _prime_exponents(int(node.base.q), out, -sign)
    return None


def _strip_radicals(node):
    """``(rest, exponents)`` for a ``Mul``: square roots of rationals are kept out of the kernel domain."""
    exponents, rest = {}, []
    for arg in node.args:
        found = _radical(arg)
        if found is None:
            rest.append(arg)
        else:
            for p, e in found.items():
                exponents[p] = exponents.get(p, 0) + e
    return (node, None) if not exponents else (Mul(*rest), exponents)


def _scan(exprs):
    """Validate ``exprs``; return ``(labels->mode, scalars, families, constants)``."""
    modes, scalars, families, constants = {}, {}, {}, []
    seen = set()
    stack = list(exprs)
    while stack:
        node = stack.pop()
        if node in seen:
            continue
        seen.add(node)
        if node.is_Mul:
            node = _strip_radicals(node)[0]
        if _radical(node) is not None:
            continue
        if node.is_commutative:
            scalars[node] = None
        elif node.is_Add or node.is_Mul:
            stack.extend(node.args)
        elif node.is_Pow:
            stack.append(operator_power_base(node))
        elif isinstance(node, (TensorComponent, VectorComponent)):
            family = node.tensor if isinstance(node, TensorComponent) else node.vector
            families[family] = None
            if isinstance(node, VectorComponent) and node.axis == "y":
                constants.append(I)
            _claim_label(modes, family.label, ANGULAR_MOMENTUM)
        else:
            found = mode_of(node)
            if found is None:
                raise OperatorError(f"expr={node} must be built from angular-momentum, tensor and "
                                    f"vector components; {type(node).__name__} is not a known operator")
            mode, label, component = found
            _claim_label(modes, label, mode)
            constants.extend(mode.atom_constants(component))
    ordered = sorted(families, key=default_sort_key)
    return modes, list(scalars), ordered, constants


def _claim_label(modes, label, mode):
    known = modes.get(label)
    if known is not None and known is not mode:
        raise OperatorError(f"label={label!r} must name one kind of operator only")
    modes[label] = mode


def mixed_kernel(*exprs):
    """``(MixedAlgebra, [elements])`` for expressions converted together (one domain).

    Examples
    ========

    >>> from amalgebra.algebra import AngularMomentum
    >>> from amalgebra.tensors import VectorOperator
    >>> from amalgebra.tensors.mixedform import mixed_kernel
    >>> J, V = AngularMomentum("J"), VectorOperator("V", "J")
    >>> algebra, (a, b) = mixed_kernel(J.z, V.x)
    >>> algebra.to_expr(algebra.sub(algebra.mul(a, b), algebra.mul(b, a)))   # [Jz, Vx] = i Vy
    I*V[J].y

    Parameters
    ==========

    exprs : Expr
        Polynomials (nonnegative integer powers) in components of angular
        momenta, spherical tensors and vector operators, with commutative
        coefficients.  Square roots of rationals in a product's coefficient
        are kept beside the kernel (the ``m`` of the element keys), so that
        output of :func:`~amalgebra.algebra.canonical` converts back over
        ``ZZ``/``ZZ_I``.

    Raises
    ======

    OperatorError
        Negative, non-integer or symbolic powers of operators, unknown
        noncommutative atoms, a label used by two kinds of operators,
        input that is not an expression.

    See Also
    ========

    amalgebra.algebra.canonical, amalgebra.algebra.extensions
    """
    checked = [_check_expr(expr) for expr in exprs]
    modes, scalars, families, constants = _scan(checked)
    domain = choose_domain(scalars, constants)
    kernel = ShiftAlgebra(sorted(modes.items()), domain)
    algebra = MixedAlgebra(kernel, families)
    return algebra, [algebra.convert(expr) for expr in checked]


class MixedAlgebra:
    """Arithmetic on mixed elements ``{(m, word): kernel element}`` (see the module docstring).

    ``m`` is a squarefree int (the element carries :math:`\\sqrt m`), ``word``
    a tuple of internal atoms ``(family index, 2q)`` in the weight basis, and
    the kernel element (:class:`~amalgebra.algebra.shiftform.Element`) is the
    angular-momentum part standing to the left of the word.  Offers the
    arithmetic :mod:`amalgebra.algebra.extensions` asks for.

    Parameters
    ==========

    kernel : ShiftAlgebra
        Holds every label of the expressions, including the tensors' labels.
    families : list of SphericalTensor or VectorOperator
    """

    def __init__(self, kernel, families):
        self.kernel = kernel
        self.domain = kernel.domain
        self.families = [_Family(obj) for obj in families]
        self.family_index = {obj: i for i, obj in enumerate(families)}
        self._move_cache = {}
        self._word_cache = {}
        self._gens = {}

    # ------------------------------------------------------------- arithmetic
    def add(self, *elements):
        groups = {}
        for element in elements:
            for key, value in element.items():
                groups.setdefault(key, []).append(value)
        return self._finish(groups)

    def _finish(self, groups):
        out = {}
        for key, values in groups.items():
            value = values[0] if len(values) == 1 else self.kernel.add(*values)
            if value:
                out[key] = value
        return out

    def neg(self, a):
        return {key: self.kernel.neg(value) for key, value in a.items()}

    def sub(self, a, b):
        return self.add(a, self.neg(b))

    def scale(self, a, num, den=1):
        """Multiply by ``num/den`` (a domain element over a positive int)."""
        out = {}
        for key, value in a.items():
            value = self.kernel.scale(value, num, den)
            if value:
                out[key] = value
        return out

    def mul(self, a, b):
        """The product ``a*b``: words of ``a`` move right past the angular-momentum part of ``b``."""
        kernel = self.kernel
        groups = {}
        for (m1, w1), e1 in a.items():
            for (m2, w2), e2 in b.items():
                g = gcd(m1, m2)
                m = (m1 // g) * (m2 // g)
                for word, c in self.word_times(w1, e2).items():
                    product = kernel.mul(e1, c)
                    if g != 1:
                        product = kernel.scale(product, self.domain.convert(g))
                    groups.setdefault((m, word + w2), []).append(product)
        return self._finish(groups)

    def power(self, a, n):
        if n == 0:
            return {(1, ()): self.kernel.one()}
        result = a
        for _ in range(n - 1):
            result = self.mul(a, result)
        return result

    # ------------------------------------------- moving words past the kernel
    def word_times(self, word, element):
        """``word * element`` as ``{word': kernel element}`` (kernel part on the left)."""
        if not word:
            return {(): element} if element else {}
        if not element:
            return {}
        *head, last = word
        head = tuple(head)
        groups = {}
        for atom, c in self.atom_times(last, element).items():
            for w, c2 in self.word_times(head, c).items():
                groups.setdefault(w + (atom,), []).append(c2)
        return self._finish(groups)

    def _label_gens(self, label):
        hit = self._gens.get(label)
        if hit is None:
            k = self.kernel
            i = k.position[label]
            hit = self._gens[label] = (i, k.var_index[i], k.atom(label, "squared"), k.atom(label, "z"),
                                       k.atom(label, "plus"), k.atom(label, "minus"))
        return hit

    def atom_times(self, atom, element):
        """``atom * element`` as ``{atom': kernel element}``."""
        kernel = self.kernel
        family = self.families[atom[0]]
        i, (sv, zv), *_ = self._label_gens(family.label)
        if not any(key[i] or any(mon[sv] or mon[zv] for mon in poly) for key, poly in element.items()):
            return {atom: element}  # nothing of this label: the atom commutes
        ring = kernel.ring
        groups = {}
        for key, poly in element.items():
            d = key[i]
            for n, coeff, moved in self._ladder_terms(family, atom, d):
                shift = key[:i] + (d - n if d > 0 else d + n,) + key[i + 1:]
                ladder = Element({shift: ring.one})
                if coeff != 1:
                    ladder = kernel.scale(ladder, self.domain.convert(coeff))
                for mon, c in poly.items():
                    rest = Element({kernel.identity_shift: ring.dtype({mon[:sv] + (0, 0) + mon[zv + 1:]: c})},
                                   element.den)
                    for target, left in self.move(moved, mon[sv], mon[zv]).items():
                        groups.setdefault(target, []).append(kernel.mul(ladder, kernel.mul(left, rest)))
        return self._finish(groups)

    def _ladder_terms(self, family, atom, d):
        """``u R^d = sum_n C(|d|, n) R^(d -+ n) (-ad_R)^n(u)``: yields ``(n, coefficient, atom)``."""
        f, tq = atom
        sign = 1 if d > 0 else -1
        coeff_of = family.raise_coeff if d > 0 else family.lower_coeff
        value = 1
        for n in range(abs(d) + 1):
            if n:
                value *= -coeff_of(tq + 2 * sign * (n - 1))
                if not value:
                    return
            yield n, comb(abs(d), n) * value, (f, tq + 2 * sign * n)

    def move(self, atom, a, b):
        """``atom * (J^2)^a * Jz^b`` as ``{atom': kernel element}`` (memoised)."""
        key = (atom, a, b)
        hit = self._move_cache.get(key)
        if hit is not None:
            return hit
        kernel = self.kernel
        f, tq = atom
        family = self.families[f]
        _, _, sq, z, plus, minus = self._label_gens(family.label)
        if a == 0:
            shifted = kernel.sub(z, kernel.scalar(self.domain.convert(tq), 2))   # u Jz = (Jz - q) u
            hit = {atom: kernel.power(shifted, b)}
        else:
            tk = family.tk
            # u J^2 = (J^2 - 2q Jz + k(k+1)) u - c+ J- u_{q+1} - c- J+ u_{q-1}
            diagonal = kernel.add(sq, kernel.scale(z, self.domain.convert(-tq)),
                                  kernel.scalar(self.domain.convert(tk * (tk + 2)), 4))
            parts = [(diagonal, atom)]
            up, down = family.raise_coeff(tq), family.lower_coeff(tq)
            if up:
                parts.append((kernel.scale(minus, self.domain.convert(-up)), (f, tq + 2)))
            if down:
                parts.append((kernel.scale(plus, self.domain.convert(-down)), (f, tq - 2)))
            groups = {}
            for left, target in parts:
                for target2, c in self.move(target, a - 1, b).items():
                    groups.setdefault(target2, []).append(kernel.mul(left, c))
            hit = self._finish(groups)
        self._move_cache[key] = hit
        return hit

    # ------------------------------------------------------------ boundaries
    def convert(self, expr):
        """The mixed element of a validated SymPy expression."""
        return self._convert(expr, {})

    def _convert(self, node, memo):
        hit = memo.get(node)
        if hit is not None:
            return hit
        radical = _radical(node)
        rest = None
        if radical is None and node.is_Mul:
            rest, radical = _strip_radicals(node)
        if radical is not None:   # sqrt(p/q) goes into the sqrt(m) part, not into the domain
            num, den, m = _split_root(radical)
            inner = {(1, ()): self.kernel.one()} if rest is None else self._convert(rest, memo)
            result = self._times_root(inner, m, num, den)
        elif not node.has(TensorComponent, VectorComponent):
            value = to_kernel(self.kernel, node)
            result = {(1, ()): value} if value else {}
        elif node.is_Add:
            result = self.add(*[self._convert(arg, memo) for arg in node.args])
        elif node.is_Mul:
            commutative = [arg for arg in node.args if arg.is_commutative]
            factors = [arg for arg in node.args if not arg.is_commutative]
            result = self._convert(factors[-1], memo)
            for factor in reversed(factors[:-1]):
                result = self.mul(self._convert(factor, memo), result)
            if commutative:
                num, den = _scalar(self.domain, Mul(*commutative))
                result = self.scale(result, num, den)
        elif node.is_Pow:
            base, exp = node.args
            result = self.power(self._convert(base, memo), int(exp))
        else:
            result = self._atom(node)
        memo[node] = result
        return result

    def _times_root(self, element, m, num, den):
        """``element * (num/den) * sqrt(m)`` for a squarefree ``m``."""
        out = {}
        for (m1, word), value in element.items():
            g = gcd(m1, m)
            value = self.kernel.scale(value, self.domain.convert(num * g), den)
            if value:
                out[((m1 // g) * (m // g), word)] = value
        return out

    def _atom(self, node):
        kernel = self.kernel
        if isinstance(node, TensorComponent):
            f = self.family_index[node.tensor]
            tq = int(2 * node.q)
            num, den, m = _split_root(self.families[f].scale_exponents(tq))
            return {(m, ((f, tq),)): kernel.scalar(self.domain.convert(num), den)}
        f = self.family_index[node.vector]
        axis = node.axis
        if axis == "z":
            return {(1, ((f, 0),)): kernel.one()}
        half = kernel.scalar(self.domain.one, 2)
        if axis == "x":   # Vx = (V+ + V-)/2
            return {(1, ((f, 2),)): half, (1, ((f, -2),)): half}
        i_half = kernel.scalar(self.domain.from_sympy(I), 2)   # Vy = -i V+/2 + i V-/2
        return {(1, ((f, 2),)): kernel.neg(i_half), (1, ((f, -2),)): i_half}

    def _word_out(self, m, word):
        """``sqrt(m) * word`` in user components: a list of ``(SymPy coefficient, atoms)``."""
        key = (m, word)
        hit = self._word_cache.get(key)
        if hit is not None:
            return hit
        exponents = _prime_exponents(m, {})
        expansions = [(S.One, ())]
        for f, tq in word:
            family = self.families[f]
            if family.vector:
                obj = family.obj
                if tq == 0:
                    options = [(S.One, obj.z)]
                else:   # V+- = Vx +- i Vy
                    options = [(S.One, obj.x), (I if tq > 0 else -I, obj.y)]
            else:   # T~_q = T_q / s(q)
                for p, e in family.scale_exponents(tq).items():
                    exponents[p] = exponents.get(p, 0) - e
                options = [(S.One, family.user_atom(tq))]
            expansions = [(c * c2, atoms + (atom,)) for c, atoms in expansions for c2, atom in options]
        num, den, root = _split_root(exponents)
        factor = Rational(num, den) * (sqrt(Integer(root)) if root != 1 else S.One)
        hit = self._word_cache[key] = [(factor * c, atoms) for c, atoms in expansions]
        return hit

    def to_expr(self, a):
        """The SymPy expression ``sum coefficient * J-part * tensor word`` (one ``Add``)."""
        kernel = self.kernel
        groups = {}
        for key in sorted(a):
            element = a[key]
            expansions = self._word_out(*key)
            for shift, mon, coeff in kernel.sorted_items(element):
                value = kernel.coefficient(element, coeff)
                for factor, atoms in expansions:
                    groups.setdefault((shift, mon, atoms), []).append(value * factor)
        terms = []
        for (shift, mon, atoms), values in groups.items():
            # one term per operator monomial, coefficient in the one normal form of
            # amalgebra.algebra.coefficients (the same rule as the m-shift kernel's output)
            factors = kernel.term_factors(shift, mon) + atoms
            terms.extend(scalar_terms(Add(*values), factors))
        return Add(*terms)


class _TensorExtension:
    """The hook through which :func:`~amalgebra.algebra.canonical` reaches this module."""

    name = "tensors"

    def claims(self, atom):
        return isinstance(atom, (TensorComponent, VectorComponent))

    def kernel(self, *exprs):
        return mixed_kernel(*exprs)

    def __repr__(self):
        return "TENSOR_EXTENSION"


#: The registered extension (registered when :mod:`amalgebra.tensors` is imported).
TENSOR_EXTENSION = register_extension(_TensorExtension())
