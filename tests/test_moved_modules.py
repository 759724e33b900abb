"""The modules moved into subject packages in 0.2.0 stay importable from their old paths, with a warning."""

import importlib
import sys

import pytest

MOVED = [
    ("amalgebra.rotations_series", "amalgebra.rotations.series"),
    ("amalgebra.rotations_actions", "amalgebra.rotations.actions"),
    ("amalgebra.harmonics", "amalgebra.rotations.harmonics"),
    ("amalgebra.numeric", "amalgebra.matrices.explicit"),
    ("amalgebra.multiplet_matrices", "amalgebra.matrices.multiplets"),
    ("amalgebra.reduced", "amalgebra.tensors.wigner_eckart"),
]


@pytest.mark.parametrize("old, new", MOVED)
def test_old_path_warns_and_gives_the_same_objects(old, new):
    sys.modules.pop(old, None)
    with pytest.warns(DeprecationWarning, match=new.replace(".", "[.]")):
        shim = importlib.import_module(old)
    target = importlib.import_module(new)
    assert shim.__all__ == target.__all__ and target.__all__
    for name in target.__all__:
        assert getattr(shim, name) is getattr(target, name)


def test_rotations_package_keeps_the_old_names():
    import amalgebra.rotations as rotations
    from amalgebra.rotations import wigner

    for name in wigner.__all__:
        assert getattr(rotations, name) is getattr(wigner, name)
