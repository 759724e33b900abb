r"""Integer kernels for the coupling coefficients: Racah sums on prime-factorised factorials.

Explanation
===========

Nothing here imports SymPy and nothing validates: arguments are *doubled*
angular momenta (``2j``, ``2m``) as Python ints that already obey every
selection rule.  Each kernel returns an exact value as a triple
``(n, d, s)`` of Python ints meaning

.. math:: n / d \cdot \sqrt{s}, \qquad d > 0,\ \gcd(n, d) = 1,\ s \ge 1 \text{ squarefree},

the canonical form of a number whose square is rational (``(0, 1, 1)`` is zero).

How the square root is split without factorising anything large: every
factorial enters as its exponent vector over the primes (Legendre's formula),
*packed* into one Python int ``sum_i e_i 2^(32 i)`` (signed digits are fine:
the packing is a ring homomorphism, so adding packed vectors adds exponent
vectors exactly).  The radicand of each symbol is a pure product of
factorials, hence known in factorised form; the Racah sum itself is computed as
one integer ``P`` (a Horner scheme on the ratio of consecutive terms, no
division) whose denominator is again a product of factorials.  Only ``P`` stays
unfactorised, and it stays outside the square root.

Tables.  The primes and the packed vectors of ``n!`` are pure functions of
``n``; they grow on demand and are kept for the life of the process (clearing
the *value* caches, :func:`amalgebra.coupling.clear_coupling_caches`, leaves
them alone).  :func:`clear_tables` releases their memory.  Thread safety: the
tables live in one object; growth only appends (serialised by a lock) and
:func:`clear_tables` swaps in a fresh object, so a kernel that took the tables
at its start keeps a consistent view while other threads grow or clear them.

Compiled kernels: when the optional extension ``amalgebra.coupling._racah6j``
(C with GMP, built at install time when a compiler and the GMP headers are
present) is importable, :func:`threej_kernel`, :func:`sixj_kernel_sorted` and
:func:`ninej_kernel` run there for factorial arguments up to its table limit
(4096); otherwise, and above the limit, the pure-Python kernels (``*_python``)
run.  The 3j and 6j algorithms are the same on both sides; the 9j in C sums the
three 6j afresh for every ``x``, the pure-Python 9j runs a recurrence in ``x``
(:func:`ninej_kernel_python`).  Both return identical triples, the canonical
form being unique (tested).
:func:`kernel_backend` says which one is active; ``AMALGEBRA_PURE_PYTHON=1`` in
the environment (read at import) disables the compiled kernel.  When the
extension is missing without that request, the first evaluation warns once
(:class:`KernelFallbackWarning`).

References
==========

.. [1] G. Racah, Phys. Rev. 62, 438 (1942) (the single-sum formulas).
.. [2] A. R. Edmonds, *Angular Momentum in Quantum Mechanics* (1957), eqs. 3.7.3, 6.3.7, 6.4.3.
"""

import os
import struct
import sys
import threading
import warnings
from itertools import accumulate, compress
from math import comb, gcd, isqrt, prod
from operator import add, eq, getitem, sub
from operator import pow as _pow  # a little faster than the builtin in map()

__all__ = [
    "KernelFallbackWarning",
    "kernel_backend",
    "clear_tables",
    "sqrt_triple",
    "multiply_sqrt",
    "threej_kernel",
    "threej_kernel_python",
    "sixj_kernel",
    "sixj_kernel_sorted",
    "sixj_kernel_sorted_python",
    "sixj_from_key_python",
    "sixj_key_plain",
    "ninej_kernel",
    "ninej_kernel_python",
    "sixj_racah_sum",
]


class KernelFallbackWarning(RuntimeWarning):
    """The compiled coupling kernel is not available and the pure-Python kernel runs instead
    (identical results, slower).  Emitted once per process, at the first evaluation.

    Examples
    ========

    To run on the pure-Python kernel without the notice, set ``AMALGEBRA_PURE_PYTHON=1``
    before importing amalgebra, or filter the category:

    >>> import warnings
    >>> from amalgebra.coupling import KernelFallbackWarning
    >>> warnings.filterwarnings("ignore", category=KernelFallbackWarning)
    >>> issubclass(KernelFallbackWarning, RuntimeWarning)
    True
    """


def _pure_python_requested():
    return os.environ.get("AMALGEBRA_PURE_PYTHON", "").lower() not in ("", "0", "false", "no")


def _load_compiled():
    if _pure_python_requested():
        return None
    try:
        from . import _racah6j
    except ImportError:  # not built (no compiler or no GMP headers at install time)
        return None
    if not hasattr(_racah6j, "ninej"):  # a stale build of an older C file: rebuild with `pip install -e .`
        return None
    return _racah6j


_compiled = _load_compiled()
_COMPILED_TOP = _compiled.TOP_LIMIT if _compiled is not None else -1
# 3j: the largest factorial argument is (tj1 + tj2 + tj3) / 2 + 1 <= TOP_LIMIT
_COMPILED_TOP_DOUBLED = 2 * _COMPILED_TOP - 1 if _compiled is not None else -1
# Warn once when the compiled kernel is missing although nobody asked for pure Python.
_fallback_pending = _compiled is None and not _pure_python_requested()


