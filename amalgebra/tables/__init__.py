"""Tables of coupling coefficients at scale: every 3j, 6j or 9j symbol up to a jmax, one entry per symmetry class.

Public map
==========

:func:`tabulate`
    compute a table (exact and float), in parallel over local processes or over a
    ``dask.distributed`` cluster, resumable, written to a numpy ``.npz`` file
    (:mod:`amalgebra.tables.runner`);
:func:`load_table`, :class:`CouplingTable`
    read a table back (no code runs: ``numpy.load(allow_pickle=False)``) and look
    symbols up in O(1) by their canonical key (:mod:`amalgebra.tables.storage`);
:func:`canonical_keys`
    the symmetry classes of a family up to a jmax (:mod:`amalgebra.tables.enumeration`).

numpy is needed (the ``numeric`` extra); dask only for a cluster (the ``dask`` extra).
"""

try:
    import numpy  # noqa: F401  (the tables are numpy arrays)
except ImportError as exc:  # pragma: no cover - depends on the install
    raise ImportError("amalgebra.tables needs numpy: python3 -m pip install 'amalgebra[numeric]'") from exc

from .enumeration import canonical_keys
from .runner import tabulate
from .storage import CouplingTable, load_table

__all__ = ["tabulate", "load_table", "CouplingTable", "canonical_keys"]
