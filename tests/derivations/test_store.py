"""Tests of the stored-results format (amalgebra.derivations.store): round trips, tampering,
hostile files (links, FIFOs, devices, directories, huge files) and messages without content."""

import os
import stat
import threading
import time
import tomllib

import pytest
from hypothesis import given
from hypothesis import strategies as st
from sympy import I, ImmutableMatrix, Matrix, Rational, Symbol, sqrt

from amalgebra.derivations.store import (
    FORMAT, MAX_DEPTH, StoredResults, encode_value, load_results, render_results, results_path,
    write_results,
)
from amalgebra.errors import ParseError, StoredResultError

j, m, A = Symbol("j"), Symbol("m"), Symbol("A")

GOOD = f'''# a comment
format = "{FORMAT}"

[first]
a = "j*(j + 1)"
b = "sqrt(2)/2 - I*m"

[second]
c = "Jz(J)^2"
'''

#: A marker that must never appear in a message: messages name places, not content.
SECRET = "zq9SECRETzq9"


def write(tmp_path, text, name="deriv_t.results.toml"):
    path = tmp_path / name
    path.write_text(text, encoding="utf-8")
    return path


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
    assert isinstance(loaded, StoredResults) and loaded.problems == []
    assert list(loaded) == ["first", "second"]
    assert {k: e.value for k, e in loaded["first"].items()} == results["first"]
    assert loaded["second"]["c"].text == "-3/7"
    # the file is real TOML too (stdlib reader): reviewers' tools can read it
    assert tomllib.loads(text)["first"]["a"] == "j*(j + 1)"


def test_version_1_files_are_still_read(tmp_path):
    path = write(tmp_path, GOOD.replace(FORMAT, "amalgebra-results-1"))
    assert load_results(path, strict=True)["first"]["a"].value == j*(j + 1)


def test_load_good_file_with_lines(tmp_path):
    path = write(tmp_path, GOOD)
    loaded = load_results(path)
    assert [(k, e.line) for k, e in loaded["first"].items()] == [("a", 5), ("b", 6)]
    assert loaded["first"]["a"].expr == j*(j + 1)


# --------------------------------------------------------------- structured values and decimals

def test_matrix_tuple_dict_and_decimal_round_trips(tmp_path):
    path = tmp_path / "deriv_s.results.toml"
    H = Matrix([[A, sqrt(2)*j], [sqrt(2)*j, -A]])
    value = {"d": {
        "H": H,
        "pair": (j, Rational(36111, 500)),                  # 72.222 (common practice, no source)
        "nested": ((1, (j,)), {"upper": A, "lower": -A}),
        "by_F": {Rational(3, 2): 5*A/4, 2: -7*A/4},
        "mhz": Rational(854335326363, 125000000)*A,         # 6834.682610904 MHz, exact
        "empty": Matrix(0, 0, []),
    }}
    write_results(path, value)
    text = path.read_text()
    assert 'mhz = "6834.682610904*A"' in text              # readable exact decimal
    assert 'pair = { tuple = ["j", "72.222"] }' in text
    assert "H = { matrix = [\n" in text and '    ["A", "j*sqrt(2)"],\n' in text
    assert 'by_F = { dict = [["3/2", "5/4*A"], ["2", "-7/4*A"]] }' in text
    toml = tomllib.loads(text)["d"]                          # still plain TOML
    assert toml["H"] == {"matrix": [["A", "j*sqrt(2)"], ["j*sqrt(2)", "-A"]]}
    loaded = load_results(path, strict=True)["d"]
    got = {k: e.value for k, e in loaded.items()}
    assert got["H"] == H and isinstance(got["H"], ImmutableMatrix)
    assert got["pair"] == (j, Rational(36111, 500)) and isinstance(got["pair"], tuple)
    assert got["nested"] == ((1, (j,)), {"upper": A, "lower": -A})
    assert got["by_F"] == {Rational(3, 2): 5*A/4, 2: -7*A/4}
    assert got["mhz"] == Rational(854335326363, 125000000)*A
    assert got["empty"].shape == (0, 0)
    assert loaded["pair"].text == "(j, 72.222)"
    assert loaded["H"].text == "Matrix([[A, j*sqrt(2)], [j*sqrt(2), -A]])"
    assert render_results(value) == text                     # deterministic