def kernel_backend():
    """Which 3j/6j/9j kernels run: ``"compiled (GMP)"``, ``"python"`` (asked for by
    ``AMALGEBRA_PURE_PYTHON=1``) or ``"python (compiled kernel not built)"`` (a fallback).

    All give identical exact results; the compiled kernels are several times faster
    (``tests/benchmarks/bench_coupling.py`` prints the figures).

    Examples
    ========

    >>> kernel_backend() in ("compiled (GMP)", "python", "python (compiled kernel not built)")
    True
    """
    if _compiled is not None:
        return "compiled (GMP)"
    return "python" if _pure_python_requested() else "python (compiled kernel not built)"


def warn_fallback_once():
    """Emit :class:`KernelFallbackWarning` the first time a symbol is evaluated without the
    compiled kernel (unless ``AMALGEBRA_PURE_PYTHON=1`` asked for that)."""
    global _fallback_pending
    if _fallback_pending:
        _fallback_pending = False
        warnings.warn("amalgebra: the compiled coupling kernel (amalgebra.coupling._racah6j) is not built, "
                      "so the pure-Python kernel runs (identical results, several times slower). Install a "
                      "published wheel, or reinstall with a C compiler and GMP's headers (Debian: libgmp-dev); "
                      "set AMALGEBRA_PURE_PYTHON=1 to choose the pure-Python kernel without this warning.",
                      KernelFallbackWarning, stacklevel=_caller_stacklevel())


def _caller_stacklevel():
    """The ``stacklevel`` that points ``warnings.warn`` (called from :func:`warn_fallback_once`) at the
    first frame outside the amalgebra package, i.e. the user's line, however deep the symbol's call chain
    (caches, symmetry reduction, Basic construction) happens to be."""
    package_dir = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
    frame = sys._getframe(2)  # the caller of warn_fallback_once
    level = 2
    while frame is not None and os.path.abspath(frame.f_code.co_filename).startswith(package_dir + os.sep):
        frame = frame.f_back
        level += 1
    return level


_FIELD = 32
_HALF = 1 << (_FIELD - 1)


class _Tables:
    """Primes, index of each prime, smallest prime factors, prime counts and packed vectors of n!.

    Every list only grows (appends, or a swap of a longer list with the same prefix, ``pi`` last),
    so a reader that checked its range once stays consistent.
    """

    __slots__ = ("primes", "index", "spf", "packs", "pi", "legendre")

    def __init__(self):
        self.primes = []
        self.index = {}
        self.spf = [0, 1]
        self.packs = [0, 0]
        self.pi = [0, 0]  # pi[n] = number of primes <= n
        self.legendre = None


_tables = _Tables()
_growth = threading.RLock()


def __getattr__(name):
    # Read-only views of the current tables, for tests and introspection.
    field = {"_primes": "primes", "_fact_pack": "packs", "_pi": "pi", "_spf": "spf",
             "_prime_index": "index"}.get(name)
    if field is None:
        raise AttributeError(f"module {__name__!r} has no attribute {name!r}")
    return getattr(_tables, field)


def clear_tables():
    """Release the prime and factorial tables (they regrow on demand), the compiled kernel's too.

    Safe while other threads evaluate: they keep the tables they started with.
    Not needed for correctness ever; clearing the value caches does not call it.
    """
    global _tables
    with _growth:
        _tables = _Tables()
        _masks_cache.clear()
        _bias.clear()
        _byte_route.clear()
        if _compiled is not None:
            _compiled.clear()


def _sieve(limit, t=None):
    """Extend the prime tables (smallest prime factors, primes, prime counts) past ``limit``."""
    t = t or _tables
    if limit < len(t.pi):
        return
    with _growth:
        if limit >= len(t.pi):
            _sieve_locked(limit, t)


def _sieve_locked(limit, t):
    size = max(limit + 1, 2 * len(t.pi), 64)
    root = isqrt(size - 1)
    spf = list(range(size))
    # Slice assignments from the largest sieving prime down, so the smallest prime factor writes last.
    flags = bytearray([1]) * (root + 1)  # primes up to root (Eratosthenes on a byte array)
    flags[:2] = b"\x00\x00"
    for p in range(2, isqrt(root) + 1):
        if flags[p]:
            flags[p * p::p] = bytes(len(range(p * p, root + 1, p)))
    for p in reversed(list(compress(range(root + 1), flags))):
        spf[p * p::p] = [p] * len(range(p * p, size, p))
    is_prime = list(map(eq, spf, range(size)))
    is_prime[0] = is_prime[1] = False
    primes = list(compress(range(size), is_prime))
    t.spf = spf
    t.primes = primes
    t.index = dict(zip(primes, range(len(primes))))
    t.pi = list(accumulate(is_prime, initial=0))[1:]


def _grow(limit, t=None):
    """Extend the dense table so that ``packs[n]`` exists for every ``n <= limit``."""
    t = t or _tables
    if limit < len(t.packs):
        return
    with _growth:
        if limit >= len(t.packs):
            _grow_locked(limit, t)


