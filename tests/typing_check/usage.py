"""Typed use of the public API, checked by ``mypy --strict`` (tests/test_typing.py, CI).

Nothing here runs at import; ``check_all()`` runs the same calls (tests/test_typing.py calls it),
so the sample is also proved to be valid at run time.
"""

from fractions import Fraction

import amalgebra as am


def coupling_values() -> tuple[float, float, str, bool]:
    exact = am.cg(1, 0, "1/2", "1/2", "3/2", "1/2")
    rounded: float = am.cg_float(1, 0, Fraction(1, 2), Fraction(1, 2), Fraction(3, 2), Fraction(1, 2))
    six: float = am.sixj_float(1, 1, 1, 1, 1, 1)
    backend: str = am.kernel_backend()
    allowed: bool = am.triangle(1, 1, 2)
    am.clear_coupling_caches()
    return float(exact) - rounded, six, backend, allowed


def states_and_operators() -> bool:
    J = am.AngularMomentum("J")
    ket: am.Ket = am.ket(1, 0, "J")
    bra: am.Bra = am.bra(1, 0, "J")
    value = am.matrix_element(bra, J.z ** 2 + J.x, ket)
    check = am.verify_identity(J.plus * J.minus, J.squared - J.z ** 2 + J.z, {"J": [1]})
    return bool(check.holds) and value == am.inner(bra, am.apply(J.z ** 2 + J.x, ket))


def results() -> int:
    table = am.element_table("1/2", 1, "1/2")
    U, uncoupled, coupled = am.coupling_matrix(["1/2", "1/2"], ("A", "B"))
    parts = am.decompose(am.AngularMomentum("J").z)
    text: str = am.to_text(am.parse("sin(pi/6) + 1"))
    return len(table) + len(uncoupled) + len(coupled) + len(parts) + len(text) + int(U.shape[0])


def check_all() -> bool:
    difference, six, backend, allowed = coupling_values()
    return (abs(difference) < 1e-15 and six == 1 / 6 and backend != ""
            and allowed and states_and_operators() and results() > 0)
