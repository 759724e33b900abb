r"""The ``.npz`` table format and :class:`CouplingTable`: O(1) lookup of any symbol by its canonical key.

Explanation
===========

A table file is a numpy ``.npz`` archive read with ``allow_pickle=False`` (loading runs no
code) holding:

``format``, ``version``
    the text ``"amalgebra-coupling-table"`` and the int ``1``;
``kind``, ``jmax2``
    ``"threej"``, ``"sixj"`` or ``"ninej"``; twice the jmax;
``keys``
    the canonical keys, one ``int64`` row per symmetry class, sorted
    (:mod:`amalgebra.tables.enumeration`);
``numerator``, ``denominator``, ``radicand``
    the exact value :math:`n/d\,\sqrt{s}` of each class's canonical symbol
    (``s`` squarefree, the sign in ``n``), as hexadecimal text (exact at any
    size; decimal text of Python ints is capped at 4300 digits);
``value``
    the correctly rounded double of each value (``nan`` when floats were not asked for);
``convention``
    the phase convention, as text.

A symbol is found by reducing it to its canonical key and phase with
:mod:`amalgebra.coupling.symmetry`, the same reduction the library's caches use, so a table
value and the library's value can never disagree in convention.

Examples
========

>>> import os, tempfile
>>> from amalgebra.tables import load_table, tabulate
>>> path = os.path.join(tempfile.mkdtemp(), "sixj.npz")
>>> table = tabulate("sixj", 1, path, workers=1, progress=None)
>>> len(table), table.exact(1, 1, 1, 1, 1, 1), table.float(1, 1, 1, 1, 1, 1)
(11, 1/6, 0.16666666666666666)
>>> load_table(path).exact("1/2", "1/2", 1, "1/2", "1/2", 0)
1/2
"""

import numpy as np
from sympy import Integer, Rational, sqrt
from sympy.printing.defaults import Printable

from .. import notation

from ..coupling.symmetry import ninej_key, sixj_key, threej_key
from ..errors import StoredResultError
from ..qnumbers import doubled, doubled_projection

__all__ = ["CouplingTable", "load_table", "write_table", "FORMAT", "VERSION"]

FORMAT = "amalgebra-coupling-table"
VERSION = 1
CONVENTION = ("Condon-Shortley phases; 3j (j1 j2 j3; m1 m2 m3) = (-1)^(j1-j2-m3)/sqrt(2j3+1) <j1 m1 j2 m2|j3 -m3>; "
              "6j and 9j as in Edmonds (1957)")
_FIELDS = ("format", "version", "kind", "jmax2", "keys", "numerator", "denominator", "radicand", "value",
           "convention")


def _hex(values):
    return np.array([format(v, "x") if v >= 0 else "-" + format(-v, "x") for v in values], dtype=np.str_)


def _from_hex(text):
    return int(text, 16)


def write_table(path, kind, jmax2, keys, triples, floats):
    """Write a table file (atomically: a temporary file in the same folder, then a rename)."""
    import os
    import tempfile

    folder = os.path.dirname(os.path.abspath(path)) or "."
    handle, tmp = tempfile.mkstemp(prefix=".amalgebra-table-", suffix=".npz", dir=folder)
    try:
        with os.fdopen(handle, "wb") as stream:
            np.savez_compressed(
                stream, format=np.array(FORMAT), version=np.array(VERSION), kind=np.array(kind),
                jmax2=np.array(jmax2), keys=np.asarray(keys, dtype=np.int64),
                numerator=_hex([t[0] for t in triples]), denominator=_hex([t[1] for t in triples]),
                radicand=_hex([t[2] for t in triples]), value=np.asarray(floats, dtype=np.float64),
                convention=np.array(CONVENTION))
        os.replace(tmp, path)
    except BaseException:
        if os.path.exists(tmp):
            os.unlink(tmp)
        raise


def load_table(path):
    """Read a table file written by :func:`~amalgebra.tables.tabulate` (no code runs).

    A file that is not such a table raises :class:`~amalgebra.errors.StoredResultError`.

    Examples
    ========

    >>> import os, tempfile
    >>> from amalgebra.coupling import threej
    >>> from amalgebra.tables import tabulate
    >>> path = os.path.join(tempfile.mkdtemp(), "threej.npz")
    >>> written = tabulate("threej", 1, path, workers=1, progress=None)
    >>> table = load_table(path)
    >>> table
    CouplingTable(threej, jmax=1, 7 classes)

    The stored value is the library's value:

    >>> table.exact(1, 1, 1, 1, 0, -1) == threej(1, 1, 1, 1, 0, -1) == written.exact(1, 1, 1, 1, 0, -1)
    True
    """
    missing = []
    try:
        with np.load(path, allow_pickle=False) as data:
            missing = [f for f in _FIELDS if f not in data.files]
            arrays = {} if missing else {f: data[f] for f in _FIELDS}
    except (OSError, ValueError) as exc:
        raise StoredResultError(f"{path}: cannot be read as a coupling table ({type(exc).__name__})") from None
    if missing:
        raise StoredResultError(f"{path}: not an amalgebra coupling table (missing {missing})")
    if str(arrays["format"]) != FORMAT or int(arrays["version"]) != VERSION:
        raise StoredResultError(f"{path}: format {str(arrays['format'])!r} version {int(arrays['version'])} "
                                f"must be {FORMAT!r} version {VERSION}")
    return CouplingTable(str(arrays["kind"]), int(arrays["jmax2"]), arrays["keys"], arrays["numerator"],
                         arrays["denominator"], arrays["radicand"], arrays["value"])


