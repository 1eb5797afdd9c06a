"""Test helpers: every tree over a few leaves, random trees, random consistent values.

Labels are derived from clusters so that two schemes over the same leaves name a
shared cluster alike: the cluster {j1, j3} is ``k13``, the total is ``J``.
"""

from __future__ import annotations

import random
from collections.abc import Iterator, Sequence
from fractions import Fraction

from recouple.schemes.tree import Coupling, Leaf, Node


def cluster_label(leaves: Sequence[str], total: frozenset[str], cluster: frozenset[str]) -> str:
    """The house label of a cluster: ``J`` for the whole, else ``k`` + leaf suffixes."""
    if cluster == total:
        return "J"
    order = {leaf: i for i, leaf in enumerate(leaves)}
    return "k" + "".join(
        leaf.lstrip("jabcdefghl") or leaf for leaf in sorted(cluster, key=order.get)
    )


def _build(parts: Sequence[str], leaves: Sequence[str], ordered: bool) -> Iterator[Node]:
    if len(parts) == 1:
        yield Leaf(parts[0])
        return
    total = frozenset(leaves)
    first, rest = parts[0], list(parts[1:])
    # Split into two non-empty sets; fix `first` on the left to avoid doubles, then
    # (if ordered) also emit the mirror image.
    n = len(rest)
    for m in range(1 << n):
        left = [first] + [rest[i] for i in range(n) if m >> i & 1]
        right = [rest[i] for i in range(n) if not m >> i & 1]
        if not right:
            continue
        label = cluster_label(leaves, total, frozenset(parts))
        for lt in _build(left, leaves, ordered):
            for rt in _build(right, leaves, ordered):
                yield Coupling(lt, rt, label)
                if ordered:
                    yield Coupling(rt, lt, label)


def all_trees(leaves: Sequence[str], *, ordered: bool = False) -> list[Coupling]:
    """Every scheme over ``leaves``: unordered ((2n-3)!! of them) or with all part orders."""
    out = [t for t in _build(list(leaves), leaves, ordered)]
    return [t for t in out if isinstance(t, Coupling)]


def random_tree(leaves: Sequence[str], rng: random.Random) -> Coupling:
    """A random scheme: random splits, random part orders."""
    total = frozenset(leaves)

    def grow(parts: list[str]) -> Node:
        if len(parts) == 1:
            return Leaf(parts[0])
        shuffled = parts[:]
        rng.shuffle(shuffled)
        cut = rng.randint(1, len(parts) - 1)
        left, right = shuffled[:cut], shuffled[cut:]
        ordered_left = [p for p in leaves if p in left]
        ordered_right = [p for p in leaves if p in right]
        label = cluster_label(leaves, total, frozenset(parts))
        return Coupling(grow(ordered_left), grow(ordered_right), label)

    node = grow(list(leaves))
    assert isinstance(node, Coupling)
    return node


def _doubled_choices(da: int, db: int) -> list[int]:
    return list(range(abs(da - db), da + db + 1, 2))


def random_values(
    a: Coupling,
    b: Coupling,
    rng: random.Random,
    leaf_doubled: Sequence[int] = (1, 2, 3),
    tries: int = 500,
) -> dict[str, Fraction] | None:
    """Random values for every label of ``a`` and ``b`` satisfying all their triads.

    Leaves get random values from ``leaf_doubled`` (2j); couplings random allowed
    values; returns None if no consistent set was found in ``tries`` attempts.
    """
    for _ in range(tries):
        d: dict[str, int] = {leaf: rng.choice(leaf_doubled) for leaf in a.leaves()}
        ok = True
        for scheme in (a, b):
            for node in scheme.couplings():
                options = _doubled_choices(d[node.left.label], d[node.right.label])
                if node.label in d:
                    if d[node.label] not in options:
                        ok = False
                        break
                else:
                    d[node.label] = rng.choice(options)
            if not ok:
                break
        if ok:
            return {k: Fraction(v, 2) for k, v in d.items()}
    return None
