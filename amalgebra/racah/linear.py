r"""Exact linear forms in SymPy symbols: the exponents of phases and the projections of lines.

Explanation
===========

A phase :math:`(-1)^{E}` of a Racah sum has an exponent :math:`E` that is linear
in the angular momenta and projections (:math:`j_1 + j_2 - m_3`, ...).  The
reducer rewrites such exponents many times (a sign flip of a 3j symbol adds
:math:`j_1+j_2+j_3`, the rule :math:`(-1)^{2m} = (-1)^{2j}` trades a projection
for its momentum), so they are kept as plain dictionaries
``{atom: Fraction}`` with the constant under the key ``1``: adding two forms is
a dictionary merge, no SymPy arithmetic.  The same forms hold the projection
written in a slot of a 3j symbol (``{m1: 1}``, ``{m1: -1, M: 1}``).

Equality of exponents is exact equality of the forms; nothing is reduced
modulo 2 here (that needs facts about the symbols, applied by the rules that
know them).

Examples
========

>>> from sympy import symbols
>>> from amalgebra.racah.linear import linear_form, form_expr, add_forms
>>> j, m = symbols("j m")
>>> f = linear_form(j - m + 1)
>>> form_expr(add_forms(f, linear_form(2*m)))
j + m + 1
"""

from fractions import Fraction

from sympy import Add, Integer, Rational, S, Symbol, expand

__all__ = ["NotLinearError", "linear_form", "form_expr", "add_forms", "scale_form",
           "substitute_form", "form_symbols", "is_single", "negate_form"]

ONE = S.One


class NotLinearError(ValueError):
    """Internal: an expression is not linear in its symbols (caught by the callers)."""


def _fraction(value):
    if isinstance(value, Rational):
        return Fraction(int(value.p), int(value.q))
    raise NotLinearError(f"coefficient {value} is not rational")


def linear_form(expr):
    """The linear form ``{atom: Fraction}`` of ``expr`` (constant under ``1``).

    Atoms are the symbols (any non-numeric factor that is not a sum or product
    of others is refused: :class:`NotLinearError`).
    """
    if isinstance(expr, int):
        return {ONE: Fraction(expr)} if expr else {}
    if isinstance(expr, Symbol):
        return {expr: Fraction(1)}
    out = {}
    for term, coeff in expand(expr).as_coefficients_dict().items():
        if term is ONE or term == 1:
            key = ONE
        elif isinstance(term, Symbol):
            key = term
        else:
            raise NotLinearError(f"{expr} is not linear in its symbols (term {term})")
        value = _fraction(coeff)
        if value:
            out[key] = out.get(key, 0) + value
    return {k: v for k, v in out.items() if v}


def _sym(value):
    return Integer(value.numerator) if value.denominator == 1 else Rational(value.numerator,
                                                                             value.denominator)


def form_expr(form):
    """The SymPy expression of a linear form (terms in a deterministic order)."""
    from sympy import default_sort_key

    keys = sorted((k for k in form if k is not ONE), key=default_sort_key)
    terms = [_sym(form[k]) * k for k in keys]
    if ONE in form:
        terms.append(_sym(form[ONE]))
    return Add(*terms) if terms else S.Zero


def add_forms(*forms):
    """The sum of linear forms."""
    out = {}
    for form in forms:
        for k, v in form.items():
            out[k] = out.get(k, 0) + v
    return {k: v for k, v in out.items() if v}


def scale_form(form, factor):
    """``factor`` times a linear form (``factor`` an int or Fraction)."""
    if not factor:
        return {}
    return {k: v * factor for k, v in form.items()}


def negate_form(form):
    return {k: -v for k, v in form.items()}


def substitute_form(form, symbol, replacement):
    """Replace ``symbol`` by the linear form ``replacement`` in ``form``."""
    if symbol not in form:
        return form
    coeff = form[symbol]
    rest = {k: v for k, v in form.items() if k != symbol}
    return add_forms(rest, scale_form(replacement, coeff))


def form_symbols(form):
    """The symbols of a form (the constant key left out)."""
    return [k for k in form if k is not ONE]


def is_single(form):
    """``(symbol, sign)`` when ``form`` is ``+symbol`` or ``-symbol``, else ``None``."""
    if len(form) == 1:
        (k, v), = form.items()
        if k is not ONE and abs(v) == 1:
            return k, int(v)
    return None
