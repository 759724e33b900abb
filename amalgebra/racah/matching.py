r"""Matching a published 3j identity onto part of a network, with the phase derived exactly.

Explanation
===========

Each graphical rule is one identity between a sum over the projections of a few
3j symbols (its *internal lines*) and a closed form, written once as data
(:class:`Pattern`): for every vertex its three slots -- the momentum's name and
either an internal line with the sign of its projection or an external line --
and the exponent of the phase the identity carries.  :func:`match` places a
pattern on chosen vertices of a network and rewrites the network's exponent
so that it reads (pattern's phase) + (rest), the rest free of the internal
projections.  Only these exact facts are used (DLMF 34.3.8-34.3.10; they follow
from Racah's formula, Edmonds 1957, eq. 3.7.3; equation numbers from memory):

1. an odd permutation of the columns of a 3j symbol multiplies it by
   :math:`(-1)^{j_1+j_2+j_3}` (even ones change nothing);
2. reversing the signs of all three projections multiplies it by
   :math:`(-1)^{j_1+j_2+j_3}`;
3. a summed projection can be renamed :math:`m \to -m` (its range is symmetric);
4. :math:`(-1)^{k(m_1+m_2+m_3)} = 1` for integer :math:`k` inside a 3j symbol
   (it vanishes unless :math:`m_1+m_2+m_3 = 0`);
5. :math:`(-1)^{2m} = (-1)^{2j}`, since :math:`j - m` is an integer.

Fact 2 with 3 fixes the signs of the internal projections (a flip per vertex,
found by solving :math:`f_u + f_v = [\text{signs differ from the pattern}]`
over GF(2)); fact 4 fixes the parity of each internal projection's
coefficient in the exponent (a multiple :math:`k_v` per vertex, again over
GF(2)); fact 5 then makes the coefficients equal to the pattern's, trading
:math:`2m` for :math:`2j`.  When no choice of flips and multiples exists, the
pattern does not apply there (the sum is not of that form) and :func:`match`
returns ``None``: nothing is ever fitted to numbers.

Examples
========

>>> from amalgebra.racah.matching import BUBBLE, TRIANGLE
>>> len(BUBBLE.verts), len(TRIANGLE.verts), sorted(TRIANGLE.edges)
(2, 3, ['u1', 'u2', 'u3'])
"""

from dataclasses import dataclass
from fractions import Fraction
from itertools import product

from .linear import ONE, add_forms, linear_form, negate_form, scale_form, substitute_form

__all__ = ["Pattern", "Match", "match", "LOOP", "BUBBLE", "TRIANGLE", "NINEJ", "COMPLETENESS",
           "vertex_momentum_form", "permutation_is_odd"]


@dataclass(frozen=True)
class Pattern:
    """A 3j identity as data.

    ``verts``: per vertex three slots ``(label_name, kind, name, sign)`` with
    ``kind`` ``"i"`` (internal line ``name``, projection ``sign * name``) or ``"e"``
    (external line, projection named ``name``); ``exponent``: the phase of the
    identity, ``{name: coefficient}`` over label, line and external names (and
    ``1``); ``source``: where the identity is published.
    """

    name: str
    verts: tuple
    exponent: tuple
    source: str

    @property
    def edges(self):
        out = {}
        for vert in self.verts:
            for label, kind, name, _ in vert:
                if kind == "i":
                    out[name] = label
        return out


def _p(name, verts, exponent, source):
    return Pattern(name, tuple(tuple(v) for v in verts), tuple(exponent.items()), source)


#: sum_m (-1)^(a-m) (a a c; m -m mu) = delta(c,0) delta(mu,0) sqrt(2a+1)
#: (the special value (a a 0; m -m 0) = (-1)^(a-m)/sqrt(2a+1), DLMF 34.3.1, and orthogonality)
LOOP = _p("loop", [[("a", "i", "e", 1), ("a", "i", "e", -1), ("c", "e", "mu", 1)]],
          {"a": 1, "e": -1},
          "(a a 0; m -m 0) = (-1)^(a-m)/sqrt(2a+1) (DLMF 34.3.1) with orthogonality (DLMF 34.3.16; from memory)")

