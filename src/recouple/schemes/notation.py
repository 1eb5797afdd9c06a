"""Read coupling schemes written in textbook notation.

Grammar (whitespace is free except where noted)::

    scheme  := part                      (a coupling, not a lone leaf)
    part    := NAME | "(" part SEP part ")" NAME
    SEP     := "," | whitespace          (a comma, or just a space)
    NAME    := letter or "_", then letters, digits, "_", and trailing primes "'"

The label of a coupling follows its closing bracket directly, with no space:
``(a,b)e``.  In ``(a,b) e`` the ``e`` would be read as a further part.

>>> str(parse("((l1 s1)j1 (l2 s2)j2)J"))
'((l1,s1)j1,(l2,s2)j2)J'
>>> parse("((a,b),c)J")
Traceback (most recent call last):
...
recouple.errors.NotationError: missing label after ')' at position 5
  ((a,b),c)J
       ^
"""

from __future__ import annotations

from dataclasses import dataclass, field

from recouple.errors import NotationError
from recouple.schemes.tree import MAX_LEAVES, Coupling, Leaf, Node, _is_body, _is_start, is_name

__all__ = ["is_name", "parse"]

# Characters people paste from word processors or other scripts instead of the
# plain brackets and comma; named in the error so the fix is obvious.
_LOOKALIKES = {
    "（": "(",
    "）": ")",
    "［": "(",
    "］": ")",
    "｛": "(",
    "｝": ")",
    "⟨": "(",
    "⟩": ")",
    "❨": "(",
    "❩": ")",
    "﹙": "(",
    "﹚": ")",
    "，": ",",
    "、": ",",
    "‚": ",",
    "[": "(",
    "]": ")",
    "{": "(",
    "}": ")",
}


@dataclass
class _Frame:
    """An open bracket being read: where it opened and the parts read so far."""

    start: int
    parts: list[Node] = field(default_factory=list)
    after_sep: bool = False  # a comma was just read, so a part must follow


def parse(text: str) -> Coupling:
    """Parse textbook notation such as ``((j1,j2)j12,j3)J`` into a scheme.

    Raises :class:`~recouple.errors.NotationError` naming the fault and its
    position: stray or missing brackets, a coupling with one or three parts, a
    missing label, a name used twice, a character outside names.

    >>> t = parse("((j1,j2)j12,j3)J")
    >>> t.label, t.leaves()
    ('J', ('j1', 'j2', 'j3'))
    """
    if not isinstance(text, str):
        raise NotationError(f"a scheme is written as text, got {type(text).__name__}")
    if not text.strip():
        raise NotationError("empty scheme: write one like ((j1,j2)j12,j3)J")
    # The parser keeps its own stack, so deeply nested text cannot exhaust Python's.
    stack: list[_Frame] = []
    top: list[tuple[Node, int]] = []
    seen: dict[str, tuple[int, bool]] = {}  # name -> (position, is_leaf)
    n_leaves = 0
    i, n = 0, len(text)

    def fail(message: str, pos: int) -> NotationError:
        return NotationError(message, text=text, position=pos)

    def claim(name: str, pos: int, leaf: bool) -> None:
        if name in seen:
            first, first_leaf = seen[name]
            if leaf and first_leaf:
                what = f"leaf {name!r} appears twice (first at position {first})"
            elif not leaf and not first_leaf:
                what = f"label {name!r} is used twice (first at position {first})"
            else:
                what = f"{name!r} is both a leaf and a coupling label (first at position {first})"
            raise fail(what, pos)
        seen[name] = (pos, leaf)

    def add_part(node: Node, pos: int) -> None:
        if stack:
            stack[-1].parts.append(node)
            stack[-1].after_sep = False
        else:
            top.append((node, pos))

    while i < n:
        ch = text[i]
        if ch in " \t\r\n":
            i += 1
        elif ch == "(":
            stack.append(_Frame(i))
            i += 1
        elif ch == ",":
            if not stack:
                raise fail("a comma outside any brackets", i)
            frame = stack[-1]
            if not frame.parts or frame.after_sep:
                raise fail("empty part before ','", i)
            frame.after_sep = True
            i += 1
        elif ch == ")":
            if not stack:
                raise fail("unmatched ')'", i)
            frame = stack.pop()
            if frame.after_sep:
                raise fail("empty part before ')'", i)
            count = len(frame.parts)
            if count != 2:
                words = {0: "no parts", 1: "only one part"}.get(count, f"{count} parts")
                raise fail(f"a coupling needs exactly two parts, found {words}", frame.start)
            j = i + 1
            while j < n and _is_body(text[j]):
                j += 1
            while j > i + 1 and j < n and text[j] == "'":
                j += 1
            label = text[i + 1 : j]
            if not label and j < n and text[j] not in " \t\r\n,()'":
                raise fail(_bad_char(text[j]), j)  # e.g. a non-ASCII letter where the label goes
            if not label:
                raise fail("missing label after ')'", i)
            if not is_name(label):
                raise fail(f"label {label!r} must start with a letter or '_'", i + 1)
            claim(label, i + 1, leaf=False)
            add_part(Coupling(frame.parts[0], frame.parts[1], label), frame.start)
            i = j
        elif _is_start(ch):
            j = i + 1
            while j < n and _is_body(text[j]):
                j += 1
            while j < n and text[j] == "'":
                j += 1
            name = text[i:j]
            claim(name, i, leaf=True)
            n_leaves += 1
            if n_leaves > MAX_LEAVES:
                raise fail(f"too many angular momenta: at most {MAX_LEAVES} may be coupled", i)
            add_part(Leaf(name), i)
            i = j
        else:
            raise fail(_bad_char(ch), i)
    if stack:
        raise fail("unclosed '('", stack[-1].start)
    if len(top) > 1:
        raise fail(
            "text after the end of the scheme (the total must be the outermost coupling)", top[1][1]
        )
    node = top[0][0]
    if isinstance(node, Leaf):
        raise fail("a scheme needs at least two angular momenta coupled in brackets", 0)
    return node


def _bad_char(ch: str) -> str:
    """The message for a character that has no place in the notation."""
    code = f"U+{ord(ch):04X}"
    if ch in _LOOKALIKES:
        return f"character {ch!r} ({code}) is not allowed; use {_LOOKALIKES[ch]!r}"
    if "0" <= ch <= "9":
        return "a name must start with a letter or '_', not a digit"
    return f"character {ch!r} ({code}) is not allowed in a scheme"
