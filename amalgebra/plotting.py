r"""Energy-level diagrams: the levels of an exact Hamiltonian against a field, labelled by quantum numbers.

Explanation
===========

:func:`energy_levels` turns a Hamiltonian matrix that the library built
(:func:`amalgebra.states.hamiltonian_matrix`, exact, with a field symbol left in
it) into numeric level curves: for each field value the matrix is evaluated in
floats and diagonalised (``numpy.linalg.eigh``) block by block, so that the
quantum numbers the blocks conserve (``M``, and ``F`` when it is conserved) label
the levels exactly.  Quantum numbers that are not conserved (``F`` in a field) are
read off at one field value, ``label_at`` (default: the field value nearest zero),
as those of the basis state with the largest weight in the eigenvector: a
coupled basis at zero field gives ``F``, an uncoupled basis at strong field gives
``m_I``, ``m_J``.  Each level is then followed along the field by the overlap of
its eigenvector between neighbouring field values, so a label stays with its
curve through crossings.

:func:`plot_levels` draws the curves on a matplotlib ``Axes`` with the energy axis
``E/h`` in the unit given, the field axis labelled, one colour and legend entry
per value of one quantum number (``F`` by default) and each curve annotated with
the others (``M`` by default).  :func:`level_diagram` does both.  matplotlib is the
optional extra ``amalgebra[plot]``; it is imported only when a figure is drawn
(with a clear error when missing), through its object API (``Figure``, no
``pyplot``), so no global backend or figure state is touched.

Conventions: energies are the eigenvalues of the matrix as given, so their unit
is the unit of its entries divided by ``h`` when the parameters are frequencies
(say so with ``energy_unit``); hbar = 1 and Condon-Shortley phases as everywhere
in the package.

Examples
========

Hyperfine levels of an invented atom (I = 1/2, J = 1/2, A = 1 GHz) in a field
``b = mu_B B`` (GHz): at zero field the triplet F = 1 lies at A/4, the singlet
at -3A/4 (Lande interval rule):

>>> from sympy import Symbol
>>> from amalgebra.algebra import AngularMomentum, dot
>>> from amalgebra.states import hamiltonian_matrix
>>> I, J = AngularMomentum("I"), AngularMomentum("J")
>>> b = Symbol("b")
>>> hm = hamiltonian_matrix(dot(I, J) + 2*b*J.z, {"I": "1/2", "J": "1/2"}, basis="coupled")
>>> curves = energy_levels(hm, b, [0.0, 0.5, 1.0])
>>> [(str(lv.numbers["F"]), str(lv.numbers["M"]), round(float(lv.energies[0]), 6))
...  for lv in curves.levels]
[('1', '1', 0.25), ('1', '0', 0.25), ('0', '0', -0.75), ('1', '-1', 0.25)]

Drawing them (with matplotlib) is ``ax = plot_levels(curves, field_label=r"$\\mu_B B/h$")``
then ``ax.figure.savefig("levels.png")``, or :func:`level_diagram` in one call.
"""

from sympy import Basic, Matrix, lambdify, latex

from .errors import NotNumericError, StateError

__all__ = ["energy_levels", "plot_levels", "level_diagram", "LevelCurves", "Level"]

_HERMITIAN_TOLERANCE = 1e-9


class Level:
    """One level curve: ``numbers`` (dict of quantum numbers, SymPy values) and ``energies``
    (a numpy array, one entry per field value)."""

    __slots__ = ("numbers", "energies")

    def __init__(self, numbers, energies):
        self.numbers = dict(numbers)
        self.energies = energies

    def label(self, names):
        """``"F = 3, M = -1/2"`` for ``names=("F", "M")`` (names the level lacks are skipped)."""
        return ", ".join(f"{n} = {self.numbers[n]}" for n in names if n in self.numbers)

    def __repr__(self):
        return f"Level({self.label(sorted(self.numbers))})"


class LevelCurves:
    """The result of :func:`energy_levels`: ``fields`` (numpy array), ``levels`` (list of
    :class:`Level`), ``field`` (the field symbol) and ``names`` (quantum numbers known)."""

    __slots__ = ("fields", "levels", "field", "names")

    def __init__(self, fields, levels, field, names):
        self.fields = fields
        self.levels = list(levels)
        self.field = field
        self.names = tuple(names)

    def __repr__(self):
        return (f"LevelCurves({len(self.levels)} levels at {len(self.fields)} field values, "
                f"quantum numbers {list(self.names)})")