#: sum_{m1 m2} (j1 j2 j3; m1 m2 al)(j1 j2 j3p; m1 m2 be) = delta(j3,j3p) delta(al,be) D(j1 j2 j3)/(2j3+1)
BUBBLE = _p("bubble", [[("j1", "i", "e1", 1), ("j2", "i", "e2", 1), ("j3", "e", "al", 1)],
                       [("j1", "i", "e1", 1), ("j2", "i", "e2", 1), ("j3p", "e", "be", 1)]],
            {}, "orthogonality of 3j symbols (Edmonds 1957, eq. 3.7.8; DLMF 34.3.16; from memory)")

#: sum (-1)^(l1+l2+l3+u1+u2+u3) (j1 l2 l3; m1 u2 -u3)(l1 j2 l3; -u1 m2 u3)(l1 l2 j3; u1 -u2 m3)
#:   = (j1 j2 j3; m1 m2 m3) {j1 j2 j3; l1 l2 l3}
TRIANGLE = _p("triangle",
              [[("j1", "e", "m1", 1), ("l2", "i", "u2", 1), ("l3", "i", "u3", -1)],
               [("l1", "i", "u1", -1), ("j2", "e", "m2", 1), ("l3", "i", "u3", 1)],
               [("l1", "i", "u1", 1), ("l2", "i", "u2", -1), ("j3", "e", "m3", 1)]],
              {"l1": 1, "l2": 1, "l3": 1, "u1": 1, "u2": 1, "u3": 1},
              "the 6j symbol from three 3j symbols (Edmonds 1957, eq. 6.2.8, from memory; "
              "the triangle rule of Yutsis, Levinson, Vanagas 1962)")

#: the 9j symbol as the sum over all nine projections of its three rows and three columns
NINEJ = _p("ninej",
           [[("j11", "i", "e11", 1), ("j12", "i", "e12", 1), ("j13", "i", "e13", 1)],
            [("j21", "i", "e21", 1), ("j22", "i", "e22", 1), ("j23", "i", "e23", 1)],
            [("j31", "i", "e31", 1), ("j32", "i", "e32", 1), ("j33", "i", "e33", 1)],
            [("j11", "i", "e11", 1), ("j21", "i", "e21", 1), ("j31", "i", "e31", 1)],
            [("j12", "i", "e12", 1), ("j22", "i", "e22", 1), ("j32", "i", "e32", 1)],
            [("j13", "i", "e13", 1), ("j23", "i", "e23", 1), ("j33", "i", "e33", 1)]],
           {}, "the 9j symbol as a sum of six 3j symbols (DLMF 34.6.1; from memory)")

#: sum_{x xi} (2x+1) (a b x; al be xi)(a b x; alp bep xi) = delta(al, alp) delta(be, bep)
COMPLETENESS = _p("completeness",
                  [[("a", "e", "al", 1), ("b", "e", "be", 1), ("x", "i", "xi", 1)],
                   [("a", "e", "alp", 1), ("b", "e", "bep", 1), ("x", "i", "xi", 1)]],
                  {}, "completeness of 3j symbols (Edmonds 1957, eq. 3.7.7; DLMF 34.3.17; from memory)")


def vertex_momentum_form(vert):
    """Linear form of :math:`j_1+j_2+j_3` of a vertex."""
    return add_forms(*(linear_form(label) for label, _ in vert))


def permutation_is_odd(perm):
    perm = list(perm)
    odd = False
    for i in range(len(perm)):
        for k in range(i + 1, len(perm)):
            if perm[i] > perm[k]:
                odd = not odd
    return odd


@dataclass
class Match:
    """A pattern placed on a network: the bound names and the exponent left over."""

    pattern: Pattern
    vertices: tuple      # network vertex indices, one per pattern vertex
    labels: dict         # label name -> momentum (SymPy expression)
    externals: dict      # external name -> projection form (after flips)
    internals: dict      # internal line name -> summed projection symbol
    rest: dict           # exponent without the pattern's phase (no internal projection in it)
    steps: tuple         # phase moves made (for the derivation report)


def _same(a, b):
    return a == b or (a - b).expand() == 0


