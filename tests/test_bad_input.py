"""Bad input, tried through the Python API and on the command line.

Every case below states the exact one-line message it must get.  The command
line must answer it with exit status 2, exactly one line on stderr (the message
after ``recouple: error: ``), nothing on stdout and no traceback.

The table in docs/errors.md is generated from these same cases, and a test
below checks that the document holds it verbatim, so the two cannot drift.
Regenerate it with::

    python3 tests/test_bad_input.py > /tmp/table.md   # then paste between the markers
"""

from __future__ import annotations

import io
import json
import re
from collections.abc import Callable
from dataclasses import dataclass
from fractions import Fraction
from pathlib import Path

import pytest

import recouple
from recouple import BadValue, NotationError, Radical, RecoupleError, SchemeMismatch
from recouple.cli import main
from recouple.numbers.spins import MAX_SPIN
from recouple.recoupling.evaluate import check_values, why_zero
from recouple.referee import projection
from recouple.schemes.tree import MAX_LEAVES

A, B = "((a,b)e,c)J", "(a,(b,c)f)J"
GOOD = {"a": "1/2", "b": "1/2", "c": "1/2", "e": "1", "f": "0", "J": "1/2"}
DOC = Path(__file__).resolve().parents[1] / "docs" / "errors.md"
BEGIN, END = "<!-- table: begin -->", "<!-- table: end -->"


def run(*argv: str) -> tuple[int, str, str]:
    """The command line in process: (status, stdout, stderr)."""
    out, err = io.StringIO(), io.StringIO()
    status = main(list(argv), out=out, err=err)
    return status, out.getvalue(), err.getvalue()


def sets(values: dict[str, object]) -> list[str]:
    out: list[str] = []
    for name, value in values.items():
        out += ["--set", f"{name}={value}"]
    return out


def formula() -> recouple.Formula:
    return recouple.derive(A, B).formula


def with_value(name: str, value: object) -> dict[str, object]:
    return {**GOOD, name: value}


# 100 000-character inputs: one valid-looking (a chain longer than MAX_LEAVES),
# one plainly invalid (nothing but opening brackets).
_CHAIN = [f"j{i}" for i in range(20_000)]
LONG_CHAIN = (
    "(" * (len(_CHAIN) - 1) + _CHAIN[0] + "".join(f",{x})k{i}" for i, x in enumerate(_CHAIN[1:]))
)[:100_000]
LONG_OPEN = "(" * 100_000


@dataclass(frozen=True)
class Case:
    """One bad input: what it is, the error, the key phrase and the exact message."""

    group: str
    what: str
    error: type[RecoupleError]
    key: str  # the phrase that names the problem (pytest.raises match=)
    message: str  # the exact one-line message (after "recouple: error: " on the command line)
    api: Callable[[], object] | None
    argv: tuple[str, ...] | None
    shown: str = ""  # the input as shown in the docs table (default: argv or what)


def notation(what: str, text: str, key: str, message: str, shown: str = "") -> Case:
    return Case(
        "scheme text",
        what,
        NotationError,
        key,
        message,
        lambda: recouple.parse(text),
        ("derive", text, B),
        shown or repr(text),
    )


def value(what: str, name: str, raw: str, key: str, message: str) -> Case:
    return Case(
        "values",
        what,
        BadValue,
        key,
        message,
        lambda: formula().evaluate(with_value(name, raw)),
        ("evaluate", A, B, *sets(with_value(name, raw))),
        f"{name}={raw}",
    )


RULE = "must be a non-negative integer or half-integer"