def _numpy():
    try:
        import numpy
    except ModuleNotFoundError as exc:
        raise ModuleNotFoundError("energy_levels needs numpy: pip install 'amalgebra[numeric]' "
                                  "(or 'amalgebra[plot]')") from exc
    return numpy


def _matplotlib_figure():
    try:
        from matplotlib.figure import Figure
    except ModuleNotFoundError as exc:
        raise ModuleNotFoundError("plotting level diagrams needs matplotlib: "
                                  "pip install 'amalgebra[plot]'") from exc
    return Figure


def _state_numbers(basis):
    """Per basis state, a dict of its quantum numbers: ``M``, ``F`` (coupled kets) and
    ``m_<label>`` (product kets), from :meth:`amalgebra.states.basis.Basis.quantum_numbers`."""
    out = []
    for i in range(len(basis)):
        numbers = {}
        for key, value in basis.quantum_numbers(i).items():
            if isinstance(value, tuple):        # (j, m) of one label
                numbers[f"m_{key}"] = value[1]
            else:
                numbers[key] = value
        out.append(numbers)
    return out


def _numeric_function(matrix, field, parameters, where):
    """``value -> complex numpy array`` for a SymPy matrix with only ``field`` left free."""
    numpy = _numpy()
    mat = Matrix(matrix).subs(parameters) if parameters else Matrix(matrix)
    left = sorted(mat.free_symbols - {field}, key=str)
    if left:
        raise NotNumericError(f"{where} must depend on the field {field} only: give values for "
                              f"{', '.join(map(str, left))} in parameters")
    fn = lambdify(field, mat, modules="numpy")
    return lambda value: numpy.asarray(fn(value), dtype=complex)


def _follow(function, fields, where):
    """Eigenvalues and eigenvectors along ``fields``, each column kept on its curve by overlap."""
    numpy = _numpy()
    energies, vectors, previous = [], [], None
    for value in fields:
        mat = function(value)
        if not numpy.allclose(mat, mat.conj().T, atol=_HERMITIAN_TOLERANCE * max(1.0, abs(mat).max())):
            raise StateError(f"{where} at field={value} must be Hermitian")
        vals, vecs = numpy.linalg.eigh(mat)
        if previous is not None:
            order = _match(numpy, previous, vecs)
            vals, vecs = vals[order], vecs[:, order]
        energies.append(vals)
        vectors.append(vecs)
        previous = vecs
    return numpy.array(energies).T, vectors


def _match(numpy, old, new):
    """Column order of ``new`` that best continues the columns of ``old`` (largest overlaps first)."""
    overlap = abs(old.conj().T @ new)
    n = overlap.shape[0]
    order, taken, done = [0] * n, set(), set()
    for flat in numpy.argsort(-overlap, axis=None, kind="stable"):
        i, k = divmod(int(flat), n)
        if i in done or k in taken:
            continue
        order[i] = k
        done.add(i)
        taken.add(k)
    return order


