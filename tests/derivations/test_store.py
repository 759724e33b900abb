"""Tests of the stored-results format (amalgebra.derivations.store): round trip and tampering."""

import pytest
from sympy import I, Rational, Symbol, sqrt

from amalgebra.derivations.store import FORMAT, load_results, results_path, write_results
from amalgebra.errors import StoredResultError

j, m = Symbol("j"), Symbol("m")

GOOD = f'''# a comment
format = "{FORMAT}"

[first]
a = "j*(j + 1)"
b = "sqrt(2)/2 - I*m"

[second]
c = "Jz(J)^2"
'''


def test_results_path_is_beside_the_file(tmp_path):
    assert results_path(tmp_path / "deriv_x.py") == tmp_path / "deriv_x.results.toml"


def test_missing_file_means_not_recorded(tmp_path):
    assert load_results(tmp_path / "deriv_none.results.toml") is None


def test_write_then_load_round_trip(tmp_path):
    path = tmp_path / "deriv_a.results.toml"
    results = {"first": {"a": j*(j + 1), "b": sqrt(2)/2 - I*m}, "empty": {},
               "second": {"c": Rational(-3, 7)}}
    write_results(path, results, "deriv_a.py")
    text = path.read_text()
    assert "[empty]" not in text
    assert text.splitlines()[2] == f'format = "{FORMAT}"'
    loaded = load_results(path)
    assert list(loaded) == ["first", "second"]
    assert {k: e.expr for k, e in loaded["first"].items()} == results["first"]
    assert loaded["second"]["c"].text == "-3/7"
    # the file is real TOML too (stdlib reader): reviewers' tools can read it
    import tomllib

    assert tomllib.loads(text)["first"]["a"] == "j*(j + 1)"


def test_load_good_file_with_lines(tmp_path):
    path = tmp_path / "deriv_g.results.toml"
    path.write_text(GOOD)
    loaded = load_results(path)
    assert [(k, e.line) for k, e in loaded["first"].items()] == [("a", 5), ("b", 6)]
    assert loaded["first"]["a"].expr == j*(j + 1)


TAMPERED = [
    # (replace this, with this, expected line, message fragment)
    ('a = "j*(j + 1)"', "a = \"__import__('os')\"", 5, "is not a valid expression"),
    ('a = "j*(j + 1)"', 'a = "().__class__"', 5, "is not a valid expression"),
    ('a = "j*(j + 1)"', 'a = "j.__class__"', 5, "is not a valid expression"),
    ('a = "j*(j + 1)"', 'a = "eval(j)"', 5, "function name='eval'"),
    ('a = "j*(j + 1)"', 'a = "2^2^2^5"', 5, "exponent=4294967296"),
    ('b = "sqrt(2)/2 - I*m"', 'b = "sqrt(2)/2 - I*m" # note', 6, "must be a comment"),
    ('b = "sqrt(2)/2 - I*m"', "b = 'single quotes'", 6, "must be a comment"),
    ('b = "sqrt(2)/2 - I*m"', 'a = "j"', 6, "must appear only once"),
    ("[second]", "[first]", 8, "must appear only once"),
    ("[second]", "[not valid]", 8, "must be a comment"),
    (f'format = "{FORMAT}"', 'format = "amalgebra-results-0"', 2, "must be"),
    (f'format = "{FORMAT}"', "", 4, "format line must come before"),
    ('c = "Jz(J)^2"', 'c = "Jz(J)^2"\nd = "x\\u0022"', 10, "must be a comment"),
]


@pytest.mark.parametrize(("old", "new", "line", "fragment"), TAMPERED)
def test_tampered_files_name_file_and_line(tmp_path, old, new, line, fragment):
    path = tmp_path / "deriv_t.results.toml"
    assert old in GOOD
    path.write_text(GOOD.replace(old, new))
    with pytest.raises(StoredResultError, match=fragment.replace("(", r"\(")) as info:
        load_results(path)
    assert str(info.value).startswith(f"{path}:{line}: ")


def test_no_format_line_and_bad_encoding(tmp_path):
    path = tmp_path / "deriv_f.results.toml"
    path.write_text("# nothing\n")
    with pytest.raises(StoredResultError, match=r":1: the file must declare format"):
        load_results(path)
    path.write_bytes(b"\xff\xfe format")
    with pytest.raises(StoredResultError, match="must be UTF-8"):
        load_results(path)