def test_hand_typed_decimals_are_exact_rationals(tmp_path):
    path = write(tmp_path, f'format = "{FORMAT}"\n[d]\nquoted = "72.222"\nbare = 72.222\n'
                           'term = "-0.5*A + 1.25"\nnegative = -3.5\n')
    got = {k: e.value for k, e in load_results(path, strict=True)["d"].items()}
    # 72.222 = 72222/1000 = 36111/500 (arithmetic, common practice, no source)
    assert got == {"quoted": Rational(36111, 500), "bare": Rational(36111, 500),
                   "term": -A/2 + Rational(5, 4), "negative": Rational(-7, 2)}


@pytest.mark.parametrize(("value", "fragment"), [
    (True, "a bool has no stored form"),
    (0.5, "type float"),
    ("x\"y", "must be non-empty, without"),
    ({"a": 1, 2: 3}, "not a mixture"),
    (Matrix(0, 3, []), "shape (0, 3)"),
    (Symbol("x", commutative=False), "plain commutative symbol"),
])
def test_values_the_format_cannot_hold_are_refused(value, fragment):
    with pytest.raises(StoredResultError, match=fragment.replace("(", r"\(").replace(")", r"\)")):
        encode_value(value)


def test_nesting_deeper_than_the_limit_is_refused(tmp_path):
    deep = 1
    for _ in range(MAX_DEPTH + 2):
        deep = (deep,)
    with pytest.raises(StoredResultError, match="MAX_DEPTH"):
        encode_value(deep)
    text = "{ tuple = [" * (MAX_DEPTH + 2) + '"1"' + "] }" * (MAX_DEPTH + 2)
    path = write(tmp_path, f'format = "{FORMAT}"\n[d]\ndeep = {text}\n')
    (message,) = [e for _, _, e in load_results(path).entry_errors]
    assert "MAX_DEPTH" in message and message.startswith(f"{path}:3:")


# --------------------------------------------------------------- tampering: one entry, one error

TAMPERED = [
    # (replace this, with this, line:column of the error, message fragment)
    ('a = "j*(j + 1)"', "a = \"__import__('os')\"", "5:6", "not in the grammar"),
    ('a = "j*(j + 1)"', 'a = "().__class__"', "5:7", "not in the grammar"),
    ('a = "j*(j + 1)"', 'a = "j.__class__"', "5:8", "not in the grammar"),
    ('a = "j*(j + 1)"', 'a = "eval(j)"', "5:6", "function name=… must be one of ["),
    ('a = "j*(j + 1)"', 'a = "2^2^2^5"', "5:6", "exponent=4294967296"),
    ('a = "j*(j + 1)"', 'a = "72.2.2"', "5:10", "unexpected character"),
    ('b = "sqrt(2)/2 - I*m"', "b = 'single quotes'", "6:5", "expected a value"),
    ('b = "sqrt(2)/2 - I*m"', "b = [\"1\"]", "6:5", "a bare array has no kind"),
    ('b = "sqrt(2)/2 - I*m"', 'b = { list = ["1"] }', "6:7", "tuple, matrix, basis_matrix, dict"),
    ('b = "sqrt(2)/2 - I*m"', 'b = "1" "2"', "6:9", "the end of the line"),
    ('b = "sqrt(2)/2 - I*m"', 'a = "j"', "6:1", "must appear only once (also on line 5)"),
    ('c = "Jz(J)^2"', 'c = "x\\u0022"', "9:7", 'the closing " of the string'),
    ('c = "Jz(J)^2"', 'c = { matrix = [\n  ["1", "2"],\n  ["3"],\n] }', "9:16",
     "rows of equal, nonzero length"),
    ('c = "Jz(J)^2"', 'c = { tuple = [\n  "1", "2",\n', "12:1", "expected"),
    ('c = "Jz(J)^2"', 'c = "Jz(J)^2\nd = "1"', "9:13", 'the closing " of the string on'),
]