CASES: list[Case] = [
    # --- malformed notation -------------------------------------------------------
    notation(
        "missing ')'",
        "((a,b)e,c",
        "unclosed '('",
        "unclosed '(' at position 0 in '((a,b)e,c'",
    ),
    notation(
        "stray ')'",
        "((a,b)e,c)J)",
        "unmatched ')'",
        "unmatched ')' at position 11 in '((a,b)e,c)J)'",
    ),
    notation(
        "missing '('",
        "(a,b)e,c)J",
        "a comma outside any brackets",
        "a comma outside any brackets at position 6 in '(a,b)e,c)J'",
    ),
    notation(
        "empty part before ','",
        "((,b)e,c)J",
        "empty part before ','",
        "empty part before ',' at position 2 in '((,b)e,c)J'",
    ),
    notation(
        "empty part before ')'",
        "((a,b)e,)J",
        "empty part before ')'",
        "empty part before ')' at position 8 in '((a,b)e,)J'",
    ),
    notation(
        "empty brackets",
        "()J",
        "exactly two parts, found no parts",
        "a coupling needs exactly two parts, found no parts at position 0 in '()J'",
    ),
    notation(
        "one part in a coupling",
        "(a)J",
        "exactly two parts, found only one part",
        "a coupling needs exactly two parts, found only one part at position 0 in '(a)J'",
    ),
    notation(
        "three parts in one coupling",
        "(a,b,c)J",
        "exactly two parts, found 3 parts",
        "a coupling needs exactly two parts, found 3 parts at position 0 in '(a,b,c)J'",
    ),
    notation(
        "missing total label",
        "((a,b)e,c)",
        "missing label after ')'",
        "missing label after ')' at position 9 in '((a,b)e,c)'",
    ),
    notation(
        "missing inner label",
        "((a,b),c)J",
        "missing label after ')'",
        "missing label after ')' at position 5 in '((a,b),c)J'",
    ),
    notation(
        "label that starts with a digit",
        "((a,b)1e,c)J",
        "must start with a letter",
        "label '1e' must start with a letter or '_' at position 6 in '((a,b)1e,c)J'",
    ),
    notation(
        "leaf that starts with a digit",
        "((1,b)e,c)J",
        "not a digit",
        "a name must start with a letter or '_', not a digit at position 2 in '((1,b)e,c)J'",
    ),
    notation(
        "character outside identifiers",
        "((a,b)e,c-d)J",
        "character '-' (U+002D) is not allowed",
        "character '-' (U+002D) is not allowed in a scheme at position 9 in '((a,b)e,c-d)J'",
    ),
    notation(
        "non-ASCII letter as a label",
        "((a,b)é,c)J",
        "character 'é' (U+00E9) is not allowed",
        "character 'é' (U+00E9) is not allowed in a scheme at position 6 in '((a,b)é,c)J'",
    ),
    notation(
        "zero-width space",
        "(a,b)J\u200b",
        "(U+200B) is not allowed",
        "character '\\u200b' (U+200B) is not allowed in a scheme at position 6 in '(a,b)J\\u200b'",
        shown="'(a,b)J' + U+200B",
    ),
    notation(
        "full-width bracket (look-alike)",
        "（a,b）J",
        "use '('",
        "character '（' (U+FF08) is not allowed; use '(' at position 0 in '（a,b）J'",
    ),
    notation(
        "square bracket",
        "[a,b]J",
        "use '('",
        "character '[' (U+005B) is not allowed; use '(' at position 0 in '[a,b]J'",
    ),
    notation(
        "ideographic comma (look-alike)",
        "(a、b)J",
        "use ','",
        "character '、' (U+3001) is not allowed; use ',' at position 2 in '(a、b)J'",
    ),
    notation(
        "text after the total",
        "((a,b)e,c)J x",
        "text after the end of the scheme",
        "text after the end of the scheme (the total must be the outermost coupling) "
        "at position 12 in '((a,b)e,c)J x'",
    ),
    notation(
        "a lone leaf",
        "a",
        "at least two angular momenta",
        "a scheme needs at least two angular momenta coupled in brackets at position 0 in 'a'",
    ),
    notation(
        "empty text",
        "",
        "empty scheme",
        "empty scheme: write one like ((j1,j2)j12,j3)J",
    ),
    notation(
        "100 000 characters, valid-looking (too many leaves)",
        LONG_CHAIN,
        f"at most {MAX_LEAVES} may be coupled",
        f"too many angular momenta: at most {MAX_LEAVES} may be coupled at position "
        f"{LONG_CHAIN.index(f',j{MAX_LEAVES})') + 1} in "
        f"{LONG_CHAIN[:57] + '...'!r}",
        shown="'((((…(j0,j1)k0,j2)k1,…' (100 000 chars)",
    ),
    notation(
        "100 000 characters, invalid",
        LONG_OPEN,
        "unclosed '('",
        f"unclosed '(' at position 99999 in {'(' * 57 + '...'!r}",
        shown="'(' * 100 000",
    ),
    # --- schemes that cannot be compared ------------------------------------------
    notation(
        "leaf used twice",
        "((a,a)e,c)J",
        "leaf 'a' appears twice",
        "leaf 'a' appears twice (first at position 2) at position 4 in '((a,a)e,c)J'",
    ),
    notation(
        "label used twice in one scheme",
        "((a,b)e,(c,d)e)J",
        "label 'e' is used twice",
        "label 'e' is used twice (first at position 6) at position 13 in '((a,b)e,(c,d)e)J'",
    ),
    notation(
        "name both a leaf and a label",
        "((a,b)a2,(a2,d)f)J",
        "is both a leaf and a coupling label",
        "'a2' is both a leaf and a coupling label (first at position 6) at position 10 "
        "in '((a,b)a2,(a2,d)f)J'",
    ),
    Case(
        "schemes",
        "schemes over different leaves",
        SchemeMismatch,
        "couple different angular momenta",
        "the schemes couple different angular momenta: only in the first: b; only in the second: d",
        lambda: recouple.derive(A, "(a,(d,c)f)J"),
        ("derive", A, "(a,(d,c)f)J"),
        f"{A!r} vs '(a,(d,c)f)J'",
    ),
    Case(
        "schemes",
        "one label for different clusters",
        SchemeMismatch,
        "label 'e' names (a,b) in the first scheme",
        "label 'e' names (a,b) in the first scheme, (a,c) in the second",
        lambda: recouple.derive(A, "((a,c)e,b)J"),
        ("derive", A, "((a,c)e,b)J"),
        f"{A!r} vs '((a,c)e,b)J'",
    ),
    Case(
        "schemes",
        "a tree that is not a scheme",
        SchemeMismatch,
        "expected a scheme or its text",
        "expected a scheme or its text, got Leaf",
        lambda: recouple.derive(recouple.Leaf("a"), B),  # type: ignore[arg-type]
        None,
        "derive(Leaf('a'), ...)",
    ),
    Case(
        "schemes",
        "a scheme given as a number",
        NotationError,
        "written as text",
        "a scheme is written as text, got int",
        lambda: recouple.parse(5),  # type: ignore[arg-type]
        None,
        "parse(5)",
    ),
    # --- values --------------------------------------------------------------------
    Case(
        "values",
        "value missing",
        BadValue,
        "no value given for 'f'",
        "no value given for 'f' (every label of both schemes needs one: a, b, c, e, J, f)",
        lambda: formula().evaluate({k: v for k, v in GOOD.items() if k != "f"}),
        ("evaluate", A, B, *sets({k: v for k, v in GOOD.items() if k != "f"})),
        "no f=",
    ),
    Case(
        "values",
        "value for an unknown label",
        BadValue,
        "'z' is not a label",
        "'z' is not a label of either scheme (labels: a, b, c, e, J, f)",
        lambda: formula().evaluate({**GOOD, "z": 1}),
        ("evaluate", A, B, *sets({**GOOD, "z": 1})),
        "z=1",
    ),
    value("negative", "a", "-1/2", RULE, f"value of 'a' {RULE}, got '-1/2'"),
    value("not a multiple of 1/2", "a", "1/3", RULE, f"value of 'a' {RULE}, got '1/3'"),
    value("decimal not a multiple of 1/2", "a", "0.25", RULE, f"value of 'a' {RULE}, got '0.25'"),
    value("non-numeric", "a", "one", RULE, f"value of 'a' {RULE}, got 'one'"),
    value("nan", "a", "nan", RULE, f"value of 'a' {RULE}, got 'nan'"),
    value("inf", "a", "inf", RULE, f"value of 'a' {RULE}, got 'inf'"),
    value("division by zero", "a", "1/0", RULE, f"value of 'a' {RULE}, got '1/0'"),
    value("hexadecimal", "a", "0x10", RULE, f"value of 'a' {RULE}, got '0x10'"),
    value(
        "huge (j = 10^6)",
        "a",
        "1000000",
        f"above the limit MAX_SPIN = {MAX_SPIN}",
        f"value of 'a' is '1000000', above the limit MAX_SPIN = {MAX_SPIN}",
    ),
    value(
        "huge in exponent form",
        "a",
        "1e400",
        f"above the limit MAX_SPIN = {MAX_SPIN}",
        f"value of 'a' is '1e400', above the limit MAX_SPIN = {MAX_SPIN}",
    ),
    value(
        "just above the limit",
        "a",
        "1000.5",
        f"above the limit MAX_SPIN = {MAX_SPIN}",
        f"value of 'a' is '1000.5', above the limit MAX_SPIN = {MAX_SPIN}",
    ),
    Case(
        "values",
        "float nan (API)",
        BadValue,
        RULE,
        f"value of 'a' {RULE}, got nan",
        lambda: formula().evaluate(with_value("a", float("nan"))),
        None,
        "a=float('nan')",
    ),
    Case(
        "values",
        "bool (API)",
        BadValue,
        RULE,
        f"value of 'a' {RULE}, got True",
        lambda: formula().evaluate(with_value("a", True)),
        None,
        "a=True",
    ),
    Case(
        "values",
        "None (API)",
        BadValue,
        "(a number or text such as '3/2')",
        f"value of 'a' {RULE} (a number or text such as '3/2'), got None",
        lambda: formula().evaluate(with_value("a", None)),
        None,
        "a=None",
    ),
    Case(
        "values",
        "values not a mapping (referee)",
        BadValue,
        "values must map each label",
        "values must map each label to its value, got None",
        lambda: recouple.project(A, B, None),  # type: ignore[arg-type]
        None,
        "project(A, B, None)",
    ),
    Case(
        "values",
        "--set given twice for one name",
        BadValue,
        "--set given twice for 'a'",
        "--set given twice for 'a' ('1/2' and '1')",
        None,
        ("evaluate", A, B, *sets(GOOD), "--set", "a=1"),
        "--set a=1/2 ... --set a=1",
    ),
    Case(
        "values",
        "--set without '='",
        BadValue,
        "--set expects NAME=VALUE",
        "--set expects NAME=VALUE, got 'a'",
        None,
        ("evaluate", A, B, "--set", "a"),
        "--set a",
    ),
    Case(
        "values",
        "--set with an empty value",
        BadValue,
        "--set expects NAME=VALUE",
        "--set expects NAME=VALUE, got 'a='",
        None,
        ("evaluate", A, B, "--set", "a="),
        "--set a=",
    ),
    # --- symbols -------------------------------------------------------------------
    Case(
        "symbols",
        "6j entry not a multiple of 1/2",
        BadValue,
        RULE,
        f"value of 'a' {RULE}, got '1/3'",
        lambda: recouple.sixj("1/3", 1, 1, 1, 1, 1),
        ("symbol", "6j", "1/3", "1", "1", "1", "1", "1"),
        "6j 1/3 1 1 1 1 1",
    ),
    Case(
        "symbols",
        "6j float path, nan",
        BadValue,
        RULE,
        f"value of 'f' {RULE}, got 'nan'",
        lambda: recouple.sixj_float(1, 1, 1, 1, 1, "nan"),
        ("symbol", "6j", "1", "1", "1", "1", "1", "nan"),
        "6j 1 1 1 1 1 nan",
    ),
    Case(
        "symbols",
        "9j entry negative",
        BadValue,
        RULE,
        f"value of 'i' {RULE}, got '-1'",
        lambda: recouple.ninej(1, 1, 1, 1, 1, 1, 1, 1, "-1"),
        ("symbol", "9j", "1", "1", "1", "1", "1", "1", "1", "1", "-1"),
        "9j 1 1 1 1 1 1 1 1 -1",
    ),
    Case(
        "symbols",
        "doubled 6j argument negative",
        BadValue,
        "must be >= 0",
        "doubled argument 'a' (2j) must be >= 0, got -2",
        lambda: recouple.symbols.sixj_doubled(-2, 2, 2, 2, 2, 2),
        None,
        "sixj_doubled(-2, 2, 2, 2, 2, 2)",
    ),
    Case(
        "symbols",
        "doubled 3j argument a float",
        BadValue,
        "must be an int",
        "doubled argument 'm1' (2m) must be an int, got 1.0",
        lambda: recouple.symbols.threej_doubled(1, 1, 2, 1.0, 1, -2),
        None,
        "threej_doubled(1, 1, 2, 1.0, 1, -2)",
    ),
    Case(
        "symbols",
        "6j entry huge",
        BadValue,
        f"above the limit MAX_SPIN = {MAX_SPIN}",
        f"value of 'a' is '1e6', above the limit MAX_SPIN = {MAX_SPIN}",
        lambda: recouple.sixj("1e6", 1, 1, 1, 1, 1),
        ("symbol", "6j", "1e6", "1", "1", "1", "1", "1"),
        "6j 1e6 1 1 1 1 1",
    ),
    Case(
        "symbols",
        "3j projection not a multiple of 1/2",
        BadValue,
        "must be an integer or half-integer",
        "value of 'm1' must be an integer or half-integer, got '1/4'",
        lambda: recouple.threej(1, 1, 1, "1/4", 0, 0),
        ("symbol", "3j", "1", "1", "1", "1/4", "0", "0"),
        "3j 1 1 1 1/4 0 0",
    ),
    Case(
        "symbols",
        "CG projection huge",
        BadValue,
        f"beyond the limit MAX_SPIN = {MAX_SPIN}",
        f"value of 'm' is '-2000', beyond the limit MAX_SPIN = {MAX_SPIN}",
        lambda: recouple.clebsch_gordan(1, 0, 1, 0, 1, "-2000"),
        ("symbol", "cg", "1", "0", "1", "0", "1", "-2000"),
        "cg 1 0 1 0 1 -2000",
    ),
    Case(
        "symbols",
        "wrong number of entries",
        BadValue,
        "a 6j takes 6 entries",
        "a 6j takes 6 entries, got 5",
        None,
        ("symbol", "6j", "1", "1", "1", "1", "1"),
        "6j 1 1 1 1 1",
    ),
    Case(
        "symbols",
        "unknown symbol",
        BadValue,
        "unknown symbol '7j'",
        "unknown symbol '7j': choose 3j, 6j, 9j or cg",
        None,
        ("symbol", "7j", "1", "1"),
        "7j 1 1",
    ),
    # --- limits --------------------------------------------------------------------
    Case(
        "limits",
        "matrix basis too large",
        BadValue,
        "more than 5000 states",
        "the basis of '((a,b)e,c)J' has more than 5000 states; fix the total or use smaller values",
        lambda: recouple.transformation_matrix(A, B, {"a": 1000, "b": 1000, "c": 1000}),
        None,
        "transformation_matrix(a=b=c=1000)",
    ),
    Case(
        "limits",
        "referee product space too large",
        recouple.BudgetExceeded,
        "more than the referee's limit",
        "the product space of ((a,b)e,c)J has 8120601 states, more than the referee's "
        f"limit of {projection.MAX_DIMENSION}",
        lambda: recouple.project(A, B, dict.fromkeys(GOOD, 100)),
        ("evaluate", A, B, *sets(dict.fromkeys(GOOD, 100)), "--check"),
        "all labels 100, --check",
    ),
]


