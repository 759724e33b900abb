r"""A side of a derivation step as the author writes it, and the value the engine compares.

Explanation
===========

A step should be typeset as its author writes it, ``{1 1 1; 1 1 1} = 1/6``, not as
``1/6 = 1/6`` after the code has evaluated the left side.  Three ways to hand such a
side to :meth:`~amalgebra.derivations.record.Steps.step`:

* an unevaluated SymPy object: the coupling symbols of
  :mod:`amalgebra.coupling.symbols` (``Coupling6j(...)`` rather than ``sixj(...)``),
  ``factorial(n, evaluate=False)``, a ``Sum``/``Product`` with numeric limits, a matrix
  expression (``MatMul(B, B.T)``, ``Trace(M)``), a Wigner D element
  ``RotationElement(j, m', m, alpha, beta, gamma)`` of numeric ``j, m', m``; a noncommutative product
  ``bra * operator * ket`` of basis states is a matrix element;
* anything else (a count, an inner product of named states): :func:`written`, a
  LaTeX text together with the value it stands for.

:func:`side_value` is what the engine compares: the value of a :class:`Written`, the
``doit()`` of the unevaluated objects above when the side has no free symbol (with free
symbols they stay as they are: a Racah sum over symbolic momenta is checked by its
sampler, never summed; a D element of numeric quantum numbers becomes its closed form
in the angles), ``<bra| op |ket>`` through :func:`amalgebra.states.apply` and
:func:`amalgebra.states.inner`.  The report prints the side as given, and the verdict
of a step whose sides were evaluated says so (``exact (normal form; written sides
evaluated)``).

Examples
========

>>> from sympy import Rational, latex
>>> from amalgebra.coupling.symbols import Coupling6j
>>> from amalgebra.derivations.written import side_value, written
>>> s = Coupling6j(1, 1, 1, 1, 1, 1)
>>> latex(s), side_value(s)
('\\begin{Bmatrix} 1 & 1 & 1 \\\\ 1 & 1 & 1 \\end{Bmatrix}', 1/6)
>>> n = written(r"\dim V_{S=0}", 2)
>>> latex(n), side_value(n)
('\\dim V_{S=0}', 2)
"""

__all__ = ["Written", "written", "commutator_side", "side_value"]


class Written:
    """A step side printed as the LaTeX ``tex`` and compared as ``value``.

    Not a SymPy object: it stands only as a whole side of a step (arithmetic with it
    is refused).  ``str`` gives the value's text after the LaTeX, for error messages.
    """

    __slots__ = ("tex", "value")

    def __init__(self, tex, value):
        if not isinstance(tex, str) or not tex.strip() or "\n" in tex:
            raise ValueError(f"tex={tex!r} must be a nonempty one-line str")
        self.tex = tex
        self.value = value

    def _latex(self, printer=None):
        return self.tex

    def __str__(self):
        return f"{self.tex} (= {self.value})"

    def __repr__(self):
        return f"written({self.tex!r}, {self.value!r})"

    def __eq__(self, other):
        return isinstance(other, Written) and (self.tex, self.value) == (other.tex, other.value)

    def __hash__(self):
        return hash((Written, self.tex))


def written(tex, value):
    r"""The side ``value`` of a step, typeset as the LaTeX ``tex``.

    >>> from sympy import latex
    >>> from amalgebra.derivations.written import written
    >>> w = written(r"\langle\psi|\psi\rangle", 1)
    >>> latex(w), w.value
    ('\\langle\\psi|\\psi\\rangle', 1)
    """
    return Written(tex, value)


def commutator_side(a, b):
    r"""The commutator ``[a, b]`` as written, standing for ``a*b - b*a`` (the engine's
    canonical form then decides the step).

    >>> from sympy import latex
    >>> from amalgebra.algebra import AngularMomentum
    >>> from amalgebra.derivations.written import commutator_side
    >>> J = AngularMomentum("J")
    >>> c = commutator_side(J.plus, J.minus)
    >>> latex(c), c.value
    ('\\left[J_{+}, J_{-}\\right]', -J.minus*J.plus + J.plus*J.minus)
    """
    from sympy import latex

    return Written(rf"\left[{latex(a)}, {latex(b)}\right]", a*b - b*a)


def _evaluable_types():
    from sympy import Product, Sum, factorial, factorial2
    from amalgebra.coupling.symbols import _CouplingSymbol

    return (_CouplingSymbol, Sum, Product, factorial, factorial2)


def _state_types():
    from amalgebra.bosons.fock import FockBra, FockKet
    from amalgebra.states.coupled import CoupledBra, CoupledKet
    from amalgebra.states.kets import Bra, Ket, ProductBra, ProductKet
    from amalgebra.states.tree_kets import TreeBra, TreeKet

    return (Bra, ProductBra, CoupledBra, TreeBra, FockBra), (Ket, ProductKet, CoupledKet, TreeKet, FockKet)


def _sandwich_value(expr):
    """``<b| X |k>`` of a noncommutative product ``b * X * k`` of basis states, else ``None``."""
    from sympy import Mul

    if not isinstance(expr, Mul) or expr.is_commutative is not False:
        return None
    bras, kets = _state_types()
    scalars = [a for a in expr.args if a.is_commutative]
    word = [a for a in expr.args if not a.is_commutative]
    if len(word) < 2 or not isinstance(word[0], bras) or not isinstance(word[-1], kets):
        return None
    if any(isinstance(a, bras + kets) for a in word[1:-1]):
        return None
    from amalgebra.states import apply, inner

    state = word[-1]
    if len(word) > 2:
        state = apply(Mul(*word[1:-1]), state)
    return Mul(*scalars) * inner(word[0], state)


def side_value(side):
    """The value the engine compares for a step side written as ``side`` (see the module)."""
    from sympy import Add, Basic, MatrixBase
    from sympy.matrices.expressions import MatrixExpr

    if isinstance(side, Written):
        return side_value(side.value)
    if isinstance(side, MatrixExpr):  # B B^T, c * Identity(n), Trace(M): explicit when sized
        value = side.doit()
        if isinstance(value, MatrixExpr) and all(getattr(k, "is_Integer", False) for k in value.shape):
            value = value.as_explicit()
        return value
    if isinstance(getattr(side, "matrix", None), MatrixBase) and hasattr(side, "basis"):
        return side.matrix  # an OperatorMatrix: compared by its matrix, printed with its basis
    if not isinstance(side, Basic) or isinstance(side, MatrixBase):
        return side
    if side.is_commutative is False:
        terms = Add.make_args(side)
        values = [_sandwich_value(t) for t in terms]
        if all(v is not None for v in values):
            return Add(*values)
        return side
    if not side.free_symbols and side.has(*_evaluable_types()):
        return side.doit()
    from amalgebra.rotations.wigner import RotationElement

    def numeric_element(e):
        return isinstance(e, RotationElement) and all(a.is_number for a in e.args[:3])

    if side.has(RotationElement):  # D^j_{m'm} of numeric j, m', m: its closed form in the angles
        value = side.replace(numeric_element, lambda e: e.doit())
        return side if value == side else value
    return side