@pytest.mark.parametrize(("old", "new", "place", "fragment"), TAMPERED)
def test_a_tampered_entry_is_one_error_with_file_line_and_column(tmp_path, old, new, place,
                                                                 fragment):
    assert old in GOOD
    path = write(tmp_path, GOOD.replace(old, new))
    loaded = load_results(path)                     # the file as a whole still loads
    key = new.split(" ", 1)[0]
    section = "second" if key == "c" else "first"
    entry = loaded[section][key]
    with pytest.raises(StoredResultError) as info:
        entry.value
    message = str(info.value)
    assert message.startswith(f"{path}:{place}: "), message
    assert fragment in message
    # the other entries are unaffected
    others = [e for s in loaded.values() for k, e in s.items() if (s is not loaded[section]
                                                                   or k != key)]
    assert others and all(e.error is None for e in others)
    with pytest.raises(StoredResultError, match=str(path)):
        load_results(path, strict=True)


@pytest.mark.parametrize(("old", "new", "place", "fragment"), [
    ("[second]", "[first]", "8:2", "section [first] must appear only once"),
    ("[second]", "[not valid]", "8:1", "expected a comment, a [section] or an entry"),
    ("[second]", "second", "8:1", "expected a comment"),
])
def test_problems_outside_entries_are_listed_not_fatal(tmp_path, old, new, place, fragment):
    path = write(tmp_path, GOOD.replace(old, new))
    loaded = load_results(path)
    (problem,) = loaded.problems
    assert problem.startswith(f"{path}:{place}: ") and fragment in problem
    assert loaded["first"]["a"].value == j*(j + 1)
    with pytest.raises(StoredResultError, match="expected a comment|only once"):
        load_results(path, strict=True)


@pytest.mark.parametrize(("text", "fragment"), [
    (GOOD.replace(f'format = "{FORMAT}"', 'format = "amalgebra-results-0"'), ":2:10: format must be"),
    (GOOD.replace(f'format = "{FORMAT}"', ""), ":4:1: the format line"),
    ("# nothing\n", ":1: the file must declare format"),
    ('x = "1"\n', ":1:1: the file must begin with format|only the format line"),
    (f'format = "{FORMAT}"\nformat = "{FORMAT}"\n', ":2:1: only the format line"),
    ("format = amalgebra\n", ":1:10: expected"),
])
def test_a_file_without_a_valid_format_line_is_refused(tmp_path, text, fragment):
    path = write(tmp_path, text)
    with pytest.raises(StoredResultError, match=fragment) as info:
        load_results(path)
    assert str(info.value).startswith(str(path))


def test_bad_encoding_names_the_line_not_the_bytes(tmp_path):
    path = tmp_path / "deriv_f.results.toml"
    path.write_bytes(f'format = "{FORMAT}"\n[d]\nx = "\xff"\n'.encode("latin-1"))
    with pytest.raises(StoredResultError, match=r":3: must be UTF-8 text \(invalid byte at "
                                                r"offset \d+\)$"):
        load_results(path)


@pytest.mark.parametrize("bad", [
    f'{SECRET} = 1 + ',
    f'x = "{SECRET}.__class__"',
    f'x = "{SECRET}"(',
    f'[{SECRET} {SECRET}]',
    f'x = {{ tuple = ["{SECRET}" "{SECRET}"] }}',
    f'x = "eval({SECRET})"',
    f'x = "{SECRET}^{SECRET}^2^2^2^5"',
    f'x = "__{SECRET}"',
    f"x = '{SECRET}'",
    f'x = "Jz({SECRET} + 1)"',
    f'x = "ket(1/3, {SECRET}, J)"',
    f'x = "ket(1/3, 0, {SECRET})"',
    f'x = "KroneckerDelta({SECRET})"',
])
def test_messages_never_quote_the_file(tmp_path, bad):
    path = write(tmp_path, f'format = "{FORMAT}"\n[d]\n{bad}\n')
    loaded = load_results(path)
    messages = list(loaded.problems) + [e for _, _, e in loaded.entry_errors]
    for entry in loaded.get("d", {}).values():
        try:
            entry.value
        except StoredResultError as exc:
            messages.append(str(exc))
    assert messages, "the malformed line must be reported"
    for message in messages:
        assert SECRET not in message and message.startswith(f"{path}:3:")
    # and a file without a format line: the first line of a system file is never echoed
    path = write(tmp_path, f"root:{SECRET}:0:0\n", "deriv_u.results.toml")
    with pytest.raises(StoredResultError) as info:
        load_results(path)
    assert SECRET not in str(info.value)


