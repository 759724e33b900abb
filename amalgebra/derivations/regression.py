r"""Comparing freshly derived results with the stored ones, each decision within a budget.

Explanation
===========

Each named result gets one :class:`Comparison` with a ``status``:

``"identical"``
    the stored text equals the text the new result is stored as;
``"reprinted"``
    equal but printed differently (typically after a SymPy upgrade changed the
    printing order); :attr:`Comparison.method` says how equality was decided:
    ``"structure"`` or ``"normal form"`` (exact), or ``"numeric"`` (a seeded numeric
    test: evidence, not proof; a failure under ``--exact``);
``"changed"``
    the values differ; :attr:`Comparison.diff` shows both texts and the terms present
    on only one side (or the first differing entry of a tuple, matrix or dict);
``"undecided"``
    equality could not be decided within the :class:`~amalgebra.derivations.budget.Budget`
    (a failure, with the reason: a stored value far too large, or out of time);
``"unreadable"``
    the stored entry (or its whole file) cannot be read; the message names file, line
    and column (a failure);
``"unrecorded"``
    no stored value yet (no file, no section, or no entry): reported, never passed
    silently;
``"stale"``
    a stored value that the derivation no longer produces.

Every decision runs under :func:`~amalgebra.derivations.budget.decide_equal`: exact
normal forms first, then the seeded numeric test, never an unbounded ``simplify``.
Symbols in the stored text are matched to the new result's symbols *by name*, so a
result built from ``Symbol("j", positive=True)`` compares equal to the stored ``j``.

Examples
========

>>> from sympy import symbols
>>> from amalgebra.derivations.regression import compare_value
>>> j = symbols("j")
>>> compare_value("d", "r", "j*(j + 1)", j*(j + 1)).status
'identical'
>>> c = compare_value("d", "r", "j^2 + j", j*(j + 1))
>>> c.status, c.method
('reprinted', 'normal form')
>>> print(compare_value("d", "r", "j^2 + j", j**2 + 2*j).diff)
  stored: j^2 + j
  now:    j^2 + 2*j
  terms only in stored: j
  terms only now:       2*j
  decided by normal form: expand(a - b) is a nonzero polynomial
"""

from dataclasses import dataclass

__all__ = ["Comparison", "compare_value", "compare_entry", "compare_record", "PASSING",
           "STATUSES", "FAILING"]

STATUSES = ("identical", "reprinted", "changed", "unrecorded", "stale", "undecided",
            "unreadable")
#: Statuses that do not fail a check run.
PASSING = ("identical", "reprinted")
#: Statuses that fail a check run ("unrecorded" only asks for a record).
FAILING = ("changed", "undecided", "unreadable", "stale")


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
    method: str = ""

    @property
    def passed(self):
        return self.status in PASSING

    @property
    def exact(self):
        """True unless equality was only established by the numeric test."""
        return self.method != "numeric"


def _rebind(stored_expr, current):
    from sympy import Basic, Symbol

    if not isinstance(current, Basic) or not isinstance(stored_expr, Basic):
        return stored_expr
    by_name = {s.name: s for s in current.atoms(Symbol)}
    return stored_expr.xreplace({s: by_name[s.name] for s in stored_expr.atoms(Symbol)
                                 if s.name in by_name})


def _term_diff(stored_expr, current, stored_text, current_text):
    from sympy import Add, Basic

    from ..errors import ParseError
    from ..parsing import to_text

    lines = [f"  stored: {stored_text}", f"  now:    {current_text}"]
    if not (isinstance(stored_expr, Basic) and isinstance(current, Basic)):
        return "\n".join(lines)
    try:
        old = [to_text(t, decimals=True) for t in Add.make_args(stored_expr)]
        new = [to_text(t, decimals=True) for t in Add.make_args(current)]
    except ParseError:
        return "\n".join(lines)
    only_old = [t for t in old if t not in new]
    only_new = [t for t in new if t not in old]
    if len(old) > 1 or len(new) > 1:
        lines += [f"  terms only in stored: {', '.join(only_old) or '-'}",
                  f"  terms only now:       {', '.join(only_new) or '-'}"]
    return "\n".join(lines)


class _Mismatch(Exception):
    """The stored and the new value differ in shape (kind, length, keys)."""


