"""Coupled states of any coupling tree as explicit vectors, from the numpy Clebsch-Gordan oracle.

Independent of amalgebra's coupling code: every Clebsch-Gordan value comes from
``spin_oracle.oracle_cg`` (numpy diagonalisation of J^2 of two spins, phase fixed by
<j1 j1; j2 J-j1|J J> > 0).  A state is a dict from the leaves' (label, doubled j,
doubled m), sorted by label, to its float amplitude.  Trees are nested
``(left, right, name)`` tuples of names, with a dict of doubled values.
"""

import importlib.util
import itertools
import pathlib

_spec = importlib.util.spec_from_file_location("coupling_spin_oracle_trees",
                                               pathlib.Path(__file__).with_name("spin_oracle.py"))
spin_oracle = importlib.util.module_from_spec(_spec)
_spec.loader.exec_module(spin_oracle)


def _ms(t):
    return range(t, -t - 1, -2)


def state(node, doubled, tm):
    """``{((label, tj, tm), ...): amplitude}`` of the coupled state of ``node`` with projection tm/2."""
    if isinstance(node, str):
        return {((node, doubled[node], tm),): 1.0}
    tl, tr, tv = doubled_of(node[0], doubled), doubled_of(node[1], doubled), doubled[node[2]]
    out = {}
    for tml in _ms(tl):
        tmr = tm - tml
        if abs(tmr) > tr:
            continue
        c = spin_oracle.oracle_cg(tl, tml, tr, tmr, tv, tm)
        if c == 0.0:
            continue
        for kl, al in state(node[0], doubled, tml).items():
            for kr, ar in state(node[1], doubled, tmr).items():
                key = tuple(sorted(kl + kr))
                out[key] = out.get(key, 0.0) + c * al * ar
    return out


def doubled_of(node, doubled):
    return doubled[node] if isinstance(node, str) else doubled[node[2]]


def overlap(first, second):
    return sum(a * second.get(k, 0.0) for k, a in first.items())


def ordered_trees(labels, names):
    """Every ordered binary tree over ``labels`` (all shapes, all child orders); internal
    nodes are named from ``names`` in a fixed order of creation."""
    labels = tuple(labels)
    if len(labels) == 1:
        yield labels[0]
        return
    first, rest = labels[0], labels[1:]
    seen = set()
    for size in range(0, len(rest)):
        for others in itertools.combinations(rest, size):
            left = (first, *others)
            right = tuple(x for x in rest if x not in others)
            for a in ordered_trees(left, names):
                for b in ordered_trees(right, names):
                    for pair in ((a, b), (b, a)):
                        key = repr(pair)
                        if key not in seen:
                            seen.add(key)
                            yield pair


def name_nodes(pair, prefix):
    """Give every internal node of an unnamed ``(left, right)`` tree a name ``prefix<n>``."""
    counter = itertools.count(1)

    def walk(node):
        if isinstance(node, str):
            return node
        left, right = walk(node[0]), walk(node[1])
        return (left, right, f"{prefix}{next(counter)}")

    return walk(pair)
