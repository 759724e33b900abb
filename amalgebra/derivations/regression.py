r"""Comparing freshly derived results with the stored ones.

Explanation
===========

Each named result gets one :class:`Comparison` with a ``status``:

``"identical"``
    the stored text equals :func:`~amalgebra.parsing.to_text` of the new result;
``"reprinted"``
    equal but printed differently: the stored expression equals the new one
    structurally, or ``simplify``/``canonical`` proves their difference zero (typically
    after a SymPy upgrade changed the printing order);
``"changed"``
    the values differ; :attr:`Comparison.diff` shows both texts and the terms present
    on only one side;
``"unrecorded"``
    no stored value yet (no file, no section, or no entry): reported, never passed
    silently;
``"stale"``
    a stored value that the derivation no longer produces.

Symbols in the stored text are matched to the new result's symbols *by name*, so a
result built from ``Symbol("j", positive=True)`` compares equal to the stored ``j``.

Examples
========

>>> from sympy import symbols
>>> from amalgebra.derivations.regression import compare_value
>>> j = symbols("j")
>>> compare_value("d", "r", "j*(j + 1)", j*(j + 1)).status
'identical'
>>> compare_value("d", "r", "j^2 + j", j*(j + 1)).status
'reprinted'
>>> print(compare_value("d", "r", "j^2 + j", j**2 + 2*j).diff)
  stored: j^2 + j
  now:    j^2 + 2*j
  terms only in stored: j
  terms only now:       2*j
"""

from dataclasses import dataclass

__all__ = ["Comparison", "compare_value", "compare_record", "PASSING", "STATUSES"]

STATUSES = ("identical", "reprinted", "changed", "unrecorded", "stale")
#: Statuses that do not fail a check run.
PASSING = ("identical", "reprinted")


@dataclass(frozen=True)
class Comparison:
    """The verdict on one named result of one derivation."""

    derivation: str
    result: str
    status: str
    stored_text: str | None = None
    current_text: str | None = None
    line: int | None = None
    diff: str = ""

    @property
    def passed(self):
        return self.status in PASSING


def _rebind(stored_expr, current):
    from sympy import Symbol

    by_name = {s.name: s for s in current.atoms(Symbol)}
    return stored_expr.xreplace({s: by_name[s.name] for s in stored_expr.atoms(Symbol)
                                 if s.name in by_name})


def _provably_equal(a, b):
    from sympy import simplify

    diff = a - b
    if diff == 0:
        return True
    if getattr(diff, "is_commutative", True) is False:
        try:
            from amalgebra.algebra import canonical
        except ImportError:
            return False
        return canonical(diff) == 0
    return simplify(diff) == 0


def _term_diff(stored_expr, current, stored_text, current_text):
    from sympy import Add

    from ..parsing import to_text

    old = [to_text(t) for t in Add.make_args(stored_expr)]
    new = [to_text(t) for t in Add.make_args(current)]
    only_old = [t for t in old if t not in new]
    only_new = [t for t in new if t not in old]
    lines = [f"  stored: {stored_text}", f"  now:    {current_text}"]
    if len(old) > 1 or len(new) > 1:
        lines += [f"  terms only in stored: {', '.join(only_old) or '-'}",
                  f"  terms only now:       {', '.join(only_new) or '-'}"]
    return "\n".join(lines)


def compare_value(derivation, result, stored_text, current, *, stored_expr=None, line=None):
    """Compare one stored text with one new result; see the module docstring.

    ``stored_expr`` is the parsed stored text when the caller already has it.
    """
    from ..parsing import parse, to_text

    current_text = to_text(current)
    if stored_text == current_text:
        return Comparison(derivation, result, "identical", stored_text, current_text, line)
    old = _rebind(parse(stored_text) if stored_expr is None else stored_expr, current)
    if old == current or _provably_equal(old, current):
        return Comparison(derivation, result, "reprinted", stored_text, current_text, line,
                          f"  stored: {stored_text}\n  now:    {current_text}")
    return Comparison(derivation, result, "changed", stored_text, current_text, line,
                      _term_diff(old, current, stored_text, current_text))


def compare_record(record, stored):
    """Compare every result of a :class:`~amalgebra.derivations.record.DerivationRecord`.

    ``stored`` is ``{result: StoredEntry}`` for this derivation, or ``None`` when
    nothing is stored.  Results come first in the order the derivation produced them,
    then stale stored entries in file order.
    """
    from ..parsing import to_text

    stored = stored or {}
    out = []
    for name, expr in record.results.items():
        entry = stored.get(name)
        if entry is None:
            out.append(Comparison(record.name, name, "unrecorded", None, to_text(expr)))
        else:
            out.append(compare_value(record.name, name, entry.text, expr,
                                     stored_expr=entry.expr, line=entry.line))
    for name, entry in stored.items():
        if name not in record.results:
            out.append(Comparison(record.name, name, "stale", entry.text, None, entry.line))
    return out