def _id(case: Case) -> str:
    return f"{case.group}: {case.what}"


API_CASES = [c for c in CASES if c.api is not None]
CLI_CASES = [c for c in CASES if c.argv is not None]


@pytest.mark.parametrize("case", API_CASES, ids=_id)
def test_api_message(case: Case) -> None:
    assert case.api is not None
    with pytest.raises(case.error, match=re.escape(case.key)) as info:
        case.api()
    assert info.value.one_line() == case.message
    assert "\n" not in case.message


class _QuietTimer:
    """Stands in for the CLI's one-second progress timer: never fires."""

    def __init__(self, *args: object) -> None:
        self.daemon = True

    def start(self) -> None:
        pass

    def cancel(self) -> None:
        pass


class _EagerTimer(_QuietTimer):
    """Fires at once: as if the step had taken more than a second."""

    def __init__(self, interval: float, function: Callable[[], None]) -> None:
        super().__init__()
        self.function = function

    def start(self) -> None:
        self.function()


@pytest.fixture
def quiet_progress(monkeypatch: pytest.MonkeyPatch) -> None:
    # On a busy machine parsing 100 000 characters can pass the progress line's
    # one-second mark; that interplay is pinned on its own in
    # test_bug_progress_line_before_a_notation_error, so keep it out of here.
    monkeypatch.setattr("recouple.cli.threading.Timer", _QuietTimer)


