"""Fuzzing the notation parser: any text either reads as a scheme or raises NotationError.

A string that parses gives a tree whose text form parses back to the same tree
(``parse(str(t)) == t``); a string that does not raises
:class:`recouple.NotationError` (never another exception) with a position inside
the text and a one-line form without line breaks.
"""

from __future__ import annotations

import random

from hypothesis import HealthCheck, event, example, given, settings
from hypothesis import strategies as st
from scheme_factory import random_tree

from recouple import Coupling, NotationError, parse

SETTINGS = settings(
    derandomize=True,
    deadline=None,
    max_examples=250,
    suppress_health_check=[HealthCheck.too_slow, HealthCheck.filter_too_much],
)

#: The notation's own alphabet: brackets, separators, name characters, primes.
ALPHABET = "(),' \t\nabcdeJjk_019"


def check(text: str) -> None:
    """The property itself."""
    failure: NotationError | None = None
    try:
        tree = parse(text)
    except NotationError as err:
        failure = err
    if failure is not None:
        event("NotationError")
        line = failure.one_line()
        assert "\n" not in line
        assert line
        if failure.position is not None:
            assert 0 <= failure.position <= len(text)
        return
    event("parsed")
    assert isinstance(tree, Coupling)
    assert parse(str(tree)) == tree
    # the separator may be a space as well as a comma
    assert parse(tree.format(" ")) == tree


@SETTINGS
@given(st.text(alphabet=ALPHABET, max_size=40))
@example("((a,b)e,c)J")
@example("(a b)J")
@example("((a',b'')e',c)J")
@example("(a,b)J'")
def test_notation_alphabet(text: str) -> None:
    check(text)


@SETTINGS
@given(st.text(max_size=40))
@example("（a,b）J")
@example("(a,b)J\u200b")
@example("((a,b)é,c)J")
@example("\x00")
@example("\ud800")
def test_arbitrary_unicode(text: str) -> None:
    check(text)


@SETTINGS
@given(st.text(alphabet=st.sampled_from(list(ALPHABET)) | st.characters(), max_size=60))
def test_alphabet_mixed_with_unicode(text: str) -> None:
    check(text)


@st.composite
def mutated_scheme(draw: st.DrawFn) -> str:
    """A valid scheme of 2-7 leaves, then a few characters deleted, inserted or duplicated."""
    n = draw(st.integers(2, 7))
    rng = random.Random(draw(st.integers(0, 10**9)))
    text = list(str(random_tree([f"j{i}" for i in range(1, n + 1)], rng)))
    for _ in range(draw(st.integers(1, 3))):
        op = draw(st.sampled_from(["delete", "insert", "duplicate", "replace"]))
        i = draw(st.integers(0, max(len(text) - 1, 0)))
        if op == "delete" and text:
            del text[i]
        elif op == "duplicate" and text:
            text.insert(i, text[i])
        else:
            ch = draw(st.sampled_from(list(ALPHABET)) | st.characters())
            if op == "replace" and text:
                text[i] = ch
            else:
                text.insert(i, ch)
    return "".join(text)


@SETTINGS
@given(mutated_scheme())
def test_mutated_schemes(text: str) -> None:
    check(text)


@settings(derandomize=True, deadline=None, max_examples=60)
@given(n=st.integers(2, 12), seed=st.integers(0, 10**9), sep=st.sampled_from([",", " ", " , "]))
def test_valid_schemes_round_trip(n: int, seed: int, sep: str) -> None:
    tree = random_tree([f"j{i}" for i in range(1, n + 1)], random.Random(seed))
    assert parse(tree.format(sep)) == tree
    assert parse(str(tree)) == tree
