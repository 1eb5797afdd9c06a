"""The whole exception family of recouple, in one place.

Every error a user can cause is a :class:`RecoupleError`, which is also a
``ValueError`` so that ``except ValueError`` keeps working.  The command line
turns each into one line on stderr and exit status 2.

>>> from recouple.errors import NotationError
>>> err = NotationError("unbalanced bracket", text="((a,b)c", position=0)
>>> print(err)
unbalanced bracket at position 0
  ((a,b)c
  ^
>>> isinstance(err, ValueError)
True
"""

from __future__ import annotations

__all__ = [
    "BadValue",
    "BudgetExceeded",
    "NotationError",
    "RecoupleError",
    "SchemeMismatch",
    "check_flag",
]


class RecoupleError(ValueError):
    """Base class of every error that recouple raises on purpose."""

    def one_line(self) -> str:
        """The message folded to a single line, as the command line prints it."""
        return " ".join(str(self).split())


class NotationError(RecoupleError):
    """Coupling-scheme text that cannot be read; carries the position of the fault.

    ``str(err)`` shows the message, the text and a caret under the position;
    :meth:`one_line` gives a compact single-line form for terminals.
    """

    def __init__(self, message: str, *, text: str = "", position: int | None = None) -> None:
        self.message = message
        self.text = text
        self.position = position
        super().__init__(self._render())

    def _render(self) -> str:
        if self.position is None:
            return self.message
        head = f"{self.message} at position {self.position}"
        if not self.text or len(self.text) > 200:
            # A caret under a huge string helps nobody; the position is enough.
            return head
        return f"{head}\n  {self.text}\n  {' ' * self.position}^"

    def one_line(self) -> str:
        if self.position is None:
            return " ".join(self.message.split())
        shown = self.text if len(self.text) <= 60 else self.text[:57] + "..."
        return f"{self.message} at position {self.position} in {shown!r}"


class SchemeMismatch(RecoupleError):
    """Two schemes that cannot be compared: other leaves, or clashing labels."""


class BadValue(RecoupleError):
    """A value that is not a valid angular momentum, or a missing or extra value."""


class BudgetExceeded(RecoupleError):
    """A search or computation that ran past the budget the caller set."""


def check_flag(value: object, name: str, *, none: bool = False) -> None:
    """Refuse a switch that is not ``True`` or ``False`` (or ``None`` where ``none``):
    a string like ``"no"`` would otherwise silently count as true.

    >>> check_flag(True, "exact")
    >>> check_flag("no", "compact")
    Traceback (most recent call last):
    ...
    recouple.errors.BadValue: compact must be True or False, got 'no'
    """
    if isinstance(value, bool) or (none and value is None):
        return
    allowed = "True, False or None" if none else "True or False"
    raise BadValue(f"{name} must be {allowed}, got {value!r}")