def match(net, pattern, assignment):
    """Place ``pattern`` on ``net``; ``assignment`` gives, per pattern vertex,
    ``(vertex index, perm)`` with ``perm[k]`` the network slot of pattern slot ``k``.

    Returns a :class:`Match` or ``None`` (labels differ, lines do not connect as the
    pattern's do, or no signs and phases make the network's summand equal to the
    pattern's).
    """
    labels, internals, ends = {}, {}, {}
    for pv, (vi, perm) in enumerate(assignment):
        vert = net.verts[vi]
        for k, (lname, kind, name, sign) in enumerate(pattern.verts[pv]):
            label, form = vert[perm[k]]
            if lname in labels:
                if not _same(labels[lname], label):
                    return None
            else:
                labels[lname] = label
            if kind == "i":
                if len(form) != 1:
                    return None
                (var, coeff), = form.items()
                if var is ONE or abs(coeff) != 1 or var not in net.mvars:
                    return None
                if name in internals and internals[name] != var:
                    return None
                internals[name] = var
                ends.setdefault(name, []).append((pv, int(coeff), sign))
    used = set(internals.values())
    if len(used) != len(internals):
        return None
    for name, var in internals.items():
        if len(ends[name]) != 2 or len(net.occurrences(var)) != 2:
            return None
    for pv, (vi, perm) in enumerate(assignment):
        for k, (lname, kind, name, sign) in enumerate(pattern.verts[pv]):
            if kind == "e" and used & set(net.verts[vi][perm[k]][1]):
                return None
    nv = len(assignment)
    # flips: f_u + f_v = [s_u s_v != p_u p_v] for every internal line
    flips = None
    for trial in product((0, 1), repeat=nv - 1):
        f = (0,) + trial
        if all((f[a[0]] + f[b[0]]) % 2 == (0 if a[1] * b[1] == a[2] * b[2] else 1)
               for a, b in ends.values()):
            flips = f
            break
    if flips is None:
        return None
    sigma = {}
    for name, (a, b) in ends.items():
        sigma[name] = a[2] * a[1] * (-1 if flips[a[0]] else 1)
    moves = []
    exponent = dict(net.phase)
    eff = []     # effective slot forms, pattern order
    for pv, (vi, perm) in enumerate(assignment):
        vert = net.verts[vi]
        if flips[pv]:
            exponent = add_forms(exponent, vertex_momentum_form(vert))
        if permutation_is_odd(perm):
            exponent = add_forms(exponent, vertex_momentum_form(vert))
        forms = [vert[perm[k]][1] for k in range(3)]
        if flips[pv]:
            forms = [negate_form(f) for f in forms]
        eff.append(forms)
    if any(flips):
        moves.append("reverse the projections of a 3j symbol: (-1)^(j1+j2+j3)")
    for name, s in sigma.items():
        if s == -1:
            var = internals[name]
            exponent = substitute_form(exponent, var, {var: Fraction(-1)})
            eff = [[substitute_form(f, var, {var: Fraction(-1)}) for f in forms] for forms in eff]
    pexp = dict(pattern.exponent)
    constraints = [add_forms(*forms) for forms in eff]
    chosen = None
    for ks in product((0, 1), repeat=nv):
        ok = True
        for name, var in internals.items():
            c = exponent.get(var, 0) + sum(k * con.get(var, 0) for k, con in zip(ks, constraints))
            d = c - pexp.get(name, 0)
            if d.denominator != 1 or d.numerator % 2:
                ok = False
                break
        if ok:
            chosen = ks
            break
    if chosen is None:
        return None
    for k, con in zip(chosen, constraints):
        if k:
            exponent = add_forms(exponent, con)
    if any(chosen):
        moves.append("m1 + m2 + m3 = 0 inside a 3j symbol")
    traded = False
    for name, var in internals.items():
        d = exponent.get(var, 0) - pexp.get(name, 0)
        if d:
            exponent = add_forms(exponent, {var: -d}, scale_form(linear_form(net.mvars[var]), d))
            traded = True
    if traded:
        moves.append("(-1)^(2m) = (-1)^(2j)")
    externals = {}
    for pv, forms in enumerate(eff):
        for k, (lname, kind, name, sign) in enumerate(pattern.verts[pv]):
            if kind == "e":
                externals[name] = forms[k]
    bound = []
    for name, coeff in pexp.items():
        if name == 1:
            bound.append({ONE: Fraction(coeff)})
        elif name in labels:
            bound.append(scale_form(linear_form(labels[name]), Fraction(coeff)))
        elif name in internals:
            bound.append({internals[name]: Fraction(coeff)})
        else:
            bound.append(scale_form(externals[name], Fraction(coeff)))
    rest = add_forms(exponent, negate_form(add_forms(*bound)))
    assert not used & set(rest), (rest, used)
    return Match(pattern, tuple(vi for vi, _ in assignment), labels, externals, internals, rest,
                 tuple(moves))
