r"""Tidying a reduced network: drop implied triangle conditions, shorten the phase.

Explanation
===========

A triangle condition :math:`\Delta(abc)` left by an orthogonality is dropped
when a 3j, 6j or 9j symbol of the result contains the triad :math:`(a, b, c)`
(that symbol vanishes outside the triangle anyway).  In the phase, for every
triad :math:`(a,b,c)` of the result :math:`(-1)^{2(a+b+c)} = 1`, so
:math:`\pm 2(a+b+c)` may be added to the exponent; it is added when that makes
the exponent shorter (fewer and smaller coefficients).  Both are exact.

Examples
========

>>> from sympy import symbols
>>> from amalgebra.racah.network import Network
>>> from amalgebra.racah.finish import finish
>>> a, b, c = symbols("a b c")
>>> net = Network()
>>> net.six.append((a, b, c, a, b, c))
>>> net.triads.append((a, b, c))
>>> net.phase = {a: 2, b: 2}
>>> net.half_atoms = {a, b, c}
>>> finish(net)[0]
(-1)**(2*c)*6j{a, b, c; a, b, c}
"""

from fractions import Fraction

from sympy import default_sort_key

from .linear import ONE, add_forms, linear_form, scale_form
from .rules import NINEJ_TRIADS, SIXJ_TRIADS, sixj_forms
from .rules_ninej import ninej_arrangements

__all__ = ["finish", "result_triads"]


def _key(t):
    return tuple(sorted(t, key=default_sort_key))


def result_triads(net):
    out = []
    for vert in net.verts:
        out.append(_key(s[0] for s in vert))
    for t in net.six:
        out += [_key(t[i] for i in tri) for tri in SIXJ_TRIADS]
    for t in net.nine:
        out += [_key(t[i] for i in tri) for tri in NINEJ_TRIADS]
    return out


def _weight(form, half):
    w = 0
    for k, v in form.items():
        if k is ONE:
            v = v % 2
        elif k in half:
            v = v % 4
            if v > 2:
                v -= 4
        w += abs(v) * (1 if k is ONE else 4) + (1 if v else 0) * 2 + (1 if v < 0 else 0)
    return w


def finish(net):
    """``(expression, description)`` of the reduced network, tidied (description '' if nothing)."""
    notes = []
    implied = set(result_triads(net))
    kept = []
    for t in net.triads:
        if _key(t) in implied or _key(t) in {_key(k) for k in kept}:
            continue
        kept.append(t)
    if len(kept) != len(net.triads):
        notes.append("triangle conditions implied by the symbols dropped")
    net.triads = kept
    _external_projection_phase(net)
    triads = sorted(set(result_triads(net)) | {_key(t) for t in kept}, key=default_sort_key)
    moves = []
    for t in triads:
        form = add_forms(*(linear_form(a) for a in t))
        moves += [scale_form(form, Fraction(2)), scale_form(form, Fraction(-2))]
    for k, t in enumerate(net.nine):
        best = None
        for form, odd in ninej_forms(t):
            phase = add_forms(net.phase, ninej_sum_form(t)) if odd else dict(net.phase)
            phase = _shorten(phase, moves, net.half_atoms, pairs=False)
            w = (_weight(phase, net.half_atoms), default_sort_key(form))
            if best is None or w < best[0]:
                best = (w, form, phase)
        if best[1] != t:
            notes.append("9j symbol written in its arrangement with the shortest phase "
                         "(odd permutations of rows or columns: (-1)^(sum of its nine momenta))")
        net.nine[k] = best[1]
        net.phase = best[2]
    net.phase = _shorten(net.phase, moves, net.half_atoms)
    six = [min(sixj_forms(t), key=default_sort_key) for t in net.six]
    if six != net.six:
        notes.append("6j symbols written in their first arrangement in sort order "
                     "(the 24 arrangements have one value)")
    net.six = six
    return net.to_expr(), "; ".join(notes)


def _external_projection_phase(net):
    """Under a delta of two projections put one for the other in the phase, and trade
    :math:`(-1)^{2m}` for :math:`(-1)^{2j}` (``j`` the line of ``m``)."""
    from .linear import is_single, substitute_form

    for f, g in net.mdeltas:
        a, b = is_single(f), is_single(g)
        if a and b and a[0] in net.ext_lines and b[0] in net.ext_lines:
            (sa, ca), (sb, cb) = a, b
            first, second = sorted((sa, sb), key=default_sort_key)
            # delta(ca*sa, cb*sb): sb = ca*cb*sa (signs are +-1)
            if second == sb:
                net.phase = substitute_form(net.phase, sb, {sa: Fraction(ca * cb)})
            else:
                net.phase = substitute_form(net.phase, sa, {sb: Fraction(ca * cb)})
    for sym, label in net.ext_lines.items():
        c = net.phase.get(sym)
        if c is None or c.denominator != 1:
            continue
        keep = c.numerator % 2
        move = c - keep
        if move:
            net.phase = add_forms(net.phase, {sym: -move}, scale_form(linear_form(label), move))


def _shorten(phase, moves, half, pairs=True):
    """Add single moves (and pairs of moves) while that lightens the phase (fewer, smaller,
    positive coefficients)."""
    pairs = [add_forms(u, v) for k, u in enumerate(moves) for v in moves[k + 1:]] if pairs else []
    improved = True
    while improved:
        improved = False
        best = _weight(phase, half)
        for mv in moves + pairs:
            trial = add_forms(phase, mv)
            w = _weight(trial, half)
            if w < best:
                phase, best, improved = trial, w, True
    return phase


def ninej_sum_form(t):
    return add_forms(*(linear_form(a) for a in t))


def ninej_forms(t):
    """``[(form, odd)]`` row by row, from :func:`~amalgebra.racah.rules_ninej.ninej_arrangements`."""
    return [(tuple(a for row in grid for a in row), odd) for grid, odd in ninej_arrangements(t)]
