r"""Powers of m-shift elements over the integers, with each polynomial packed into one Python int.

Explanation
===========

``a**n`` in the m-shift kernel (:mod:`amalgebra.algebra.shiftform`) is ``n - 1`` left
multiplications by the small element ``a``.  Each step multiplies every
polynomial ``p_e`` of the growing element by a few small polynomials (the
shifted coefficients of ``a`` times the reduction polynomial of the two ladder
powers), so over ``sympy.polys`` the time goes into term-by-term products
in the interpreter.

Over ``ZZ`` the same steps run on *Kronecker substitutions*: a polynomial
:math:`p(v_1, \ldots, v_r) = \sum c_\alpha v^\alpha` becomes the integer

.. math::

    \phi(p) = \sum_\alpha c_\alpha \, 2^{B \sum_i \alpha_i s_i},
    \qquad s_i = \prod_{k < i} (D_k + 1),

a ring homomorphism :math:`\mathbb{Z}[v] \to \mathbb{Z}` (it is evaluation at
:math:`v_i = 2^{B s_i}`).  A product by a small polynomial is then one shift,
one small multiplication and one addition of Python ints per term of the
small factor, done by CPython's big-integer code.  Only the shifts of the
small left factors (``p(v + e)``) are done on polynomials, once per pair of
shifts.  :math:`\phi` is injective on polynomials of degree at most
:math:`D_i` in :math:`v_i` with :math:`|c_\alpha| < 2^{B-1}`; both bounds are
found first by a pass over degree vectors and 1-norms alone
(:math:`\|fg\|_1 \le \|f\|_1 \|g\|_1`), so decoding the final integers
(signed slots of ``B`` bits, ``B`` a multiple of 8) is exact.  Intermediate
integers are never decoded.  The result is the same element as the
``sympy.polys`` route, term for term (``tests/algebra/test_packed_power.py``).

The route is taken only where it pays (measured, ``tests/benchmarks/bench_canonical.py``):

* coefficient domain ``ZZ`` (rational input, cleared denominators);
* for a base that involves several labels, a *fill* of the dense layout of at
  least :data:`_MIN_FILL` (the share of the layout inside the degree boxes of the
  polynomials), judged on ``a**4`` so that a declined base costs little:
  independent ladders of two labels leave the layout mostly empty
  (``(J_x + S_x)^{10}``: fill 0.09 at the 4th power, packed no faster), while
  ladders that move together fill it (``(J_+S_- + J_-S_+ + 2J_zS_z)^{12}``: fill
  0.22, packed 4.7x faster); a base of one label always qualifies;
* a packed result of at most ``64 * max_dense_entries`` bits in all
  (:func:`amalgebra.limits.current_limits`; 80 MB at the default, the size of
  the largest dense int64 matrix the limits allow).  Intermediate integers are
  never larger than the final ones.  Above the cap the plain route runs: no
  error, since the plain route's output may be far smaller than the dense bound.

The decision needs only the first pass (degrees and 1-norms).  The plain route
(the loop of :meth:`~amalgebra.algebra.shiftform.ShiftAlgebra.mul`) is kept as the
oracle :func:`amalgebra.testing.kernel_oracle.repeated_product`; there is no
public switch between the two.

Examples
========

>>> from sympy import ZZ
>>> from amalgebra.algebra.modes import ANGULAR_MOMENTUM
>>> from amalgebra.algebra.shiftform import ShiftAlgebra
>>> A = ShiftAlgebra([("J", ANGULAR_MOMENTUM)], ZZ)
>>> x = A.add(A.atom("J", "plus"), A.atom("J", "minus"), A.atom("J", "z"))
>>> packed = packed_power(A, x, 6)
>>> from amalgebra.testing.kernel_oracle import repeated_product
>>> packed == repeated_product(A, x, 6)         # the sympy.polys route, term for term
True
>>> len(packed)                                 # shifts -6 .. 6
13
"""

import re

from ..limits import current_limits

__all__ = ["packed_power", "packable"]

# Internal: amalgebra.testing.kernel_oracle.plain_power_route switches it off so tests can
# compare the two routes through canonical(); not a user-facing option.
_ENABLED = True

_MIN_FILL = 0.15
"""Smallest layout fill at which a base of several labels takes the packed route (measured)."""

_PROBE_POWER = 4
"""A base of several labels is judged by the fill of its 4th power (cheap, and it separated every
measured win, fill 0.21-0.28, from every loss or tie, fill 0.09-0.14)."""

_BITS_PER_DENSE_ENTRY = 64
"""The memory cap in bits per ``max_dense_entries`` (one int64 entry)."""


def packable(algebra):
    """True when ``algebra``'s polynomials can be packed (coefficient domain ``ZZ``)."""
    return bool(algebra.domain.is_ZZ) and algebra.iota is None and algebra.scalars is None


def _labels_used(algebra, items):
    """Positions of the labels ``items`` involves (a nonzero shift or a variable)."""
    owner = {v: i for i, vs in enumerate(algebra.var_index) for v in vs}
    used = set()
    for shift, terms in items:
        used.update(i for i, d in enumerate(shift) if d)
        for mon, _ in terms:
            used.update(owner[v] for v, e in enumerate(mon) if e)
    return used


def _degrees(terms, r):
    return tuple(max(mon[i] for mon, _ in terms) for i in range(r))