class CouplingTable(Printable):
    """A table of one family of coupling symbols, one entry per symmetry class (see the module docstring).

    :meth:`exact` and :meth:`float` take the arguments of :func:`~amalgebra.coupling.threej`,
    :func:`~amalgebra.coupling.sixj` or :func:`~amalgebra.coupling.ninej` (row by row); a symbol
    outside the table raises :class:`KeyError`; one that breaks a selection rule is 0.

    Examples
    ========

    >>> import os, tempfile
    >>> from sympy import sqrt
    >>> from amalgebra.tables import tabulate
    >>> table = tabulate("threej", 1, os.path.join(tempfile.mkdtemp(), "threej.npz"), workers=1, progress=None)
    >>> table.exact(1, 1, 0, 1, -1, 0)
    sqrt(3)/3

    The float is the correctly rounded double of the exact value (mpmath at 30 digits):

    >>> import mpmath
    >>> with mpmath.workdps(30):
    ...     table.float(1, 1, 0, 1, -1, 0) == float(1 / mpmath.sqrt(3))
    True
    >>> table.exact(1, 1, 1, 0, 0, 0)          # j1 + j2 + j3 odd with all m = 0
    0

    One stored class gives every symmetry of its symbol (a 3j symbol is unchanged by
    an even permutation of its columns, Edmonds 1957, eq. 3.7.5; from memory):

    >>> table.exact(1, 1, 0, 1, -1, 0) == table.exact(1, 0, 1, 1, 0, -1) == 1 / sqrt(3)
    True
    """

    def __init__(self, kind, jmax2, keys, numerator, denominator, radicand, value):
        self.kind, self.jmax2 = kind, jmax2
        self.keys = keys
        self._numerator, self._denominator, self._radicand = numerator, denominator, radicand
        self.values = value
        self._index = None

    @property
    def jmax(self):
        return Rational(self.jmax2, 2)

    def __len__(self):
        return int(self.keys.shape[0])

    def __repr__(self):
        return f"CouplingTable({self.kind}, jmax={self.jmax}, {len(self)} classes)"

    __str__ = __repr__

    def _latex(self, printer, exp=None):
        return notation.coupling_table_latex(printer, self, exp)

    def _sympystr(self, printer):
        return repr(self)

    def _row(self, key):
        if self._index is None:  # built once: O(1) lookups afterwards
            self._index = {tuple(int(x) for x in row): i for i, row in enumerate(self.keys)}
        return self._index.get(key)

    def _locate(self, args):
        """``(row, sign)``; ``row`` None for a selection-rule zero."""
        if self.kind == "sixj":
            if len(args) != 6:
                raise TypeError(f"args={args!r} must be six angular momenta")
            t = [doubled(a, f"j{i + 1}", nonnegative=True) for i, a in enumerate(args)]
            from ..coupling.kernels import sixj_key_plain

            key = sixj_key_plain(*t)
            if key == 0:
                return None, 1
            return self._found(key, t), 1
        if self.kind == "threej":
            if len(args) != 6:
                raise TypeError(f"args={args!r} must be j1, j2, j3, m1, m2, m3")
            tj = [doubled(a, f"j{i + 1}", nonnegative=True) for i, a in enumerate(args[:3])]
            tm = [doubled_projection(tj[i], args[3 + i], f"m{i + 1}", f"j{i + 1}") for i in range(3)]
            if (sum(tm) != 0 or any(abs(m) > j for m, j in zip(tm, tj)) or (sum(tj) % 2)
                    or not abs(tj[0] - tj[1]) <= tj[2] <= tj[0] + tj[1]):
                return None, 1
            key, odd = threej_key(*tj, *tm)
            return self._found(key, tj + tm), -1 if odd and (sum(tj) // 2) & 1 else 1
        if len(args) != 9:
            raise TypeError(f"args={args!r} must be nine angular momenta, row by row")
        t = [doubled(a, f"j{i + 1}", nonnegative=True) for i, a in enumerate(args)]
        rows = (t[0:3], t[3:6], t[6:9])
        cols = tuple(zip(*rows))
        for a, b, c in (*rows, *cols):
            if (a + b + c) % 2 or not abs(a - b) <= c <= a + b:
                return None, 1
        key, odd = ninej_key(*t)
        flat = tuple(x for column in key for x in column)
        return self._found(flat, t), -1 if odd and (sum(t) // 2) & 1 else 1

    def _found(self, key, args):
        row = self._row(tuple(key))
        if row is None:
            raise KeyError(f"{self.kind} with doubled arguments {tuple(args)} is not in this table "
                           f"(jmax={self.jmax})")
        return row

    def exact(self, *args):
        """The exact value, as :func:`~amalgebra.coupling.sixj` etc. would return it."""
        row, sign = self._locate(args)
        if row is None:
            return Integer(0)
        n = _from_hex(str(self._numerator[row])) * sign
        d = _from_hex(str(self._denominator[row]))
        s = _from_hex(str(self._radicand[row]))
        return Rational(n, d) * sqrt(s)

    def float(self, *args):
        """The correctly rounded double (``nan`` when the table was written without floats)."""
        row, sign = self._locate(args)
        if row is None:
            return 0.0
        return float(sign * self.values[row])

    def triple(self, row):
        """``(n, d, s)`` of the canonical symbol of ``row`` (exact ints)."""
        return tuple(_from_hex(str(a[row])) for a in (self._numerator, self._denominator, self._radicand))