def _grow_locked(limit, t):
    target = max(limit + 1, 2 * len(t.packs), 64)
    _sieve(target - 1, t)
    spf = t.spf
    index = t.index
    units = [1 << (_FIELD * k) for k in range(t.pi[target - 1])]
    packs = t.packs
    pack = packs[-1]
    for n in range(len(packs), target):
        # the vector of n itself: small primes first, so only the last addition is a long one
        m = n
        vector = 0
        while m > 1:
            p = spf[m]
            m //= p
            vector += units[index[p]]
        pack += vector
        packs.append(pack)


class _LegendrePacks(dict):
    """Packed factorial vectors computed on demand by Legendre's formula (for large arguments,
    where a dense table would need memory quadratic in the largest argument)."""

    __slots__ = ("t",)

    def __missing__(self, n):
        t = self.t
        if n < len(t.packs):
            return t.packs[n]
        length = t.pi[n]
        exponents = []
        for p in t.primes[:length]:
            e, m = 0, n
            while m:
                m //= p
                e += m
            exponents.append(e)
        value = int.from_bytes(struct.pack(f"<{length}I", *exponents), "little")
        self[n] = value
        return value


DENSE_LIMIT = 4096
"""Largest factorial argument kept in the dense table (about 9 MB at the limit)."""


def _packs(top, t=None):
    """Indexable packed vectors of ``n!`` for every ``n <= top`` (of the tables ``t``, default current)."""
    t = t or _tables
    if top < DENSE_LIMIT:
        if top >= len(t.packs):
            _grow(top, t)
        return t.packs
    _sieve(top, t)
    packs = _LegendrePacks()
    packs.t = t
    return packs


def _unpack(packed, length):
    """Signed exponent list of the first ``length`` primes from a packed vector."""
    bias = _bias.get(length)
    if bias is None:
        bias = int.from_bytes(b"\x00\x00\x00\x80" * length, "little")
        _bias[length] = bias
    raw = struct.unpack(f"<{length}I", (packed + bias).to_bytes(4 * length, "little"))
    return [e - _HALF for e in raw]


_bias = {}


def _nprimes(limit, t=None):
    """Number of primes <= limit (tables must cover limit)."""
    return (t or _tables).pi[limit]


def _masks(length):
    """``(low, bias, half)``: bit 0, bit 31 and bit 30 set in each of ``length`` 32-bit digits."""
    masks = _masks_cache.get(length)
    if masks is None:
        low = int.from_bytes(b"\x01\x00\x00\x00" * length, "little")
        masks = _masks_cache[length] = (low, low << 31, low << 30)
    return masks


_masks_cache = {}
_DIGIT = (1 << _FIELD) - 1
# memoryview.cast reads native-endian unsigned ints; pick the 4-byte type code.
_NATIVE = sys.byteorder
_UINT32 = next(code for code in "IL" if memoryview(bytes(8)).cast(code).itemsize == 4)


def _split_square(packed, limit, factor, t=None):
    """Canonical triple of ``factor * sqrt(prod p^e)`` for a packed exponent vector.

    ``limit`` bounds every factorial argument that entered ``packed``.  The common case,
    ``|e| <= 127`` for every prime but 2, is read from one byte string: adding ``2^30`` to the
    digit of 2 and 128 to every other digit makes the digits carry-free, one mask tells
    whether every other digit stayed in ``[0, 256)``, and the low byte of each digit then maps
    through three 256-entry tables (:meth:`bytes.translate`) to the parity of ``e``, to
    ``max(e // 2, 0)`` and to ``max(-(e // 2), 0)``; the prime 2 is a shift.  Otherwise
    :func:`_split_square_wide` runs.  ``factor`` may carry primes of the vector (the final
    gcd with the denominator makes the triple canonical in any case).
    """
    if factor == 0:
        return 0, 1, 1
    t = t or _tables
    length = t.pi[limit]
    if length < 2:
        return _split_square_wide(packed, length, factor, t)
    route = _byte_route.get(length)
    if route is None:
        route = _byte_route_masks(length, t)
    bias, high, odd_primes = route
    biased = packed + bias
    if biased & high:
        return _split_square_wide(packed, length, factor, t)
    raw = biased.to_bytes(4 * length, "little")[4::4]   # e + 128 for 3, 5, 7, ...
    s = prod(compress(odd_primes, raw.translate(_ODD_TABLE).rstrip(b"\x00")))
    n = factor
    # trailing zero bytes trimmed first: the exponents above 1 sit on the small primes
    ups = raw.translate(_UP_TABLE).rstrip(b"\x00")
    if ups:
        n *= prod(compress(odd_primes, ups))
        more = ups.translate(_MORE_TABLE).rstrip(b"\x00")
        if more:
            n *= _power_product(more, odd_primes)
    downs = raw.translate(_DOWN_TABLE).rstrip(b"\x00")
    den = prod(compress(odd_primes, downs))
    more = downs.translate(_MORE_TABLE).rstrip(b"\x00")
    if more:
        den *= _power_product(more, odd_primes)
    e2 = (biased & _DIGIT) - _HALF_DIGIT
    if e2 & 1:
        s <<= 1
    e2 >>= 1
    if e2 > 0:
        n <<= e2
    elif e2 < 0:
        den <<= -e2
    return _lowest_terms(n, den, s, factor)


