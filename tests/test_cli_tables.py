"""`amalgebra table` for 3j, 9j and recoupling matrices (issue 13), printed and as LaTeX."""

from amalgebra.cli import EXIT_OK, EXIT_USAGE, main


def test_threej_one_and_all(capsys):
    # (1 1 2; 0 0 0) = sqrt(2/15)  (DLMF 34.3.5 closed form for (j1 j2 j3; 0 0 0), from memory)
    assert main(["table", "threej", "1", "1", "2", "0", "0", "0"]) == EXIT_OK
    assert capsys.readouterr().out.strip().endswith("= sqrt(30)/15")
    assert main(["table", "threej", "1", "1", "1"]) == EXIT_OK
    out = capsys.readouterr().out
    # (1 1 1; 1 0 -1) = -1/sqrt(6)  (PDG table via the 3j-CG relation, from memory)
    assert "m1=1 m2=0 m3=-1: -sqrt(6)/6" in out
    assert "m1=0 m2=0" not in out   # (1 1 1; 0 0 0) = 0 by parity, not listed


def test_ninej_printed_and_latex(capsys):
    # {1 1 0; 1 1 0; 0 0 0} = 1/3: a 9j with a zero row is a 6j over (2j+1) (Edmonds 6.4.14, from memory)
    assert main(["table", "ninej", "1", "1", "0", "1", "1", "0", "0", "0", "0"]) == EXIT_OK
    assert capsys.readouterr().out.strip() == "{1 1 0; 1 1 0; 0 0 0} = 1/3"
    assert main(["table", "ninej", "1", "1", "0", "1", "1", "0", "0", "0", "0", "--latex"]) == EXIT_OK
    out = capsys.readouterr().out.strip()
    assert out.startswith(r"\begin{Bmatrix}") and out.endswith(r"= \frac{1}{3}")


def test_recoupling_matrix_ls_to_jj(capsys):
    args = ["table", "recoupling", "((l1 l2) L, (s1 s2) S) J", "((l1 s1) j1, (l2 s2) j2) J",
            "l1=1", "l2=1", "s1=1/2", "s2=1/2", "--total", "0"]
    assert main(args) == EXIT_OK
    out = capsys.readouterr().out
    # pp' J = 0: <1S0|(1/2 1/2)0> = sqrt(1/3), <1S0|(3/2 3/2)0> = sqrt(2/3) (from memory, Condon-Shortley)
    assert "Condon-Shortley" in out
    assert "[sqrt(6)/3, sqrt(3)/3]" in out
    assert main(args + ["--latex"]) == EXIT_OK
    assert r"\begin{array}" in capsys.readouterr().out


def test_bad_table_arguments_are_usage_errors(capsys):
    assert main(["table", "recoupling", "((a b) x", "(a b) J", "a=1"]) == EXIT_USAGE
    assert main(["table", "recoupling", "(a b) J", "(b a) J", "a=1", "z=3"]) == EXIT_USAGE
    assert main(["table", "recoupling", "(a b) J", "(b a) J", "a"]) == EXIT_USAGE
    assert main(["table", "ninej", "1", "1"]) == EXIT_USAGE
    assert main(["table", "threej", "1", "1"]) == EXIT_USAGE
    err = capsys.readouterr().err
    assert "name=value" in err and "nine values" in err


def test_whole_table_to_a_file(tmp_path, capsys):
    # the file holds the library's exact values (source: amalgebra.coupling.sixj, itself checked
    # against published values in tests/coupling)
    from amalgebra.coupling import sixj
    from amalgebra.tables import load_table

    out = tmp_path / "sixj.npz"
    assert main(["table", "sixj", "--jmax", "3/2", "-o", str(out), "--workers", "1", "-q"]) == EXIT_OK
    assert "classes up to j = 3/2" in capsys.readouterr().out
    table = load_table(out)
    assert table.exact(1, 1, 1, 1, 1, 1) == sixj(1, 1, 1, 1, 1, 1) != 0
    assert main(["table", "sixj", "--jmax", "3/2"]) == EXIT_USAGE
    assert main(["table", "cg", "--jmax", "1", "-o", str(out)]) == EXIT_USAGE
    assert main(["table", "sixj", "--jmax", "999", "-o", str(out)]) == EXIT_USAGE
    assert main(["table", "sixj"]) == EXIT_USAGE