@pytest.mark.parametrize("case", CLI_CASES, ids=_id)
@pytest.mark.usefixtures("quiet_progress")
def test_cli_message(case: Case) -> None:
    assert case.argv is not None
    status, out, err = run(*case.argv)
    assert status == 2
    assert out == ""
    assert err == f"recouple: error: {case.message}\n"
    assert "Traceback" not in err


def test_every_case_is_tried_somewhere() -> None:
    assert all(c.api is not None or c.argv is not None for c in CASES)
    # Most cases go both ways; the API-only and CLI-only ones are few and named.
    both = [c for c in CASES if c.api is not None and c.argv is not None]
    assert len(both) >= 40


# ---------------------------------------------------------------------------
# Not errors: a delta between two names of the total, zero by a triangle
# ---------------------------------------------------------------------------


def test_totals_with_different_names_give_a_delta() -> None:
    d = recouple.derive(A, "(a,(b,c)f)K")
    assert d.formula.deltas == (("J", "K"),)
    assert str(d.formula).startswith("<((a,b)e,c)J|(a,(b,c)f)K> = delta(J,K) ")
    values = {**GOOD, "K": "1/2"}
    assert d.formula.evaluate(values) == recouple.project(A, "(a,(b,c)f)K", values) != 0
    values.update(f="1", K="3/2")  # every triad holds; only the delta fails
    assert d.formula.evaluate(values) == Radical(0)
    reason = "J and K name the same coupling but have different values (1/2 and 3/2)"
    assert why_zero(d.formula, check_values(d.formula, values)) == reason
    status, out, err = run("evaluate", A, "(a,(b,c)f)K", *sets(values))
    assert (status, err) == (0, "")
    assert out.splitlines()[0].startswith("<((a,b)e,c)J|(a,(b,c)f)K> = delta(J,K)")
    assert out.splitlines()[1:] == ["value = 0  (0)", f"# zero: {reason}"]