def energy_levels(hamiltonian, field, fields, *, parameters=None, label_at=None, basis_numbers=None):
    """Numeric energy levels along a field, each with its quantum numbers (module docstring).

    Parameters
    ==========

    hamiltonian : the result of :func:`amalgebra.states.hamiltonian_matrix` (preferred: its
        conserved blocks label levels exactly), or a SymPy matrix, or a callable
        ``value -> matrix`` (numpy array or SymPy matrix) of the field value
    field : the SymPy symbol of the field in the matrix (any name, used for labels)
    fields : the field values (floats)
    parameters : ``{symbol: number}`` for the other symbols of the matrix
    label_at : the field value at which non-conserved quantum numbers are read off
        (default: the value nearest zero)
    basis_numbers : for a plain matrix or a callable, one dict of quantum numbers per
        basis state (default: the basis of a ``hamiltonian_matrix`` result; none otherwise)

    Returns a :class:`LevelCurves`; levels are ordered by block (conserved quantum
    numbers) and, within a block, by energy at ``label_at``.

    Examples
    ========

    A spin 1 with a zero-field splitting ``D Sz^2`` in a field along z: levels
    ``D + b``, ``0``, ``D - b``, with their ``M`` (common practice, no source):

    >>> from sympy import Symbol
    >>> from amalgebra.algebra import AngularMomentum
    >>> from amalgebra.states import hamiltonian_matrix
    >>> S_, b, D = AngularMomentum("S"), Symbol("b"), Symbol("D")
    >>> hm = hamiltonian_matrix(D*S_.z**2 + b*S_.z, {"S": 1})
    >>> curves = energy_levels(hm, b, [0.0, 2.0], parameters={D: 1.5})
    >>> [(str(lv.numbers["M"]), [round(float(e), 9) for e in lv.energies]) for lv in curves.levels]
    [('1', [1.5, 3.5]), ('0', [0.0, 0.0]), ('-1', [1.5, -0.5])]
    """
    numpy = _numpy()
    fields = numpy.asarray(list(fields), dtype=float)
    if fields.ndim != 1 or len(fields) == 0:
        raise StateError(f"fields={fields!r} must be a non-empty sequence of numbers")
    if not isinstance(field, Basic):
        raise NotNumericError(f"field={field!r} must be the SymPy symbol of the field")
    parameters = dict(parameters or {})
    start = int(numpy.argmin(abs(fields))) if label_at is None else None
    if label_at is not None:
        start = int(numpy.argmin(abs(fields - float(label_at))))

    blocks = getattr(hamiltonian, "blocks", None)
    if blocks is not None:
        numbers = _state_numbers(hamiltonian.basis) if basis_numbers is None else list(basis_numbers)
        parts = [(blk.indices, dict(blk.quantum_numbers),
                  _numeric_function(blk.matrix, field, parameters, f"block {blk.quantum_numbers}"))
                 for blk in blocks]
    else:
        if callable(hamiltonian) and not isinstance(hamiltonian, Basic) and not hasattr(hamiltonian, "shape"):
            def function(value, _h=hamiltonian):
                mat = _h(value)
                return numpy.asarray(mat.evalf() if isinstance(mat, Basic) else mat, dtype=complex)
        else:
            function = _numeric_function(hamiltonian, field, parameters, "hamiltonian")
        size = function(fields[start]).shape[0]
        numbers = [{} for _ in range(size)] if basis_numbers is None else list(basis_numbers)
        if len(numbers) != size:
            raise StateError(f"basis_numbers must give one dict per basis state ({size}), "
                             f"not {len(numbers)}")
        parts = [(tuple(range(size)), {}, function)]

    # follow each block outwards from the labelling point, so labels are read where asked
    levels, names = [], []
    for indices, conserved, function in parts:
        up, up_vecs = _follow(function, fields[start:], "hamiltonian")
        down, _ = _follow(function, fields[start::-1], "hamiltonian")
        curves = numpy.concatenate([down[:, :0:-1], up], axis=1)
        at_start = up_vecs[0]
        order = numpy.argsort(-up[:, 0], kind="stable")      # highest level first
        for col in order:
            weights = abs(at_start[:, col]) ** 2
            dominant = numbers[indices[int(numpy.argmax(weights))]]
            level_numbers = dict(dominant)
            level_numbers.update(conserved)
            levels.append(Level(level_numbers, curves[col].real.copy()))
            names.extend(k for k in level_numbers if k not in names)
    return LevelCurves(fields, levels, field, names)


def _group_key(value):
    try:
        return (0, -float(value))
    except TypeError:
        return (1, str(value))