def _pairs(node, current, where, out):
    """Walk a stored node and the new value together; collect (where, leaf node, value)."""
    from sympy import Basic, Dict, MatrixBase, Tuple

    from .store import encode_value, node_text

    kind = node[0]
    if kind == "expr":
        if isinstance(current, (MatrixBase, tuple, list, dict, Tuple, Dict)) \
                or not isinstance(current, (Basic, int)):
            raise _Mismatch(f"{where or 'the value'}: stored an expression, now "
                            f"{node_text(encode_value(current))}")
        out.append((where, node, current))
        return
    if kind == "tuple":
        if not isinstance(current, (tuple, list, Tuple)) or len(current) != len(node[1]):
            raise _Mismatch(f"{where or 'the value'}: stored a tuple of {len(node[1])}, now "
                            f"{_describe(current)}")
        for i, (child, value) in enumerate(zip(node[1], current, strict=True)):
            _pairs(child, value, f"{where}[{i}]", out)
        return
    if kind == "basis_matrix":
        n = len(node[1])
        basis = getattr(current, "basis", None)
        matrix = getattr(current, "matrix", None)
        if basis is None or not isinstance(matrix, MatrixBase) or len(basis) != n \
                or matrix.shape != (n, n):
            raise _Mismatch(f"{where or 'the value'}: stored a {n}x{n} matrix with its basis, "
                            f"now {_describe(current)}")
        for i, child in enumerate(node[1]):
            out.append((f"{where}.basis[{i}]", child, basis[i]))
        for r, row in enumerate(node[2]):
            for c, child in enumerate(row):
                out.append((f"{where}[{r}, {c}]", child, matrix[r, c]))
        return
    if kind == "matrix":
        shape = (len(node[1]), len(node[1][0]) if node[1] else 0)
        if not isinstance(current, MatrixBase) or current.shape != shape:
            raise _Mismatch(f"{where or 'the value'}: stored a {shape[0]}x{shape[1]} matrix, "
                            f"now {_describe(current)}")
        for r, row in enumerate(node[1]):
            for c, child in enumerate(row):
                out.append((f"{where}[{r}, {c}]", child, current[r, c]))
        return
    if not isinstance(current, (dict, Dict)) or len(current) != len(node[1]):
        raise _Mismatch(f"{where or 'the value'}: stored a dict of {len(node[1])}, now "
                        f"{_describe(current)}")
    if kind == "table":
        for name, child in node[1]:
            if name not in current:
                raise _Mismatch(f"{where or 'the value'}: key {name} is stored but not "
                                "produced now")
            _pairs(child, current[name], f"{where}[{name}]", out)
        return
    by_text = {}
    for key in current:
        try:
            by_text[node_text(encode_value(key))] = key
        except Exception:  # noqa: BLE001 - an unstorable key simply matches nothing
            continue
    for key_node, child in node[1]:
        text = node_text(key_node)
        if text not in by_text:
            raise _Mismatch(f"{where or 'the value'}: key {text} is stored but not produced "
                            "now (keys are matched by their text)")
        _pairs(child, current[by_text[text]], f"{where}[{text}]", out)


def _describe(value):
    from sympy import MatrixBase

    if isinstance(value, MatrixBase):
        return f"a {value.shape[0]}x{value.shape[1]} matrix"
    if isinstance(getattr(value, "matrix", None), MatrixBase) and hasattr(value, "basis"):
        return f"a {value.matrix.shape[0]}x{value.matrix.shape[1]} matrix with its basis"
    if isinstance(value, (tuple, list)):
        return f"a tuple of {len(value)}"
    if isinstance(value, dict):
        return f"a dict of {len(value)}"
    return "an expression"


def _decide_leaves(derivation, result, pairs, source, budget, known=None):
    """Decide every changed leaf under one shared clock; return (verdict, method, detail)."""
    from ..errors import StoredResultError
    from ..parsing import to_text
    from .._deadline import Deadline, DeadlineExpired, armed
    from .budget import DEFAULT_BUDGET, Decision, decide_equal
    from .store import decode_node

    budget = DEFAULT_BUDGET if budget is None else budget
    clock = Deadline(budget.seconds)
    decisions = []
    try:
        with armed(clock):
            for where, node, current in pairs:
                if node[1] == to_text(current, decimals=True):
                    continue
                try:
                    parsed = (known or {}).get(id(node))
                    stored = _rebind(decode_node(node, source) if parsed is None else parsed,
                                     current)
                except StoredResultError as exc:
                    return "unreadable", "", str(exc)
                decision = decide_equal(stored, current, budget=budget,
                                        seed=f"{derivation}.{result}{where}", clock=clock)
                if decision.equal is not True:
                    return ("changed" if decision.equal is False else "undecided",
                            decision.method, f"{where}: {decision.detail}" if where
                            else decision.detail)
                decisions.append(decision)
    except DeadlineExpired as exc:
        if exc.deadline is not clock:       # an enclosing deadline: its owner handles it
            raise
        return "undecided", "budget", f"not decided within the time budget of {budget.seconds:g} s"
    except RecursionError:
        return "undecided", "budget", "not decided: expression nested too deeply"
    if not decisions:
        return "identical", "text", ""
    worst = next((d for d in decisions if not d.exact), decisions[0])
    if all(d.method == "structure" for d in decisions):
        worst = Decision(True, "structure", "the same expression after parsing")
    return "reprinted", worst.method, worst.detail