TRIANGLE_ZEROS = [
    ("e", "2", "triad (a, b, e) = (1/2, 1/2, 2) breaks the triangle condition"),
    ("e", "1/2", "triad (a, b, e) = (1/2, 1/2, 1/2) breaks the integer-sum rule"),
    ("J", "5/2", "triad (e, c, J) = (1, 1/2, 5/2) breaks the triangle condition"),
    ("f", "3", "triad (b, c, f) = (1/2, 1/2, 3) breaks the triangle condition"),
]


@pytest.mark.parametrize(("name", "raw", "reason"), TRIANGLE_ZEROS)
def test_triangle_violation_is_exact_zero_with_reason(name: str, raw: str, reason: str) -> None:
    f = formula()
    values = with_value(name, raw)
    value = f.evaluate(values)
    assert value == Radical(0)
    assert value.is_rational
    assert f.evaluate_float(values) == 0.0
    assert why_zero(f, check_values(f, values)) == reason
    # the referee agrees, exactly, and names a reason of its own
    assert recouple.project(A, B, values) == Radical(0)
    assert projection.why_zero(A, B, values) is not None
    status, out, err = run("evaluate", A, B, *sets(values))
    assert (status, err) == (0, "")
    assert out.splitlines()[1:] == ["value = 0  (0)", f"# zero: {reason}"]
    status, out, err = run("evaluate", A, B, *sets(values), "--json")
    data = json.loads(out)
    assert (status, err) == (0, "")
    assert data["exact"] == "0"
    assert data["value"] == 0.0
    assert data["zero_because"] == reason
    # a nonzero value carries no reason
    status, out, _ = run("evaluate", A, B, *sets(GOOD), "--json")
    assert "zero_because" not in json.loads(out)


