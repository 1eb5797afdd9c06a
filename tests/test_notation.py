"""Parser and tree checks: round trips, canonical forms, and every kind of bad notation."""

from __future__ import annotations

import pytest

from recouple import NotationError, parse
from recouple.errors import SchemeMismatch
from recouple.schemes import Coupling, Leaf, check_scheme, to_networkx


@pytest.mark.parametrize(
    ("text", "expected"),
    [
        ("((j1,j2)j12,j3)J", "((j1,j2)j12,j3)J"),
        ("((l1 s1)j1 (l2 s2)j2)J", "((l1,s1)j1,(l2,s2)j2)J"),
        ("  ( a , b )c ", "(a,b)c"),
        ("((a,b)e(c,d)f)J", "((a,b)e,(c,d)f)J"),
        ("(J_a,s')x'", "(J_a,s')x'"),
    ],
)
def test_parse_and_format(text: str, expected: str) -> None:
    assert str(parse(text)) == expected
    assert str(parse(expected)) == expected


def test_tree_queries() -> None:
    t = parse("((l1 s1)j1 (l2 s2)j2)J")
    assert t.leaves() == ("l1", "s1", "l2", "s2")
    assert t.internal_labels() == ("j1", "j2", "J")
    assert t.total == "J"
    assert t.clusters() == {
        frozenset({"l1", "s1"}): "j1",
        frozenset({"l2", "s2"}): "j2",
        frozenset({"l1", "s1", "l2", "s2"}): "J",
    }
    assert t.triads() == (("l1", "s1", "j1"), ("l2", "s2", "j2"), ("j1", "j2", "J"))


def test_canonical_forgets_order() -> None:
    a = parse("((b,a)e,(d,c)f)J")
    b = parse("((c,d)f,(a,b)e)J")
    assert a != b
    assert a.canonical() == b.canonical()
    assert str(a.canonical()) == "((a,b)e,(c,d)f)J"


def test_networkx_export() -> None:
    g = to_networkx(parse("((a,b)e,c)J"))
    assert set(g.nodes) == {"a", "b", "c", "e", "J"}
    assert g.nodes["a"]["kind"] == "leaf"
    assert g.nodes["J"]["cluster"] == ("a", "b", "c")
    assert g.edges["e", "a"]["slot"] == 0
    assert g.edges["e", "b"]["slot"] == 1


@pytest.mark.parametrize(
    ("text", "message", "position"),
    [
        ("", "empty scheme", None),
        ("   ", "empty scheme", None),
        ("((a,b)c", "unclosed '\\('", 0),
        ("(a,b)c)", "unmatched '\\)'", 6),
        ("(a,b)", "missing label", 4),
        ("((a,b),c)J", "missing label", 5),
        ("(a b) c", "missing label", 4),
        ("(a)b", "only one part", 0),
        ("(a,b,c)d", "3 parts", 0),
        ("()x", "no parts", 0),
        ("(a,,b)c", "empty part", 3),
        ("(a,b,)c", "empty part", 5),
        ("a,b", "comma outside", 1),
        ("(a,a)J", "leaf 'a' appears twice", 3),
        ("((a,b)e,(c,d)e)J", "label 'e' is used twice", 13),
        ("((a,b)a,c)J", "both a leaf and a coupling label", 6),
        ("(a,b)1c", "must start with a letter", 5),
        ("(a,b)c (d,e)f", "text after the end", 7),
        ("j1", "at least two angular momenta", 0),
        ("(a,b-c)d", "character '-'", 4),
        ("(a\uff0cb)c", "use ','", 2),
        ("\uff08a,b\uff09c", "use '\\('", 0),
        ("[a,b]c", "use '\\('", 0),
    ],
)
def test_bad_notation(text: str, message: str, position: int | None) -> None:
    with pytest.raises(NotationError, match=message) as info:
        parse(text)
    assert info.value.position == position
    assert "\n" not in info.value.one_line()


def test_deep_nesting_does_not_exhaust_the_stack() -> None:
    # 100 000 characters of unclosed brackets: a clear error, not a RecursionError.
    with pytest.raises(NotationError, match="unclosed"):
        parse("(" * 100_000)


def test_too_many_leaves_is_refused() -> None:
    text = "(" * 299 + "x0" + "".join(f",x{i})y{i}" for i in range(1, 300))
    with pytest.raises(NotationError, match="at most 256"):
        parse(text)


def test_check_scheme() -> None:
    with pytest.raises(SchemeMismatch, match="at least two"):
        check_scheme(Leaf("a"))
    with pytest.raises(SchemeMismatch, match="leaf 'a' is used twice"):
        check_scheme(Coupling(Leaf("a"), Leaf("a"), "J"))
    ok = Coupling(Leaf("a"), Leaf("b"), "J")
    assert check_scheme(ok) is ok


def test_not_text() -> None:
    with pytest.raises(NotationError, match="written as text"):
        parse(3)  # type: ignore[arg-type]
