"""A matrix stored with its basis (issue 15): ``{ basis_matrix = [...] }`` entries.

A ``HamiltonianMatrix``/``OperatorMatrix`` result is written as its basis kets (as the
library prints them) and one row per ket, read back as an ``OperatorMatrix`` equal to
it, compared entry by entry; a tampered entry is a ``changed`` or ``unreadable``
result named with file:line, counted, and the run exits non-zero.
"""

import contextlib
import io

import pytest
from sympy import Matrix, Rational, symbols

from amalgebra.algebra import AngularMomentum
from amalgebra.derivations.runner import EXIT_FAILED, EXIT_OK, record_folder, run_folder
from amalgebra.derivations.store import load_results
from amalgebra.errors import StoredResultError
from amalgebra.states.hamiltonian import OperatorMatrix, hamiltonian_matrix
from amalgebra.states.kets import ProductKet, ket

SOURCE = '''
from sympy import Integer, Rational, symbols
from amalgebra.algebra import AngularMomentum
from amalgebra.derivations import derivation, written
from amalgebra.states.hamiltonian import hamiltonian_matrix

S, I, b, a = AngularMomentum("S"), AngularMomentum("I"), *symbols("b a")


@derivation
def doublet(d):
    hm = hamiltonian_matrix(b*S.z + a*(S.z*I.z + (S.plus*I.minus + S.minus*I.plus)/2),
                            {"S": Rational(1, 2), "I": Rational(1, 2)})
    d.step("trace", written(r"\\mathrm{tr}\\,H", hm.matrix.trace()), 0, "both terms are traceless")
    d.result("H", hm)
    d.result("count", Integer(len(hm.basis)))
'''

#: the matrix of b S_z + a S.I on |m_I>|m_S> (labels sorted: I first; order ++, +-, -+,
#: --): diagonal b m_S + a m_I m_S, and a/2 between +- and -+ (common practice, no
#: source: (S+I- + S-I+)/2 joins |m_I=1/2, m_S=-1/2> and |-1/2, 1/2> with a/2)
A, B = symbols("a b")
EXPECTED = Matrix([[B/2 + A/4, 0, 0, 0],
                   [0, -B/2 - A/4, A/2, 0],
                   [0, A/2, B/2 - A/4, 0],
                   [0, 0, 0, -B/2 + A/4]])


@pytest.fixture
def recorded(make_folder):
    folder = make_folder({"deriv_pair.py": SOURCE})
    assert record_folder(folder).exit_code == EXIT_OK
    return folder, folder / "deriv_pair.results.toml"


def test_stored_with_its_basis_and_read_back(recorded):
    folder, path = recorded
    text = path.read_text()
    assert "H = { basis_matrix = [" in text and "# basis: rows and columns" in text
    value = load_results(path)["doublet"]["H"].value
    assert isinstance(value, OperatorMatrix)
    assert value.matrix == EXPECTED
    half = Rational(1, 2)
    assert list(value.basis) == [ProductKet(ket(half, mi, "I"), ket(half, ms, "S"))
                                 for mi in (half, -half) for ms in (half, -half)]
    assert run_folder(folder).exit_code == EXIT_OK


def test_a_changed_matrix_entry_is_changed_with_its_line(recorded):
    folder, path = recorded
    text = path.read_text()
    assert text.count('"1/2*a"') == 2
    path.write_text(text.replace('"1/2*a"', '"1/3*a"', 1))
    out = run_folder(folder)
    assert out.exit_code == EXIT_FAILED
    (bad,) = [c for c in out.comparisons if not c.passed]
    line = text.splitlines().index("H = { basis_matrix = [") + 1
    assert (bad.result, bad.status, bad.line) == ("H", "changed", line)
    assert "[1, 2]" in bad.diff


def test_a_changed_basis_state_is_changed(recorded):
    folder, path = recorded
    text = path.read_text()
    old = '"|1/2, 1/2>_I|1/2, 1/2>_S"'
    assert old in text
    path.write_text(text.replace(old, '"|1/2, 1/2>_I|1/2, -1/2>_S"', 1))
    out = run_folder(folder)
    assert out.exit_code == EXIT_FAILED
    (bad,) = [c for c in out.comparisons if not c.passed]
    assert bad.status == "changed" and ".basis[0]" in bad.diff