def test_symbol_triangle_zero_is_exact() -> None:
    # {1/2 1/2 2; ...}: (1/2, 1/2, 2) is no triad (DLMF 34.2.1), so the 6j is 0
    assert recouple.sixj("1/2", "1/2", 2, 1, 1, 1) == Radical(0)
    assert recouple.sixj_float("1/2", "1/2", 2, 1, 1, 1) == 0.0
    status, out, err = run("symbol", "6j", "1/2", "1/2", "2", "1", "1", "1")
    assert (status, out, err) == (0, "0  (0)\n", "")


def test_limit_is_inclusive() -> None:
    # MAX_SPIN itself is accepted, and gives a real number, not an error or a float
    # overflow: {1000 1000 1000; 1000 1000 1000} against the float path
    exact = recouple.sixj(MAX_SPIN, MAX_SPIN, MAX_SPIN, MAX_SPIN, MAX_SPIN, MAX_SPIN)
    fast = recouple.sixj_float(MAX_SPIN, MAX_SPIN, MAX_SPIN, MAX_SPIN, MAX_SPIN, MAX_SPIN)
    assert exact != 0
    assert abs(float(exact) - fast) <= 1e-12 * abs(fast)
    assert recouple.parse_spin(Fraction(2 * MAX_SPIN - 1, 2)) == Fraction(2 * MAX_SPIN - 1, 2)


def test_long_valid_text_parses() -> None:
    # 100 000 characters of valid text: a MAX_LEAVES chain padded with spaces
    chain = [f"j{i}" for i in range(MAX_LEAVES)]
    text = (
        "(" * (MAX_LEAVES - 1) + chain[0] + "".join(f",{x})k{i}" for i, x in enumerate(chain[1:]))
    )
    tree = recouple.parse(text + " " * (100_000 - len(text)))
    assert len(tree) == MAX_LEAVES
    assert str(tree) == text


# ---------------------------------------------------------------------------
# Once-known bugs, now fixed: regression tests for each (first pinned as strict
# xfails, unmarked with the fix).
# ---------------------------------------------------------------------------


def test_bug_many_digit_value_names_the_limit() -> None:
    raw = "9" * 5000
    with pytest.raises(BadValue, match=r"above the limit MAX_SPIN = 1000") as info:
        formula().evaluate(with_value("a", raw))
    assert len(info.value.one_line()) < 200  # the message does not echo 5000 digits


def test_bug_values_not_a_mapping() -> None:
    with pytest.raises(BadValue, match="values must map each label"):
        formula().evaluate(None)  # type: ignore[arg-type]


@pytest.mark.parametrize(
    ("option", "bad"),
    [("max_expansions", -1), ("max_expansions", "5"), ("max_seconds", float("nan"))],
)
def test_bug_bad_budget_refused(option: str, bad: object) -> None:
    with pytest.raises(BadValue, match=option):
        recouple.derive(A, B, **{option: bad})  # type: ignore[arg-type]


def test_bug_cli_negative_budget() -> None:
    status, _, err = run("derive", A, B, "--max-expansions", "-1")
    assert status == 2
    assert "--max-expansions" in err


def test_bug_tree_with_bad_names() -> None:
    from recouple import Coupling, Leaf

    bad = Coupling(Leaf("x y"), Leaf("c"), "J")
    with pytest.raises(SchemeMismatch, match="'x y'"):
        recouple.derive(bad, Coupling(Leaf("c"), Leaf("x y"), "J"))


@pytest.mark.parametrize(
    ("left", "shown"), [("a", "str 'a'"), (None, "NoneType None"), (5, "int 5")]
)
def test_bug_tree_with_parts_that_are_not_nodes(left: object, shown: str) -> None:
    # A hand-built tree with a plain string (or None) as a part used to escape as an
    # AttributeError from the tree walk.
    from recouple import Coupling, Leaf

    bad = Coupling(Coupling(left, Leaf("b"), "e"), Leaf("c"), "J")  # type: ignore[arg-type]
    message = f"a scheme is built of Leaf and Coupling parts, got {shown}"
    for call in (
        lambda: recouple.derive(bad, B),
        lambda: recouple.verify(bad, B, GOOD),
        lambda: recouple.transformation_matrix(bad, B, {"a": 1, "b": 1, "c": 1}),
    ):
        with pytest.raises(SchemeMismatch, match=re.escape(message)):
            call()


