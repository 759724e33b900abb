"""Tests that need an outside tool (pdflatex, node with KaTeX): skip locally, fail in CI.

Under ``CI=true`` (as ``.ci/run`` is run) a missing tool is a test failure, so a
broken install step cannot pass unseen; on a developer's machine the test is
skipped with the install hint.  Needs ``pytest``.

>>> in_ci() in (True, False)
True
"""

import os

__all__ = ["in_ci", "require_tool"]


def in_ci():
    """True when the environment says this is a CI run (``CI`` set to 1/true/yes)."""
    return os.environ.get("CI", "").lower() in ("1", "true", "yes")


def require_tool(present, what):
    """Skip the calling test when ``present`` is falsy; fail instead under CI."""
    import pytest

    if not present:
        if in_ci():
            pytest.fail(f"{what} is required under CI=true but missing")
        pytest.skip(f"{what} not installed")