# --------------------------------------------------------------- hostile files

def _load_within(path, seconds=30):
    """load_results in a thread: a blocking open or an endless read fails the test."""
    box = {}

    def run():
        try:
            box["value"] = load_results(path)
        except BaseException as exc:  # noqa: BLE001 - handed back to the test
            box["error"] = exc

    worker = threading.Thread(target=run, daemon=True)
    worker.start()
    worker.join(seconds)
    assert not worker.is_alive(), f"load_results({path}) blocked"
    if "error" in box:
        raise box["error"]
    return box["value"]


@pytest.mark.skipif(not hasattr(os, "symlink"), reason="needs symbolic links")
def test_a_symbolic_link_is_never_read(tmp_path):
    target = write(tmp_path, GOOD, "elsewhere.toml")
    link = tmp_path / "deriv_l.results.toml"
    link.symlink_to(target)
    with pytest.raises(StoredResultError, match="is a symbolic link"):
        _load_within(link)
    dangling = tmp_path / "deriv_d.results.toml"
    dangling.symlink_to(tmp_path / "missing.toml")
    with pytest.raises(StoredResultError, match="is a symbolic link"):
        _load_within(dangling)


@pytest.mark.skipif(not hasattr(os, "symlink") or not os.path.exists("/dev/zero"),
                    reason="needs /dev/zero and symbolic links")
def test_a_link_to_dev_zero_and_the_device_itself_are_refused(tmp_path):
    link = tmp_path / "deriv_z.results.toml"
    link.symlink_to("/dev/zero")
    with pytest.raises(StoredResultError, match="is a symbolic link"):
        _load_within(link)
    with pytest.raises(StoredResultError, match="is a character device"):
        _load_within("/dev/zero")


@pytest.mark.skipif(not hasattr(os, "mkfifo"), reason="needs FIFOs")
def test_a_fifo_is_refused_without_blocking(tmp_path):
    fifo = tmp_path / "deriv_p.results.toml"
    os.mkfifo(fifo)
    with pytest.raises(StoredResultError, match="is a FIFO; stored results must be a regular"):
        _load_within(fifo)


def test_a_directory_is_a_typed_error(tmp_path):
    folder = tmp_path / "deriv_x.results.toml"
    folder.mkdir()
    with pytest.raises(StoredResultError, match="is a directory"):
        _load_within(folder)
    with pytest.raises(StoredResultError, match="is a directory; not written"):
        write_results(folder, {"d": {"x": j}})


def test_the_byte_cap_holds_before_parsing(tmp_path):
    path = write(tmp_path, GOOD)
    with pytest.raises(StoredResultError, match="must be at most MAX_BYTES=50 bytes"):
        load_results(path, max_bytes=50)


@pytest.mark.skipif(not hasattr(os, "symlink"), reason="needs symbolic links")
def test_writing_never_goes_through_a_link(tmp_path):
    victim = write(tmp_path, "precious\n", "victim.txt")
    link = tmp_path / "deriv_w.results.toml"
    link.symlink_to(victim)
    with pytest.raises(StoredResultError, match="is a symbolic link; not written"):
        write_results(link, {"d": {"x": j}})
    assert victim.read_text() == "precious\n" and link.is_symlink()
    assert sorted(p.name for p in tmp_path.iterdir()) == ["deriv_w.results.toml", "victim.txt"]


def test_writing_is_atomic_and_keeps_the_mode(tmp_path):
    path = write(tmp_path, GOOD)
    os.chmod(path, 0o640)
    before = os.stat(path).st_ino
    write_results(path, {"d": {"x": j}})
    assert os.stat(path).st_ino != before                  # a new file renamed into place
    assert stat.S_IMODE(os.stat(path).st_mode) == 0o640
    assert [p.name for p in tmp_path.iterdir()] == [path.name]  # no temporary file left
    assert load_results(path, strict=True)["d"]["x"].value == j