def test_bug_progress_line_before_a_notation_error(monkeypatch: pytest.MonkeyPatch) -> None:
    # A scheme that is slow to read (here: as if > 1 s) must still give one line.
    monkeypatch.setattr("recouple.cli.threading.Timer", _EagerTimer)
    status, _, err = run("derive", LONG_OPEN, B)
    assert status == 2
    assert err.count("\n") == 1
    assert err.startswith("recouple: error: unclosed '('")


@pytest.mark.parametrize(
    ("argv", "message"),
    [
        (("evaluate", A, B, *sets(with_value("a", "1/3"))), f"value of 'a' {RULE}, got '1/3'"),
        (("evaluate", A, B, *sets(GOOD), "--set", "z=1"), "'z' is not a label of either"),
        (("evaluate", A, B, "--set", "a=1/2"), "no value given for 'b'"),
        (("matrix", A, B, "--set", "a=1/3", "--set", "b=1", "--set", "c=1"), "value of 'a'"),
        (("matrix", A, B, "--set", "a=1"), "no value given for leaf 'b', 'c'"),
    ],
    ids=[
        "evaluate bad value",
        "evaluate unknown label",
        "evaluate missing",
        "matrix bad value",
        "matrix missing leaf",
    ],
)
def test_bug_bad_values_fail_before_the_search(
    monkeypatch: pytest.MonkeyPatch, argv: tuple[str, ...], message: str
) -> None:
    # Values were checked only after the derivation: a search of seconds, a progress
    # line, then the error (two lines on stderr). Now they fail first: the search is
    # never started and no progress line appears even when the timer fires at once.
    monkeypatch.setattr("recouple.cli.threading.Timer", _EagerTimer)

    def no_search(*args: object, **kwargs: object) -> None:
        raise AssertionError("derive() ran before the values were checked")

    monkeypatch.setattr("recouple.recoupling.derive.derive", no_search)
    monkeypatch.setattr("recouple.recoupling.matrix.derive", no_search)
    status, out, err = run(*argv)
    assert (status, out) == (2, "")
    assert err.count("\n") == 1
    assert err.startswith(f"recouple: error: {message}")


def test_bug_symbol_entries_fail_before_the_progress_line(
    monkeypatch: pytest.MonkeyPatch,
) -> None:
    # `symbol` says it is computing when the value takes more than a second (an exact
    # 9j at j ~ 1000 takes minutes); a bad entry must still fail first, on one line.
    monkeypatch.setattr("recouple.cli.threading.Timer", _EagerTimer)
    status, out, err = run("symbol", "9j", "1", "1", "1", "1", "1", "1", "1", "1", "x")
    assert (status, out) == (2, "")
    assert err == f"recouple: error: value of 'i' {RULE}, got 'x'\n"
    status, out, err = run("symbol", "cg", "1", "1/4", "1", "0", "1", "1/4")
    assert (status, out) == (2, "")
    assert err == "recouple: error: value of 'm1' must be an integer or half-integer, got '1/4'\n"
    status, out, err = run("symbol", "6j", "1", "1", "1", "1", "1", "1")
    assert (status, out) == (0, "1/6  (0.166666666666667)\n")
    assert err == "recouple: computing the symbol ...\n"


def test_bug_api_values_fail_before_the_search(monkeypatch: pytest.MonkeyPatch) -> None:
    def no_search(*args: object, **kwargs: object) -> None:
        raise AssertionError("derive() ran before the values were checked")

    monkeypatch.setattr("recouple.verification.derive", no_search)
    monkeypatch.setattr("recouple.recoupling.matrix.derive", no_search)
    with pytest.raises(BadValue, match=re.escape(f"value of 'a' {RULE}, got '1/3'")):
        recouple.verify(A, B, with_value("a", "1/3"))
    with pytest.raises(BadValue, match="no value given for leaf 'c'"):
        recouple.transformation_matrix(A, B, {"a": 1, "b": 1})


@pytest.mark.parametrize("values", [None, [("a", 1), ("b", 1), ("c", 1)]], ids=["None", "list"])
def test_bug_matrix_values_not_a_mapping(values: object) -> None:
    # None used to escape as TypeError; a list of pairs got "('a', 1) cannot be set"
    with pytest.raises(BadValue, match="values must map each leaf to its value, got "):
        recouple.transformation_matrix(A, B, values)  # type: ignore[arg-type]


