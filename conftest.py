"""Repository-wide pytest configuration: the slow-check flag and hypothesis profiles."""

import os

import pytest

try:
    from hypothesis import HealthCheck, settings

    settings.register_profile("default", deadline=None)
    settings.register_profile(
        "ci", deadline=None, derandomize=True, suppress_health_check=[HealthCheck.too_slow]
    )
    settings.register_profile("fuzz", deadline=None, max_examples=2000)
    settings.load_profile(os.environ.get("HYPOTHESIS_PROFILE", "ci" if os.environ.get("CI") else "default"))
except ImportError:  # hypothesis is a test extra
    pass


def pytest_addoption(parser):
    parser.addoption("--run-slow", action="store_true", default=False,
                     help="also run checks marked slow (large-j sweeps, long fuzzing)")


def pytest_collection_modifyitems(config, items):
    if config.getoption("--run-slow"):
        return
    skip = pytest.mark.skip(reason="slow check: run with --run-slow")
    for item in items:
        if "slow" in item.keywords:
            item.add_marker(skip)


def pytest_report_header(config):
    import sympy
    from sympy.external.gmpy import GROUND_TYPES

    import amalgebra

    return (f"amalgebra {amalgebra.__version__}, sympy {sympy.__version__} "
            f"(ground types {GROUND_TYPES}), PYTHONHASHSEED={os.environ.get('PYTHONHASHSEED', 'unset')}")