def _lowest_terms(n, den, s, factor):
    """The triple with ``n/den`` reduced: ``gcd(n, den) = gcd(factor, den)``, the primes of the
    square root's upper half and of ``den`` being disjoint."""
    if den != 1:
        g = gcd(factor, den)
        if g != 1:
            n //= g
            den //= g
    return n, den, s


_HALF_DIGIT = 1 << 30
# byte b of an odd prime's digit is e + 128: its parity, max(e // 2, 0), max(-(e // 2), 0);
# and for a positive exponent k, k - 1 (so that p^k = p * p^(k-1): most k are 1, and the
# product of the plain primes needs no pow)
_ODD_TABLE = bytes((b - 128) & 1 for b in range(256))
_UP_TABLE = bytes(max((b - 128) >> 1, 0) for b in range(256))
_DOWN_TABLE = bytes(max(-((b - 128) >> 1), 0) for b in range(256))
_MORE_TABLE = bytes(max(b - 1, 0) for b in range(256))
_byte_route = {}


def _first_odd_primes(count):
    found = []
    n = 3
    while len(found) < count:
        if all(n % p for p in found if p * p <= n):
            found.append(n)
        n += 2
    return found


# p^k for the first 24 odd primes and 0 <= k < 64 (the byte route's halves are at most 64):
# the exponents above 1 sit on the small primes, and a table row beats pow() there
_POWER_ROWS = [[p ** k for k in range(64)] for p in _first_odd_primes(24)]


def _power_product(exponents, odd_primes):
    """``prod p^k`` over the odd primes for a byte string of exponents ``k < 64``."""
    if len(exponents) <= 24:
        return prod(map(getitem, _POWER_ROWS, exponents))
    tail = exponents[24:]
    return (prod(map(getitem, _POWER_ROWS, exponents))
            * prod(map(_pow, compress(odd_primes[24:], tail), filter(None, tail))))


def _byte_route_masks(length, t):
    """``(bias, high, odd_primes)`` of the byte route: 2^30 in the digit of 2 and 128 in the others;
    bits 8-31 of every digit but the first; the odd primes among the first ``length`` (a pure
    function of ``length``, so kept when the tables are cleared or swapped)."""
    low = int.from_bytes(b"\x01\x00\x00\x00" * length, "little")
    route = _byte_route[length] = (128 * low - 128 + _HALF_DIGIT, (low - 1) * 0xFFFFFF00,
                                   tuple(t.primes[1:length]))
    return route


def _split_square_wide(packed, length, factor, t):
    """:func:`_split_square` for any exponents, on all digits at once: adding ``2^31`` to each
    digit makes them carry-free, so the low bit of each digit is the parity of ``e`` (the
    squarefree part is the product of the primes with a set bit), and after subtracting the
    parities and halving, bit 30 of each digit tells the sign of ``e // 2``; positive and
    negative halves are then separated by digit masks and read back as plain byte arrays."""
    if not length:
        return factor, 1, 1
    low, bias, half = _masks(length)
    size = 4 * length
    primes = t.primes
    biased = packed + bias
    odd = biased & low
    s = prod(compress(primes, odd.to_bytes(size, "little")[::4]))
    digits = (biased - odd) >> 1              # each digit is e // 2 + 2^30
    sign = digits & half                      # bit 30 set where e // 2 >= 0
    upper = digits & ((sign >> 30) * _DIGIT)  # the digits with e // 2 >= 0
    n = factor
    ups = upper - sign
    if ups:  # often none: large-j radicands are mostly small
        ups = memoryview(ups.to_bytes(size, _NATIVE)).cast(_UINT32).tolist()
        n *= prod(map(_pow, compress(primes, ups), filter(None, ups)))
    downs = memoryview(((half ^ sign) - (digits ^ upper)).to_bytes(size, _NATIVE)).cast(_UINT32).tolist()
    den = prod(map(_pow, compress(primes, downs), filter(None, downs)))
    return _lowest_terms(n, den, s, factor)


def _squarefree_small(n):
    """``(u, v)`` with ``n = u^2 v`` and ``v`` squarefree, for a small positive int."""
    t = _tables
    if n >= len(t.spf):
        _sieve(n, t)
    spf = t.spf
    u = v = 1
    while n > 1:
        p = spf[n]
        e = 0
        while n % p == 0:
            n //= p
            e += 1
        u *= p ** (e >> 1)
        if e & 1:
            v *= p
    return u, v


def sqrt_triple(n):
    """Canonical triple of ``sqrt(n)`` for a small positive int ``n``."""
    u, v = _squarefree_small(n)
    return u, 1, v