@pytest.mark.parametrize("path", [False, True], ids=["tree", "path"])
def test_bug_draw_title_bad_mathtext(
    monkeypatch: pytest.MonkeyPatch, tmp_path: Path, path: bool
) -> None:
    # Used to be an internal error (exit 1) with a many-line matplotlib message;
    # now refused before the search and before any progress line.
    monkeypatch.setattr("recouple.cli.threading.Timer", _EagerTimer)
    schemes = (A, B, "--path") if path else (A,)
    status, out, err = run("draw", *schemes, "-o", str(tmp_path / "t.png"), "--title", "$x^$")
    assert (status, out) == (2, "")
    assert err == (
        "recouple: error: --title '$x^$' is not valid mathtext (the parts between '$' "
        "signs); write \\$ for a dollar sign\n"
    )
    assert not (tmp_path / "t.png").exists()


# ---------------------------------------------------------------------------
# The docs table
# ---------------------------------------------------------------------------


def _cell(text: str) -> str:
    return "`" + text.replace("|", "\\|").replace("`", "'") + "`"


def table() -> str:
    """The markdown table of docs/errors.md, from CASES."""
    lines = [
        "| group | bad input | tried | error | message |",
        "| --- | --- | --- | --- | --- |",
    ]
    for c in CASES:
        tried = " + ".join(x for x, on in (("API", c.api), ("CLI", c.argv)) if on is not None)
        shown = c.shown or c.what
        lines.append(
            f"| {c.group} | {c.what}: {_cell(shown)} | {tried} | {c.error.__name__} "
            f"| {_cell(c.message)} |"
        )
    return "\n".join(lines)


def test_docs_table_matches_the_cases() -> None:
    text = DOC.read_text(encoding="utf-8")
    start, stop = text.index(BEGIN) + len(BEGIN), text.index(END)
    assert text[start:stop].strip() == table(), "regenerate: python3 tests/test_bad_input.py"


if __name__ == "__main__":
    print(table())


@pytest.mark.parametrize("flag", ["no", "", 1, 0, None, 0.0])
def test_bug_derive_compact_must_be_a_bool(flag: object) -> None:
    # derive(compact="no") used to run the fewer-sums search: any truthy object was
    # taken as True.
    with pytest.raises(BadValue, match=r"^compact must be True or False, got "):
        recouple.derive("((a,b)e,c)J", "(a,(b,c)f)J", compact=flag)  # type: ignore[arg-type]


@pytest.mark.parametrize("flag", ["x", "False", 1, 0])
def test_bug_exact_must_be_a_bool_or_none(flag: object) -> None:
    # verify(exact="x") and project(exact=1) used to be taken as truthy; None stays
    # the documented "exact when small".
    values = {"a": 1, "b": 1, "c": 1, "e": 1, "f": 1, "J": 1}
    with pytest.raises(BadValue, match=r"^exact must be True, False or None, got "):
        recouple.verify("((a,b)e,c)J", "(a,(b,c)f)J", values, exact=flag)  # type: ignore[arg-type]
    with pytest.raises(BadValue, match=r"^exact must be True, False or None, got "):
        projection.project("(a,b)c", "(b,a)c", {"a": 1, "b": 1, "c": 1}, exact=flag)  # type: ignore[arg-type]
    assert recouple.verify("((a,b)e,c)J", "(a,(b,c)f)J", values, exact=None).agree


@pytest.mark.parametrize("writer", ["formula_latex", "latex_document", "formula_python"])
@pytest.mark.parametrize("thing", [None, "<((a,b)e,c)J|(a,(b,c)f)J>", 5])
def test_bug_writers_refuse_what_is_not_a_formula(writer: str, thing: object) -> None:
    # latex_document(None) used to end in an AttributeError deep inside the writer.
    from recouple.outputs import latex, pycode

    write = getattr(latex, writer, None) or getattr(pycode, writer)
    message = rf"^{writer} needs a Formula .*, got {type(thing).__name__}$"
    with pytest.raises(TypeError, match=message):
        write(thing)


def test_bug_referee_too_large_fails_before_the_search(monkeypatch: pytest.MonkeyPatch) -> None:
    # evaluate --check with a product space above the referee's limit used to run the
    # search first (seconds, a progress line) and only then fail; now it fails first.
    monkeypatch.setattr("recouple.cli.threading.Timer", _EagerTimer)

    def no_search(*args: object, **kwargs: object) -> None:
        raise AssertionError("derive() ran before the referee's size was checked")

    monkeypatch.setattr("recouple.recoupling.derive.derive", no_search)
    sets = ["--set", "a=800", "--set", "b=800", "--set", "c=800", "--set", "e=0"]
    sets += ["--set", "f=800", "--set", "J=800"]
    status, out, err = run("evaluate", "((a,b)e,c)J", "(a,(b,c)f)J", *sets, "--check")
    assert (status, out) == (2, "")
    assert err.count("\n") == 1
    assert err.startswith("recouple: error: the product space of ")
    assert "more than the referee's limit of 2097152" in err
