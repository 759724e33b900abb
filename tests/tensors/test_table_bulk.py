"""The reduced-element table built from the kernels' integers equals the generic SymPy construction.

Source of the reference: SymPy arithmetic on the library's 9j values,
``sqrt((2J+1)(2J'+1)(2k+1)) * ninej(...)`` (Edmonds eq. 7.1.5), times the reduced-element symbols;
the 9j values themselves are checked against the numpy oracle in ``tests/coupling``.
"""

from sympy import Rational, sqrt

from amalgebra.coupling import ninej
from amalgebra.tensors.wigner_eckart import ReducedMatrixElement
from amalgebra.tensors.coupled_schemes import tensor_product_table

JS = [Rational(n, 2) for n in range(7)]


def test_table_entries_are_the_generic_expressions():
    table = tensor_product_table(JS, JS, 2, 2, range(5))
    symbolic = tensor_product_table(JS, JS, 2, 2, range(5), symbolic=True)
    assert len(table) == len(symbolic) == 12773   # the entry count stated in issue 16 (common practice, no source)
    checked = nonzero = 0
    for key in list(table)[::3]:
        j1p, j2p, Jp, j1, j2, J, k = key
        generic = sqrt((2 * J + 1) * (2 * Jp + 1) * (2 * k + 1)) * ninej(j1p, j1, 2, j2p, j2, 2, Jp, J, k)
        with_symbols = generic * ReducedMatrixElement("T", 2, j1p, j1) * ReducedMatrixElement("U", 2, j2p, j2)
        assert table[key] == generic and table[key].args == generic.args
        assert symbolic[key] == with_symbols and symbolic[key].args == with_symbols.args
        checked += 1
        nonzero += generic != 0
    assert checked > 4000 and nonzero > 3500


def test_a_rank_that_breaks_the_k1_k2_triangle_gives_zeros():
    # [T^1 x U^1]^k vanishes for k = 3 (triangle (1 1 3) fails): common practice, no source
    table = tensor_product_table([1], [1], 1, 1, [3])
    assert table and all(v == 0 for v in table.values())