def plot_levels(curves, ax=None, *, color_by="F", annotate=("M",), energy_unit="GHz",
                field_label=None, field_unit=None, title=None, legend=True):
    """Draw :class:`LevelCurves` on a matplotlib ``Axes``; return the ``Axes``.

    One line per level; levels with the same value of ``color_by`` share a colour and a
    legend entry (``"F = 3"``); each curve carries a text with its ``annotate`` quantum
    numbers (``"M = -1/2"``) at the right end.  The y axis reads ``E/h (energy_unit)``, the
    x axis ``field_label (field_unit)`` (default: the field symbol in LaTeX, and
    ``energy_unit``).  With ``ax=None`` a new ``matplotlib.figure.Figure`` is made
    (``ax.figure.savefig(path)`` writes it).  Quantum numbers a level lacks are skipped;
    ``color_by=None`` colours every level alike.

    Examples
    ========

    Two hyperfine levels of an invented atom (I = J = 1/2, A = 1 GHz) in a field:

    >>> from sympy import Symbol
    >>> from amalgebra.algebra import AngularMomentum, dot
    >>> from amalgebra.states import hamiltonian_matrix
    >>> I, J, b = AngularMomentum("I"), AngularMomentum("J"), Symbol("b")
    >>> hm = hamiltonian_matrix(dot(I, J) + 2*b*J.z, {"I": "1/2", "J": "1/2"}, basis="coupled")
    >>> ax = plot_levels(energy_levels(hm, b, [0.0, 0.5, 1.0]), field_label="$b$")
    >>> len(ax.get_lines()), [t.get_text() for t in ax.get_legend().get_texts()]
    (4, ['F = 1', 'F = 0'])
    >>> ax.get_xlabel(), ax.get_ylabel(), sorted(t.get_text() for t in ax.texts)
    ('$b$ (GHz)', '$E/h$ (GHz)', ['M = -1', 'M = 0', 'M = 0', 'M = 1'])
    """
    if ax is None:
        Figure = _matplotlib_figure()
        ax = Figure(figsize=(7, 5), layout="constrained").subplots()
    else:
        _matplotlib_figure()
    fields = curves.fields
    groups = sorted({lv.numbers.get(color_by) for lv in curves.levels if color_by in lv.numbers},
                    key=_group_key) if color_by else []
    colour = {value: f"C{i % 10}" for i, value in enumerate(groups)}
    seen = set()
    span = float(fields.max() - fields.min()) or 1.0
    for lv in curves.levels:
        value = lv.numbers.get(color_by) if color_by else None
        label = None
        if value is not None and value not in seen:
            seen.add(value)
            label = f"{color_by} = {value}"
        ax.plot(fields, lv.energies, color=colour.get(value, "C0"), lw=1.2, label=label)
        text = lv.label(annotate)
        if text:
            ax.annotate(text, (fields[-1], lv.energies[-1]), xytext=(fields[-1] + 0.01 * span,
                        lv.energies[-1]), fontsize=7, va="center", ha="left", annotation_clip=False)
    ax.set_xlim(fields.min(), fields.max() + 0.12 * span)
    field_label = f"${latex(curves.field)}$" if field_label is None else field_label
    field_unit = energy_unit if field_unit is None else field_unit
    ax.set_xlabel(f"{field_label} ({field_unit})" if field_unit else field_label)
    ax.set_ylabel(f"$E/h$ ({energy_unit})" if energy_unit else "$E/h$")
    if title:
        ax.set_title(title)
    if legend and seen:
        ax.legend(loc="best", fontsize=8, title=None)
    return ax


def level_diagram(hamiltonian, field, fields, *, parameters=None, label_at=None, basis_numbers=None,
                  ax=None, **style):
    """:func:`energy_levels` then :func:`plot_levels`; returns ``(ax, curves)``.

    ``style`` goes to :func:`plot_levels` (``color_by``, ``annotate``, ``energy_unit``,
    ``field_label``, ``field_unit``, ``title``, ``legend``).  Write the figure with
    ``ax.figure.savefig("levels.png")``.

    Examples
    ========

    A spin 1/2 in a field (``E = +-b/2``; common practice, no source), labelled by ``M``:

    >>> from sympy import Symbol
    >>> from amalgebra.algebra import AngularMomentum
    >>> from amalgebra.states import hamiltonian_matrix
    >>> S_, b = AngularMomentum("S"), Symbol("b")
    >>> ax, curves = level_diagram(hamiltonian_matrix(b*S_.z, {"S": "1/2"}), b, [0.0, 4.0],
    ...                            color_by="M", annotate=(), energy_unit="MHz")
    >>> [(t.get_text(), [float(y) + 0.0 for y in line.get_ydata()]) for t, line in
    ...  zip(ax.get_legend().get_texts(), ax.get_lines())]
    [('M = 1/2', [0.0, 2.0]), ('M = -1/2', [0.0, -2.0])]
    """
    curves = energy_levels(hamiltonian, field, fields, parameters=parameters, label_at=label_at,
                           basis_numbers=basis_numbers)
    return plot_levels(curves, ax, **style), curves

