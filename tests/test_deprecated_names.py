"""The former names of the coupling-symbol classes: importable, deprecated, the same classes (issue 15)."""

import importlib
import pickle
import warnings

import pytest

from amalgebra.coupling.symbols import Coupling3j, Coupling6j, Coupling9j, CouplingBracket

RENAMED = [
    ("ClebschGordanSymbol", CouplingBracket),
    ("ThreeJSymbol",        Coupling3j),
    ("SixJSymbol",          Coupling6j),
    ("NineJSymbol",         Coupling9j),
]


@pytest.mark.parametrize("module", ["amalgebra", "amalgebra.coupling", "amalgebra.coupling.symbols"])
@pytest.mark.parametrize(("old", "new"), RENAMED)
def test_old_name_warns_naming_the_version_and_the_replacement(module, old, new):
    mod = importlib.import_module(module)
    with pytest.warns(DeprecationWarning, match=rf"{old} is deprecated since amalgebra 0\.2\.0; use {new.__name__}"):
        cls = getattr(mod, old)
    assert cls is new


@pytest.mark.parametrize(("old", "new"), RENAMED)
def test_old_names_are_not_public(old, new):
    import amalgebra
    import amalgebra.coupling
    import amalgebra.coupling.symbols

    for mod in (amalgebra, amalgebra.coupling, amalgebra.coupling.symbols):
        assert old not in mod.__all__ and new.__name__ in mod.__all__


def test_a_pickle_made_with_an_old_name_still_loads():
    obj = Coupling3j(1, 1, 0, 0, 0, 0)
    old = pickle.dumps(obj, protocol=2).replace(b"Coupling3j", b"ThreeJSymbol")
    assert b"ThreeJSymbol" in old
    with pytest.warns(DeprecationWarning, match="use Coupling3j"):
        assert pickle.loads(old) == obj


def test_new_names_do_not_warn():
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        import amalgebra

        assert amalgebra.Coupling6j(1, 1, 1, 1, 1, 1).doit() != 0


def test_unknown_names_still_raise_attribute_error():
    import amalgebra.coupling.symbols as symbols

    with pytest.raises(AttributeError):
        symbols.FourJSymbol  # noqa: B018