# --------------------------------------------------------------- fuzzing the loader

def _check_loader(path):
    start = time.monotonic()
    try:
        loaded = load_results(path)
    except StoredResultError:
        loaded = None
    if loaded is not None:
        for entries in loaded.values():
            for entry in entries.values():
                try:
                    entry.value
                except StoredResultError:
                    pass
    assert time.monotonic() - start < 20   # a hang guard, not a speed test


@given(st.binary(max_size=400))
def test_random_bytes_give_a_typed_error_or_a_value(tmp_path_factory, data):
    path = tmp_path_factory.mktemp("fuzz") / "deriv_f.results.toml"
    path.write_bytes(data)
    _check_loader(path)


_PIECES = st.sampled_from([
    f'format = "{FORMAT}"', "[d]", "[e]", 'x = "j + 1"', "y = 72.5", 'z = { tuple = ["1", ',
    '"2"] }', "{ matrix = [", '["a", "b"],', "] }", "{ dict = { a = ", '"2^2^2^5"', "#", "=",
    '"', "[", "]", "{", "}", ",", "\n", " ", "\t", "\r\n", "w = ", "__class__", "((((", "ket(1, 0, J)",
    "9" * 120, "-", ".", "é", "\x00",
])


@given(st.lists(_PIECES, max_size=40))
def test_random_small_files_give_a_typed_error_or_a_value(tmp_path_factory, pieces):
    path = tmp_path_factory.mktemp("fuzz") / "deriv_f.results.toml"
    path.write_text(f'format = "{FORMAT}"\n[d]\n' + "".join(pieces), encoding="utf-8")
    _check_loader(path)


def test_results_of_the_record_api_refuse_unstorable_values_with_parse_error():
    # Steps.result wraps the store's refusal in a ParseError naming the result
    from amalgebra.derivations import derivation

    @derivation
    def floating(d):
        d.result("approx", (Rational(1, 2), 0.5))

    assert isinstance(floating.run().error, ParseError)


_LEAVES = st.one_of(
    st.integers(-10**6, 10**6),
    st.builds(Rational, st.integers(-10**9, 10**9), st.sampled_from([1, 2, 3, 8, 125, 1000, 4096])),
    st.builds(lambda c, s: c*s, st.integers(-5, 5), st.sampled_from([j, m, A, sqrt(2)*j])),
)
_VALUES = st.recursive(
    _LEAVES,
    lambda inner: st.one_of(
        st.lists(inner, max_size=3).map(tuple),
        st.dictionaries(st.sampled_from(["up", "down", "x1"]), inner, min_size=1, max_size=3),
        st.dictionaries(_LEAVES, inner, max_size=3),
        st.integers(1, 3).flatmap(lambda r: st.lists(_LEAVES, min_size=r * 2, max_size=r * 2)
                                  .map(lambda xs, r=r: ImmutableMatrix(r, 2, xs))),
    ),
    max_leaves=8,
)


@given(_VALUES)
def test_every_storable_value_round_trips(tmp_path_factory, value):
    path = tmp_path_factory.mktemp("rt") / "deriv_r.results.toml"
    write_results(path, {"d": {"v": value}})
    text = path.read_text()
    tomllib.loads(text)                                   # valid TOML, whatever the value
    got = load_results(path, strict=True)["d"]["v"].value
    assert got == (value if not isinstance(value, int) else Rational(value))


def test_crlf_line_endings_are_read(tmp_path):
    path = tmp_path / "deriv_c.results.toml"
    path.write_bytes(GOOD.replace("\n", "\r\n").encode()
                     + b'm = { matrix = [\r\n  ["1", "2"],\r\n] }\r\n')
    loaded = load_results(path, strict=True)
    assert loaded["first"]["b"].value == sqrt(2)/2 - I*m
    assert loaded["second"]["m"].value == Matrix([[1, 2]])