@pytest.mark.parametrize("old, new, fragment", [
    ('"1/2*a"', '"1/2*+a"', "unexpected"),                      # not in the grammar
    ('"0", "0", "0", "1/4*a - 1/2*b"]', '"0", "0", "1/4*a - 1/2*b"]', "4 rows of 4 entries"),
    ('"|1/2, 1/2>_I|1/2, 1/2>_S"', '"|1/2, 1/2>_I|1/2, 1/2"', ""),   # a broken ket
])
def test_a_tampered_entry_is_one_unreadable_error_counted_in_the_summary(recorded, old, new,
                                                                          fragment):
    folder, path = recorded
    text = path.read_text()
    assert old in text
    path.write_text(text.replace(old, new, 1))
    with pytest.raises(StoredResultError) as info:
        load_results(path)["doublet"]["H"].value
    assert str(info.value).startswith(f"{path}:") and fragment in str(info.value)
    out = run_folder(folder)
    statuses = {c.result: c.status for c in out.comparisons}
    assert statuses == {"H": "unreadable", "count": "identical"}   # never skipped, the rest compared
    assert out.exit_code == EXIT_FAILED
    (bad,) = [c for c in out.comparisons if c.status == "unreadable"]
    assert f"{path}:" in bad.diff and bad.line is not None

    from amalgebra.cli import main

    buffer = io.StringIO()
    with contextlib.redirect_stdout(buffer):
        code = main(["check", str(folder), "-q"])
    assert code == EXIT_FAILED
    printed = buffer.getvalue()
    assert "doublet.H UNREADABLE" in printed and "1 unreadable" in printed and "1 identical" in printed


def test_an_operator_matrix_result_is_typeset_with_its_basis_labels(recorded):
    from sympy import latex

    from amalgebra.derivations.latex import report_latex

    folder, _ = recorded
    out = run_folder(folder)
    report = report_latex(out.files)
    hm = out.files[0].records[0].results["H"]
    assert r"\begin{array}{r|" in report
    for state in hm.basis:
        assert latex(state) in report
    assert r"\mathrm{tr}\,H &= 0" in report                        # the written side


def test_refuses_a_non_square_operator_matrix():
    from amalgebra.derivations.store import encode_value

    S = AngularMomentum("S")
    hm = hamiltonian_matrix(S.z, {"S": Rational(1, 2)})
    bad = OperatorMatrix(Matrix([[1, 0, 0], [0, 1, 0]]), hm.basis)
    with pytest.raises(StoredResultError, match="square"):
        encode_value(bad)


SPIN_BOSON = '''
from sympy import symbols
from amalgebra.algebra import AngularMomentum
from amalgebra.bosons import BosonMode
from amalgebra.derivations import derivation
from amalgebra.states.hamiltonian import hamiltonian_matrix

S, a = AngularMomentum("S"), BosonMode("a")
w, g = symbols("w g")


@derivation
def cavity(d):
    hm = hamiltonian_matrix(w*a.number + g*(S.plus*a.annihilate + S.minus*a.create), {"S": 1, "a": 1})
    d.result("H", hm)
'''


def test_a_spin_boson_matrix_is_stored_with_its_modes(make_folder):
    from amalgebra.bosons import BosonMode, fock_ket

    folder = make_folder({"deriv_cavity.py": SPIN_BOSON})
    assert record_folder(folder).exit_code == EXIT_OK
    value = load_results(folder / "deriv_cavity.results.toml")["cavity"]["H"].value
    S, a = AngularMomentum("S"), BosonMode("a")
    w, g = symbols("w g")
    fresh = hamiltonian_matrix(w * a.number + g * (S.plus * a.annihilate + S.minus * a.create), {"S": 1, "a": 1})
    assert value.matrix == fresh.matrix and value.basis == fresh.basis
    assert value.basis.modes == ("a",) and value.basis[1] == ket(1, 1, "S") * fock_ket(1, modes="a")
    assert value.basis.select(N=1) == (1, 3, 5)
    assert run_folder(folder).exit_code == EXIT_OK