def compare_entry(derivation, result, entry, current, *, budget=None):
    """Compare one :class:`~amalgebra.derivations.store.StoredEntry` with a new result.

    The stored and new values are walked together (tuples, matrices and dicts entry
    by entry); each leaf whose text differs is decided by
    :func:`~amalgebra.derivations.budget.decide_equal`, all leaves of one result sharing
    ``budget.seconds``.
    """
    from ..errors import StoredResultError
    from .store import encode_value, node_text

    try:
        current_text = node_text(encode_value(current))
    except StoredResultError as exc:
        return Comparison(derivation, result, "changed", entry.text, None, entry.line,
                          f"  the new value cannot be stored: {exc}")
    if entry.error is not None:
        return Comparison(derivation, result, "unreadable", None, current_text, entry.line,
                          f"  {entry.error}")
    if entry.text == current_text:
        return Comparison(derivation, result, "identical", entry.text, current_text,
                          entry.line, method="text")
    pairs = []
    try:
        _pairs(entry.node, current, "", pairs)
    except _Mismatch as exc:
        return Comparison(derivation, result, "changed", entry.text, current_text, entry.line,
                          f"  stored: {entry.text}\n  now:    {current_text}\n  {exc}",
                          "structure")
    known = {id(entry.node): entry._value} if entry._value is not None else None
    status, method, detail = _decide_leaves(derivation, result, pairs, entry._source, budget,
                                            known)
    both = f"  stored: {entry.text}\n  now:    {current_text}"
    if status == "unreadable":
        return Comparison(derivation, result, status, None, current_text, entry.line,
                          f"  {detail}")
    if status == "identical":
        return Comparison(derivation, result, status, entry.text, current_text, entry.line,
                          method="text")
    if status == "reprinted":
        return Comparison(derivation, result, status, entry.text, current_text, entry.line,
                          f"{both}\n  decided by {method}: {detail}", method)
    if status == "changed" and entry.node[0] == "expr":
        try:
            stored_expr = _rebind(entry.value, current)
        except StoredResultError:
            stored_expr = None
        text = _term_diff(stored_expr, current, entry.text, current_text)
        return Comparison(derivation, result, status, entry.text, current_text, entry.line,
                          f"{text}\n  decided by {method}: {detail}", method)
    return Comparison(derivation, result, status, entry.text, current_text, entry.line,
                      f"{both}\n  {'decided by ' + method if status == 'changed' else 'undecided'}"
                      f": {detail}", method)


def compare_value(derivation, result, stored_text, current, *, stored_expr=None, line=None,
                  budget=None):
    """Compare one stored expression text with one new result; see the module docstring.

    ``stored_expr`` is the parsed stored text when the caller already has it.
    """
    from .store import StoredEntry

    entry = StoredEntry(stored_text, stored_expr, line)
    return compare_entry(derivation, result, entry, current, budget=budget)


def compare_record(record, stored, *, budget=None):
    """Compare every result of a :class:`~amalgebra.derivations.record.DerivationRecord`.

    ``stored`` is ``{result: StoredEntry}`` for this derivation, or ``None`` when
    nothing is stored.  Results come first in the order the derivation produced them,
    then stale stored entries in file order.
    """
    from ..errors import StoredResultError
    from .store import encode_value, node_text

    stored = stored or {}
    out = []
    for name, value in record.results.items():
        entry = stored.get(name)
        if entry is None:
            try:
                text = node_text(encode_value(value))
            except StoredResultError:
                text = None
            out.append(Comparison(record.name, name, "unrecorded", None, text))
        else:
            out.append(compare_entry(record.name, name, entry, value, budget=budget))
    for name, entry in stored.items():
        if name not in record.results:
            out.append(Comparison(record.name, name, "stale", entry.text, None, entry.line))
    return out