def multiply_sqrt(triple, k):
    """Canonical triple of ``triple * sqrt(k)`` for a small positive int ``k``."""
    n, d, s = triple
    if n == 0:
        return triple
    g = gcd(s, k)
    u, v = _squarefree_small(k // g)
    n *= g * u
    s = (s // g) * v
    h = gcd(n, d)
    return n // h, d // h, s


def threej_kernel(tj1, tj2, tj3, tm1, tm2, tm3):
    """The 3j symbol (Racah's formula) as a canonical triple; selection rules assumed.

    Runs the compiled kernel when it is available and the largest factorial
    argument is within its table, else :func:`threej_kernel_python`.

    >>> threej_kernel(2, 2, 0, 2, -2, 0)       # (1 1 0; 1 -1 0) = 1/sqrt(3)
    (1, 3, 3)
    """
    if tj1 + tj2 + tj3 < _COMPILED_TOP_DOUBLED:
        return _compiled.threej(tj1, tj2, tj3, tm1, tm2, tm3)
    return threej_kernel_python(tj1, tj2, tj3, tm1, tm2, tm3)


def threej_kernel_python(tj1, tj2, tj3, tm1, tm2, tm3):
    """The pure-Python :func:`threej_kernel` (the reference for the compiled kernel)."""
    t = _tables
    big = (tj1 + tj2 + tj3) // 2 + 1
    fp = _packs(big, t)
    b1 = (tj1 + tj2 - tj3) // 2
    b2 = (tj1 - tm1) // 2
    b3 = (tj2 + tm2) // 2
    c1 = (tj3 - tj2 + tm1) // 2
    c2 = (tj3 - tj1 - tm2) // 2
    kmin = max(0, -c1, -c2)
    kmax = min(b1, b2, b3)
    if kmin > kmax:
        return 0, 1, 1
    p = q = 1
    for k in range(kmax - 1, kmin - 1, -1):
        q *= (k + 1) * (c1 + k + 1) * (c2 + k + 1)
        p = q - (b1 - k) * (b2 - k) * (b3 - k) * p
    if p == 0:
        return 0, 1, 1
    packed = (fp[b1] + fp[(tj1 - tj2 + tj3) // 2] + fp[(tj2 + tj3 - tj1) // 2] - fp[big]
              + fp[b2] + fp[(tj1 + tm1) // 2] + fp[(tj2 - tm2) // 2] + fp[b3]
              + fp[(tj3 - tm3) // 2] + fp[(tj3 + tm3) // 2]
              - 2 * (fp[kmax] + fp[c1 + kmax] + fp[c2 + kmax]
                     + fp[b1 - kmin] + fp[b2 - kmin] + fp[b3 - kmin]))
    if ((tj1 - tj2 - tm3) // 2 + kmin) & 1:
        p = -p
    return _split_square(packed, big, p, t)


def sixj_racah_sum(alpha, beta, fp=None):
    """Racah's 6j sum as ``(P, packed)`` meaning ``P * prod p^e``.

    ``alpha`` are the four triad sums, ``beta`` the three sums of four j's
    (plain ints); the sum is over ``t`` of
    ``(-1)^t (t+1)! / (prod (t - alpha_i)! prod (beta_j - t)!)``.  ``fp`` holds the
    packed vectors of ``n!`` up to ``max(beta) + 1`` (the current dense table by
    default, which the caller must have grown).
    """
    if fp is None:
        fp = _tables.packs
    a1, a2, a3, a4 = alpha
    e1, e2, e3 = beta
    t0 = max(alpha)
    t1 = min(beta)
    p = q = 1
    for t in range(t1 - 1, t0 - 1, -1):
        q *= (t + 1 - a1) * (t + 1 - a2) * (t + 1 - a3) * (t + 1 - a4)
        p = q - (t + 2) * (e1 - t) * (e2 - t) * (e3 - t) * p
    packed = (fp[t0 + 1] - fp[t1 - a1] - fp[t1 - a2] - fp[t1 - a3] - fp[t1 - a4]
              - fp[e1 - t0] - fp[e2 - t0] - fp[e3 - t0])
    return (-p if t0 & 1 else p), packed


def _delta_pack(fp, x, y, z):
    """Packed vector of the triangle coefficient Delta(x y z) from doubled values."""
    return (fp[(x + y - z) // 2] + fp[(x - y + z) // 2] + fp[(y + z - x) // 2]
            - fp[(x + y + z) // 2 + 1])


def sixj_kernel(alpha, beta):
    """The 6j symbol from its triad sums ``alpha`` and quadruple sums ``beta``.

    Every triangle rule is assumed; the value depends on the multisets only
    (the 144 classical and Regge symmetries).  With ``alpha`` and ``beta``
    sorted, ``t0 = a4`` and ``t1 = e1``, so in the radicand (the Racah sum's
    denominator squared times the four triangle coefficients) every factorial
    is one of the twelve ``(e_j - a_i)!`` or an ``(a_i + 1)!``; the exponent
    vector is summed with those multiplicities directly.
    """
    return sixj_kernel_sorted(*sorted(alpha), *sorted(beta))


def sixj_kernel_sorted(a1, a2, a3, a4, e1, e2, e3):
    """:func:`sixj_kernel` for ``a1 <= a2 <= a3 <= a4`` and ``e1 <= e2 <= e3`` (the canonical key).

    Runs the compiled kernel when it is available and ``e3 + 1`` is within its
    table, else :func:`sixj_kernel_sorted_python`.

    >>> sixj_kernel_sorted(3, 3, 3, 3, 4, 4, 4)      # {1 1 1; 1 1 1} = 1/6
    (1, 6, 1)
    """
    if e3 < _COMPILED_TOP:
        return _compiled.sixj_sorted(a1, a2, a3, a4, e1, e2, e3)
    return sixj_kernel_sorted_python(a1, a2, a3, a4, e1, e2, e3)


def sixj_kernel_sorted_python(a1, a2, a3, a4, e1, e2, e3):
    """The pure-Python :func:`sixj_kernel_sorted` (the reference for the compiled kernel)."""
    return sixj_from_key_python((a1, a2, a3, a4, e1, e2, e3))


def sixj_from_key_python(key):
    """:func:`sixj_kernel_sorted_python` of the sorted key tuple (what the 6j cache holds: no extra frame)."""
    a1, a2, a3, a4, e1, e2, e3 = key
    t = _tables
    top = e3 + 1
    fp = t.packs if top < len(t.packs) else _packs(top, t)
    # Racah sum over t = a4 .. e1 (Horner on the ratio of consecutive terms), as in
    # sixj_racah_sum, written with u = t + 1 and f_j = e_j + 1.
    f1, f2, f3 = e1 + 1, e2 + 1, e3 + 1
    p = q = 1
    for u in range(e1, a4, -1):
        q *= (u - a1) * (u - a2) * (u - a3) * (u - a4)
        p = q - (u + 1) * (f1 - u) * (f2 - u) * (f3 - u) * p
    if p == 0:
        return 0, 1, 1
    if a4 & 1:
        p = -p
    # 2 * [(a4+1)! / prod_i (e1-a_i)! / prod_j (e_j-a4)!]  +  sum_ij (e_j-a_i)!  -  sum_i (a_i+1)!
    packed = (fp[a4 + 1] - fp[a1 + 1] - fp[a2 + 1] - fp[a3 + 1]
              - fp[e1 - a1] - fp[e1 - a2] - fp[e1 - a3] - 3 * fp[e1 - a4]
              + fp[e2 - a1] + fp[e2 - a2] + fp[e2 - a3] - fp[e2 - a4]
              + fp[e3 - a1] + fp[e3 - a2] + fp[e3 - a3] - fp[e3 - a4])
    return _split_square(packed, top, p, t)


def sixj_key_plain(t1, t2, t3, t4, t5, t6):
    """Sorted key ``(a1, a2, a3, a4, e1, e2, e3)`` of a 6j from doubled ints, or ``0`` when a
    triangle rule fails (the value is then zero).

    The one-step route of :func:`amalgebra.coupling.sixj`: triangle rules and the key in one
    pass (the compiled module has the same function, reading SymPy numbers as well).

    >>> sixj_key_plain(2, 2, 2, 2, 2, 2)
    (3, 3, 3, 3, 4, 4, 4)
    >>> sixj_key_plain(2, 2, 6, 2, 2, 2)
    0
    """
    s1, s2, s3, s4 = t1 + t2 + t3, t1 + t5 + t6, t4 + t2 + t6, t4 + t5 + t3
    if (s1 | s2 | s3 | s4) & 1:
        return 0
    alpha = sorted((s1 >> 1, s2 >> 1, s3 >> 1, s4 >> 1))
    b1, b2, b3 = (t1 + t2 + t4 + t5) >> 1, (t2 + t3 + t5 + t6) >> 1, (t3 + t1 + t6 + t4) >> 1
    if b1 > b2:
        b1, b2 = b2, b1
    if b2 > b3:
        b2, b3 = b3, b2
        if b1 > b2:
            b1, b2 = b2, b1
    # the twelve differences beta_j - alpha_i are the triangle excesses (j1 + j2 - j3 and the
    # like) of the four triads, so every triangle rule holds exactly when min(beta) >= max(alpha)
    if b1 < alpha[3]:
        return 0
    return (*alpha, b1, b2, b3)


def _sixj_sums(t1, t2, t3, t4, t5, t6):
    """(alpha, beta) of the 6j {j1 j2 j3; j4 j5 j6} from doubled values."""
    return ((t1 + t2 + t3) // 2, (t1 + t5 + t6) // 2, (t4 + t2 + t6) // 2, (t4 + t5 + t3) // 2), \
        ((t1 + t2 + t4 + t5) // 2, (t2 + t3 + t5 + t6) // 2, (t3 + t1 + t6 + t4) // 2)


def _ninej_top(a, b, c, d, e, f, g, h, i, hi):
    """Largest factorial argument of the 9j sum: a quadruple sum of one of the three 6j (x at its top) + 1."""
    return max(a + b + f + i, b + c + i + hi, c + a + hi + f, d + e + b + hi, e + f + hi + h,
               f + d + h + b, g + h + hi + a, h + i + a + d, i + g + d + hi) // 2 + 1


def ninej_kernel(a, b, c, d, e, f, g, h, i):
    """The 9j symbol {a b c; d e f; g h i} (doubled values, all six triads valid).

    Uses Edmonds (6.4.3): a sum over x of (-1)^(2x) (2x+1) times
    {a b c; f i x} {d e f; b x h} {g h i; x a d}.  In the product of the three
    6j square roots the x-dependent triangle coefficients appear squared, so
    every term is rational times one common root; the terms are brought to a
    common denominator through their exponent vectors.  Runs the compiled
    kernel when it is available and every factorial argument is within its
    table, else :func:`ninej_kernel_python` (identical triples).

    >>> ninej_kernel(1, 1, 2, 1, 1, 2, 2, 2, 4)      # {1/2 1/2 1; 1/2 1/2 1; 1 1 2} = 1/9
    (1, 9, 1)
    """
    lo = max(abs(a - i), abs(b - f), abs(d - h))
    hi = min(a + i, b + f, d + h)
    if lo > hi:
        return 0, 1, 1
    if _ninej_top(a, b, c, d, e, f, g, h, i, hi) <= _COMPILED_TOP:
        return _compiled.ninej(a, b, c, d, e, f, g, h, i)
    return ninej_kernel_python(a, b, c, d, e, f, g, h, i)


def ninej_kernel_python(a, b, c, d, e, f, g, h, i):
    """The pure-Python :func:`ninej_kernel` (identical triples to the compiled kernel).

    Edmonds (6.4.3) with the three 6j written with ``x`` first,
    ``{x f b; c a i} {x b f; e d h} {x a i; g h d}`` (the same symbols by their
    column symmetries).  Each Racah sum ``S(x)`` of ``{x p q; n r s}`` obeys the
    three-term recurrence in ``x`` (doubled values, ``J(y) = y (y + 2)``)

    .. math:: x G_+(x) S(x+2) + 2 (x+1) [J_x (c_4 - J_x) + c_3] S(x) + (x+2) G_-(x) S(x-2) = 0,

    :math:`G_+ = ((x+2)^2 - (p-q)^2)((x+2)^2 - (r-s)^2)`,
    :math:`G_- = ((p+q+2)^2 - x^2)((r+s+2)^2 - x^2)`,
    :math:`c_4 = J_p + J_q - 2 J_n + J_r + J_s`, :math:`c_3 = (J_r - J_s)(J_p - J_q)`
    (Schulten and Gordon's recurrence for the 6j, J. Math. Phys. 16, 1961 (1975), with the
    square roots of its coefficients cancelled against the ``x``-dependent triangle
    coefficients; quoted from memory, checked against Racah's sum by the tests).  It runs on the integers ``Q(x) = S(x) K / (n_3 + 1)!`` with the constant
    ``K = ((n+s-p)/2)! ((p+n-s)/2)! ((p+s-n)/2)!`` and ``n_3 = (n+p+s)/2``, integers because
    ``Q`` is a signed sum of products of four binomials; ``x G_+`` never vanishes inside the
    9j range, so every step is one exact division.  Two Horner sums start each recurrence.

    The ``x``-dependent triangle coefficients ``Phi(x) = Delta(a i x) Delta(b f x) Delta(d h x)``
    are scaled by their digit-wise minimum over the range (on packed vectors: bit 31 of
    ``low + guard - vector`` is set where ``low >= vector``), so ``Psi(x) = Phi(x) / min``
    is a small integer, updated by ``Delta(x+2) / Delta(x) = ((x+2)^2 - (p-q)^2) /
    ((p+q+2)^2 - (x+2)^2)``.  The sum of ``(x+1) Q_1 Q_2 Q_3 Psi(x)`` times the constants and
    the common root gives the triple.
    """
    lo = max(abs(a - i), abs(b - f), abs(d - h))
    hi = min(a + i, b + f, d + h)
    if lo > hi:
        return 0, 1, 1
    t = _tables
    top = max(a + i + hi, b + f + hi, d + h + hi, a + b + c, d + e + f, g + h + i,
              a + d + g, b + e + h, c + f + i) // 2 + 1
    fp = _packs(top, t)
    length = t.pi[top]
    guard, bias, full = _min_masks(length)
    m = (hi - lo) >> 1
    # packed vectors of Phi(x) for x = lo, lo + 2, ..., hi, and their digit-wise minimum
    phis = None
    for p, q in ((a, i), (b, f), (d, h)):
        s, u, v, w = (p + q - hi) >> 1, (p - q + lo) >> 1, (q - p + lo) >> 1, ((p + q + lo) >> 1) + 1
        part = map(sub, map(add, _pack_range(fp, s, s + m + 1)[::-1], _pack_range(fp, u, u + m + 1)),
                   map(sub, _pack_range(fp, w, w + m + 1), _pack_range(fp, v, v + m + 1)))
        phis = list(part) if phis is None else list(map(add, phis, part))
    low = phis[0] + bias
    for vector in phis[1:]:
        vector += bias
        mask = (((low + guard - vector) & guard) >> 31) * _DIGIT
        low = (vector & mask) | (low & (full ^ mask))
    low -= bias
    psi = _pack_to_int(phis[0] - low, length, t)
    # the constants K / (n3 + 1)! of the three 6j {x p q; n r s}
    constants = 0
    for p, q, n, r, s in ((f, b, c, a, i), (b, f, e, d, h), (a, i, g, h, d)):
        constants += (fp[(n + s - p) >> 1] + fp[(p + n - s) >> 1] + fp[(p + s - n) >> 1]
                      - fp[((n + p + s) >> 1) + 1])
    q1, q2, q3 = _scaled_racah(lo, f, b, c, a, i), _scaled_racah(lo, b, f, e, d, h), _scaled_racah(lo, a, i, g, h, d)
    total = (lo + 1) * psi * q1 * q2 * q3
    if m:
        x = lo + 2
        kbf, kai, kdh = (b - f) ** 2, (a - i) ** 2, (d - h) ** 2
        mbf, mai, mdh = (b + f + 2) ** 2, (a + i + 2) ** 2, (d + h + 2) ** 2
        x2 = x * x
        wbf, wai, wdh = mbf - x2, mai - x2, mdh - x2
        psi = psi * ((x2 - kbf) * (x2 - kai) * (x2 - kdh)) // (wbf * wai * wdh)
        r1, r2, r3 = _scaled_racah(x, f, b, c, a, i), _scaled_racah(x, b, f, e, d, h), _scaled_racah(x, a, i, g, h, d)
        total += (x + 1) * psi * r1 * r2 * r3
        jf, jb, jc, ja, ji, je, jd, jh, jg = (f * (f + 2), b * (b + 2), c * (c + 2), a * (a + 2), i * (i + 2),
                                              e * (e + 2), d * (d + 2), h * (h + 2), g * (g + 2))
        c41, c31 = jf + jb - 2 * jc + ja + ji, (ja - ji) * (jf - jb)
        c42, c32 = jb + jf - 2 * je + jd + jh, (jd - jh) * (jb - jf)
        c43, c33 = ja + ji - 2 * jg + jh + jd, (jh - jd) * (ja - ji)
        for x in range(x, hi, 2):
            y = x + 2
            y2 = y * y
            ubf, uai, udh = y2 - kbf, y2 - kai, y2 - kdh
            jx = x * y
            z = x + y
            q1, r1 = r1, -(z * (jx * (c41 - jx) + c31) * r1 + y * wbf * wai * q1) // (x * ubf * uai)
            q2, r2 = r2, -(z * (jx * (c42 - jx) + c32) * r2 + y * wbf * wdh * q2) // (x * ubf * udh)
            q3, r3 = r3, -(z * (jx * (c43 - jx) + c33) * r3 + y * wai * wdh * q3) // (x * uai * udh)
            wbf, wai, wdh = mbf - y2, mai - y2, mdh - y2
            psi = psi * (ubf * uai * udh) // (wbf * wai * wdh)
            total += (y + 1) * psi * r1 * r2 * r3
    if total == 0:
        return 0, 1, 1
    if lo & 1:
        total = -total
    outer = (_delta_pack(fp, a, b, c) + _delta_pack(fp, d, e, f) + _delta_pack(fp, g, h, i)
             + _delta_pack(fp, a, d, g) + _delta_pack(fp, b, e, h) + _delta_pack(fp, c, f, i))
    return _split_square(2 * (low - constants) + outer, top, total, t)


def _scaled_racah(x, p, q, n, r, s):
    """``Q(x) = S(x) K / (n_3 + 1)!`` of the 6j ``{x p q; n r s}`` (doubled; see
    :func:`ninej_kernel_python`): Horner on the Racah sum, then the leading term as four binomials."""
    a1, a2, a3, a4 = (x + p + q) >> 1, (x + r + s) >> 1, (n + p + s) >> 1, (n + r + q) >> 1
    e1, e2, e3 = (x + q + n + s) >> 1, (x + p + n + r) >> 1, (p + q + r + s) >> 1  # paired with a1, a2, a4
    t0 = max(a1, a2, a3, a4)
    t1 = min(e1, e2, e3)
    p = q = 1
    for u in range(t1, t0, -1):  # u = t + 1
        q *= (u - a1) * (u - a2) * (u - a3) * (u - a4)
        p = q - (u + 1) * (e1 + 1 - u) * (e2 + 1 - u) * (e3 + 1 - u) * p
    p = comb(t0 + 1, a3 + 1) * comb(e1 - a1, t0 - a1) * comb(e2 - a2, t0 - a2) * comb(e3 - a4, t0 - a4) * p // q
    return -p if t0 & 1 else p


def _pack_range(fp, start, stop):
    """``[fp[n] for n in range(start, stop)]`` (a slice of the dense table)."""
    if type(fp) is list:
        return fp[start:stop]
    return [fp[n] for n in range(start, stop)]


def _pack_to_int(packed, length, t):
    """The integer ``prod p^e`` of a packed vector with every digit ``e >= 0``."""
    if not packed:
        return 1
    ups = memoryview(packed.to_bytes(4 * length, _NATIVE)).cast(_UINT32).tolist()
    return prod(map(_pow, compress(t.primes, ups), filter(None, ups)))


_min_masks_cache = {}


def _min_masks(length):
    """``(guard, bias, full)``: bit 31, bit 30 and all 32 bits set in each of ``length`` digits."""
    masks = _min_masks_cache.get(length)
    if masks is None:
        low = int.from_bytes(b"\x01\x00\x00\x00" * length, "little")
        masks = _min_masks_cache[length] = (low << 31, low << 30, low * _DIGIT)
    return masks
