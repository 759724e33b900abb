"""Helpers for testing code built on amalgebra (hypothesis strategies).

Importing :mod:`amalgebra.testing.strategies` needs ``hypothesis`` (a test extra).
"""

__all__ = []
