"""Shared fixtures of the coupling tests."""

import pytest

from amalgebra.coupling import kernels


@pytest.fixture(scope="module")
def python_kernels_only():
    """Every kernel call of the module runs the pure-Python kernel (the compiled one's table set to empty)."""
    saved = kernels._COMPILED_TOP, kernels._COMPILED_TOP_DOUBLED
    kernels._COMPILED_TOP = kernels._COMPILED_TOP_DOUBLED = -1
    yield
    kernels._COMPILED_TOP, kernels._COMPILED_TOP_DOUBLED = saved