def packed_power(algebra, a, n):
    """``a**n`` (``n >= 1``) as a :class:`~amalgebra.algebra.shiftform.Element` of ``algebra``
    (coefficient domain ``ZZ``), or ``None`` when the dense layout would be too large
    (the caller then takes the ``sympy.polys`` route)."""
    from .shiftform import Element

    ring = algebra.ring
    r = ring.ngens
    items = [(shift, [(mon, int(c)) for mon, c in poly.items()]) for shift, poly in a.items()]
    items = [(shift, terms) for shift, terms in items if terms]
    den = a.den ** n
    if not items:
        return Element()
    several = len(_labels_used(algebra, items)) > 1
    lefts = {}

    def left(ia, sb):
        # key, terms, degree vector and 1-norm of shift(a_ia, sb) * F(sa, sb)
        hit = lefts.get((ia, sb))
        if hit is None:
            sa = items[ia][0]
            key, factor = algebra._combine(sa, sb)
            poly = a[sa]
            if any(sb):
                poly = algebra.shift(poly, sb)
            if factor is not None:
                poly = poly * factor
            terms = [(mon, int(c)) for mon, c in poly.items()]
            hit = lefts[(ia, sb)] = (key, terms, _degrees(terms, r) if terms else None,
                                     sum(abs(c) for _, c in terms))
        return hit

    def bounds_after(steps):
        # degree vectors and 1-norm bounds of every polynomial of a**(steps + 1)
        bounds = {shift: (_degrees(terms, r), sum(abs(c) for _, c in terms)) for shift, terms in items}
        for _ in range(steps):
            new = {}
            for sb, (db, nb) in bounds.items():
                for ia in range(len(items)):
                    key, terms, dl, nl = left(ia, sb)
                    if not terms:
                        continue
                    d = tuple(x + y for x, y in zip(dl, db))
                    prev = new.get(key)
                    if prev is None:
                        new[key] = (d, nl * nb)
                    else:
                        new[key] = (tuple(map(max, prev[0], d)), prev[1] + nl * nb)
            bounds = new
        return bounds

    if several and n > _PROBE_POWER and _fill(bounds_after(_PROBE_POWER - 1).values()) < _MIN_FILL:
        return None      # decided on a**4: a declined base costs only that small pass
    # Pass 1: degree vectors and 1-norm bounds of every polynomial of the result.
    bounds = bounds_after(n - 1)
    if not bounds:
        return Element()      # (a nonzero base over ZZ never gets here: the ring is a domain)
    if several and n <= _PROBE_POWER and _fill(bounds.values()) < _MIN_FILL:
        return None
    top = [0] * r
    norm = 1
    for d, nb in bounds.values():
        top = list(map(max, top, d))
        norm = max(norm, nb)
    slots = 1
    strides = []
    for d in top:
        strides.append(slots)
        slots *= d + 1
    bits = -(-(norm.bit_length() + 1) // 8) * 8   # |c| < 2^(bits - 1), whole bytes
    cap = current_limits().max_dense_entries
    if cap is not None and len(bounds) * slots * bits > _BITS_PER_DENSE_ENTRY * cap:
        return None

    def offset(mon):
        return bits * sum(e * s for e, s in zip(mon, strides))

    # Pass 2: the same steps on packed integers.
    packed_left = {k: (key, [(offset(mon), c) for mon, c in terms])
                   for k, (key, terms, _, _) in lefts.items()}
    current = {shift: sum(c << offset(mon) for mon, c in terms) for shift, terms in items}
    pairs = range(len(items))
    for _ in range(n - 1):
        new = {}
        get = new.get
        for sb, value in current.items():
            for ia in pairs:
                key, terms = packed_left[(ia, sb)]
                for off, c in terms:
                    t = value << off if off else value
                    if c != 1:
                        t = -t if c == -1 else t * c
                    prev = get(key)
                    new[key] = t if prev is None else prev + t
        current = new
    decoded = _decode(ring, current, bits, top, strides)
    return Element(decoded, den) if decoded else Element()


def _fill(bounds):
    """Share of the dense layout (keys x slots) inside the degree boxes of the polynomials ``bounds``."""
    bounds = list(bounds)
    top = [max(column) for column in zip(*[degrees for degrees, _ in bounds])]
    slots = 1
    for d in top:
        slots *= d + 1
    boxes = 0
    for degrees, _ in bounds:
        box = 1
        for d in degrees:
            box *= d + 1
        boxes += box
    return boxes / (len(bounds) * slots)


_NONZERO = re.compile(rb"[^\x00]+")


def _decode(ring, packed, bits, top, strides):
    """``{shift: PolyElement}`` from the packed integers (zero polynomials left out).

    Adding ``h = sum_i 2^(B-1) 2^(B i)`` and then XOR-ing with ``h`` leaves every slot
    holding its coefficient in ``B``-bit two's complement, so zero slots are zero
    bytes and a regular expression finds the others: the interpreter touches only
    the nonzero coefficients."""
    nbytes = bits // 8
    blank = bytes(nbytes - 1) + b"\x80"
    dtype = ring.dtype
    ground = ring.domain
    convert = None if ground.dtype is int else ground.dtype
    sizes = [d + 1 for d in top]
    monomials = {}
    out = {}
    for key, value in packed.items():
        if not value:
            continue
        count = abs(value).bit_length() // bits + 2
        half = int.from_bytes(blank * count, "little")
        raw = ((value + half) ^ half).to_bytes(count * nbytes, "little")
        terms = {}
        done = -1
        for run in _NONZERO.finditer(raw):
            for i in range(max(run.start() // nbytes, done + 1), (run.end() - 1) // nbytes + 1):
                mon = monomials.get(i)
                if mon is None:
                    rest, exps = i, []
                    for size in sizes:
                        rest, e = divmod(rest, size)
                        exps.append(e)
                    mon = monomials[i] = tuple(exps)
                c = int.from_bytes(raw[i * nbytes:(i + 1) * nbytes], "little", signed=True)
                terms[mon] = c if convert is None else convert(c)
                done = i
        if terms:
            out[key] = dtype(terms)
    return out
