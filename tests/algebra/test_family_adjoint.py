"""adjoint/conjugate/transpose of an operator family: a typed error naming a component (issue 11, bad input)."""

import re

import pytest
from sympy import adjoint, conjugate, transpose

from amalgebra.algebra import AngularMomentum
from amalgebra.bosons import BosonMode
from amalgebra.errors import OperatorError
from amalgebra.tensors import SphericalTensor, VectorOperator, racah_tensor

FAMILIES = [(AngularMomentum("J"), "J.plus"), (BosonMode("c"), "c.create"),
            (SphericalTensor("T", 2, "L"), "T[0]"), (racah_tensor(1), "C[0]"),
            (VectorOperator("r", "L"), "r.x")]


@pytest.mark.parametrize("family, component", FAMILIES, ids=lambda x: str(x))
@pytest.mark.parametrize("func", [adjoint, conjugate, transpose], ids=lambda f: f.__name__)
def test_a_family_is_not_an_operator(family, component, func):
    with pytest.raises(OperatorError, match=rf"{func.__name__} of .*not an operator.*{re.escape(component)}"):
        func(family)


def test_components_still_have_their_adjoints():
    # J+^dagger = J-, a^dagger of the annihilator is the creator (common practice, no source)
    J, c = AngularMomentum("J"), BosonMode("c")
    assert adjoint(J.plus) == J.minus and adjoint(c.annihilate) == c.create
