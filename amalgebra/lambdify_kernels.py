r"""Float kernels behind ``sympy.lambdify`` of the unevaluated symbols.

Explanation
===========

The unevaluated coupling symbols (Clebsch-Gordan, 3j, 6j, 9j) and the Wigner
D-matrix element :class:`~amalgebra.rotations.wigner.RotationElement` carry the code
printer hooks of :class:`amalgebra.notation.CodeHooks`.  ``sympy.lambdify``
(any of its printers: Python ``math``, ``mpmath``, ``numpy``, ``scipy``)
prints them as a call ``float_call(kernel, *args)`` and imports both names from
here and from :mod:`amalgebra.coupling.floats`, so the generated function runs
the library's own float kernels:

* coupling symbols: the correctly rounded ``cg_float``, ``threej_float``,
  ``sixj_float``, ``ninej_float`` of :mod:`amalgebra.coupling.floats`;
* D-matrix elements: :func:`wigner_D_float`, Wigner's sum with exact integer
  coefficients (the kernel of :mod:`amalgebra.rotations.wigner`) evaluated in floats.

Quantum numbers reach the kernels as floats (``1/2`` prints as ``1/2``, which
Python evaluates to ``0.5``; mpmath gives an ``mpf``).  :func:`exact_quantum_number`
turns such a value back into the exact half-integer it stands for; a value that
is not within ``1e-9`` (relative) of a multiple of ``1/2`` raises
:class:`~amalgebra.errors.QuantumNumberError`.  Arrays (numpy) are evaluated
element by element with broadcasting.

Conventions are those of the exact functions: Condon-Shortley phases for the
coupling coefficients; active z-y-z rotations,
``D^j_{m'm}(alpha, beta, gamma) = exp(-i m' alpha) d^j_{m'm}(beta) exp(-i m gamma)``.

Reduced matrix elements have no value of their own (a number yet unknown); they
enter a lambdified function as arguments, ``lambdify([R], expr)``.

Examples
========

>>> from sympy import lambdify, symbols, Rational
>>> from amalgebra.coupling.symbols import CouplingBracket
>>> j = symbols("j")
>>> f = lambdify(j, CouplingBracket(j, j, Rational(1, 2), Rational(1, 2), j + Rational(1, 2),
...                                     j + Rational(1, 2)))
>>> f(1), f(2.5)                    # stretched states: <j j; 1/2 1/2|j+1/2 j+1/2> = 1
(1.0, 1.0)
>>> float_call(wigner_D_float, 1, 0, 0, 0.0, 0.0, 0.0)    # D(identity) = 1
(1+0j)
"""

from fractions import Fraction
import cmath
import math
import sys

from .errors import QuantumNumberError

__all__ = ["float_call", "exact_quantum_number", "wigner_D_float"]

_TOLERANCE = 1e-9


def exact_quantum_number(value, name="value"):
    """The exact integer or half-integer (a ``Fraction``) that a float-like ``value`` stands for.

    Examples
    ========

    >>> exact_quantum_number(1.5), exact_quantum_number(2)
    (Fraction(3, 2), Fraction(2, 1))
    >>> exact_quantum_number(0.3)
    Traceback (most recent call last):
    ...
    amalgebra.errors.QuantumNumberError: value=0.3 must be an integer or a half-integer
    """
    if isinstance(value, bool):
        raise QuantumNumberError(f"{name}={value!r} must be a number, not a bool")
    if isinstance(value, (int, Fraction)):
        doubled = 2 * Fraction(value)
        if doubled.denominator == 1:
            return doubled / 2
    else:
        try:
            twice = 2 * float(value)
        except (TypeError, ValueError):
            raise QuantumNumberError(f"{name}={value!r} must be a real number") from None
        nearest = round(twice) if math.isfinite(twice) else None
        if nearest is not None and abs(twice - nearest) <= _TOLERANCE * max(1.0, abs(twice)):
            return Fraction(int(nearest), 2)
    raise QuantumNumberError(f"{name}={value!r} must be an integer or a half-integer")


def wigner_D_float(j, mp, m, alpha, beta, gamma):
    """``D^j_{m'm}(alpha, beta, gamma)`` as a complex float (active z-y-z, Condon-Shortley).

    The quantum numbers are exact (ints, Fractions, or strings such as ``"3/2"``);
    the angles are floats.  Wigner's sum has exact rational coefficients
    (``amalgebra.rotations.wigner``); only the powers of ``cos(beta/2)``, ``sin(beta/2)``
    and the phases are floats.

    Examples
    ========

    >>> import math
    >>> wigner_D_float(1, 1, 1, 0.0, math.pi / 2, 0.0)     # d^1_11 = (1 + cos beta)/2
    (0.5000000000000001+0j)
    """
    from .rotations.wigner import _d_kernel, _element_args

    tj, tmp, tm = _element_args(j, mp, m)
    inside, terms = _d_kernel(tj, tmp, tm)
    c, s = math.cos(beta / 2), math.sin(beta / 2)
    total = math.fsum(num / den * c ** a * s ** (tj - a) for a, num, den in terms)
    phase = cmath.exp(-0.5j * (tmp * alpha + tm * gamma))
    return math.sqrt(inside) * total * phase


def _exact_arguments(kernel, args):
    """Quantum-number positions are made exact; the angles of ``wigner_D_float`` stay floats."""
    count = 3 if kernel is wigner_D_float else len(args)
    exact = [exact_quantum_number(value, f"argument {i + 1}") for i, value in enumerate(args[:count])]
    return exact + [float(value) for value in args[count:]]


def _scalar_call(kernel, *args):
    return kernel(*_exact_arguments(kernel, args))


def float_call(kernel, *args):
    """Call a float ``kernel`` on arguments from generated code (numbers, mpf or numpy arrays).

    Examples
    ========

    >>> from amalgebra.coupling.floats import sixj_float
    >>> float_call(sixj_float, 1.0, 1.0, 1.0, 1.0, 1.0, 1.0) == 1 / 6    # 6j{1 1 1; 1 1 1} = 1/6
    True
    """
    numpy = sys.modules.get("numpy")
    if numpy is not None and any(isinstance(a, numpy.ndarray) for a in args):
        return numpy.vectorize(lambda *values: _scalar_call(kernel, *values))(*args)
    return _scalar_call(kernel, *args)
