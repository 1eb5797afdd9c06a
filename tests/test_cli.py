"""The command line, in process through ``main(argv, out=, err=)``, plus one subprocess
smoke test each for ``python -m recouple`` and the console script; the commands shown
in docs/tutorial.md and docs/commands.md are run here too, so the docs stay true."""

from __future__ import annotations

import io
import json
import re
import shlex
import shutil
import subprocess
import sys
import xml.etree.ElementTree as ET
from fractions import Fraction
from pathlib import Path

import pytest

import recouple
from recouple import derive, transformation_matrix
from recouple.cli import main
from recouple.outputs.table import matrix_json

DOCS = Path(__file__).resolve().parents[1] / "docs"
JJ = "((l1,s1)j1,(l2,s2)j2)J"
LS = "((l1,l2)L,(s1,s2)S)J"
P_AND_D = ["--set", "l1=1", "--set", "l2=2", "--set", "s1=1/2", "--set", "s2=1/2"]
THREE = ("((a,b)e,c)J", "(a,(b,c)f)J")
HALVES = ["--set", "a=1/2", "--set", "b=1/2", "--set", "c=1/2"]


def run(*argv: str) -> tuple[int, str, str]:
    out, err = io.StringIO(), io.StringIO()
    status = main(list(argv), out=out, err=err)
    return status, out.getvalue(), err.getvalue()


def ok(*argv: str) -> str:
    status, out, err = run(*argv)
    assert status == 0, err
    # stderr carries nothing but progress notes ("recouple: drawing the path ...")
    assert all(re.fullmatch(r"recouple: [a-z ]+ \.\.\.", line) for line in err.splitlines()), err
    return out


# ---------------------------------------------------------------------------
# derive
# ---------------------------------------------------------------------------


def test_derive_text_and_moves() -> None:
    out = ok("derive", *THREE)
    assert out.splitlines()[0] == str(derive(*THREE).formula)
    assert "shortest Racah path: 1 move(s), proven shortest" in out
    out = ok("derive", *THREE, "--moves")
    assert "#  1. 6j {a b e; c J f}: ((a,b)e,c)J -> (a,(b,c)f)J" in out
    assert "absent from the formula" not in out  # nothing summed on this path


def test_derive_moves_names_labels_folded_away() -> None:
    # LS-jj: the plain path sums over x1, the formula is one 9j with no sum.
    out = ok("derive", JJ, LS, "--moves")
    assert derive(JJ, LS).formula.sums == ()
    assert "x1" in out.split("# shortest Racah path")[1]
    assert out.rstrip().endswith(
        "# x1: summed along this path, absent from the formula above"
        " (folded by a 9j, a sum rule or a path with 9j moves)"
    )


def test_derive_json() -> None:
    data = json.loads(ok("derive", JJ, LS, "--json"))
    d = derive(JJ, LS)
    assert data["from"] == JJ
    assert data["to"] == LS
    assert data["symbols"] == {"6j": 0, "9j": 1}
    assert data["steps"] == 3
    assert data["optimal"] is True
    assert data["moves"] == [m.describe() for m in d.moves]
    assert data["text"] == str(d.formula)


def test_derive_latex_line_and_document() -> None:
    line = ok("derive", JJ, LS, "--latex").strip()
    assert line == derive(JJ, LS).formula.latex()
    assert r"\begin{Bmatrix}" in line
    doc = ok("derive", JJ, LS, "--latex", "--standalone")
    assert doc.lstrip().startswith(r"\documentclass")
    assert r"\begin{document}" in doc
    assert doc.rstrip().endswith(r"\end{document}")


def test_derive_python_function_evaluates_like_the_formula() -> None:
    code = ok("derive", "((a,b)e,(c,d)f)J", "((a,c)g,(b,d)h)J", "--python")
    namespace: dict[str, object] = {}
    exec(compile(code, "<derive --python>", "exec"), namespace)
    overlap = namespace["overlap"]
    assert callable(overlap)
    values = {"a": Fraction(1, 2), "b": 1, "c": Fraction(3, 2), "d": 1}
    values |= {"e": Fraction(3, 2), "f": Fraction(3, 2), "g": 1, "h": 2, "J": 2}
    expected = derive("((a,b)e,(c,d)f)J", "((a,c)g,(b,d)h)J").formula.evaluate(values)
    assert float(overlap(**values)) == pytest.approx(float(expected), abs=1e-14)  # type: ignore[operator]


# ---------------------------------------------------------------------------
# evaluate and symbol
# ---------------------------------------------------------------------------


def test_evaluate_check_json() -> None:
    data = json.loads(
        ok(
            "evaluate",
            *THREE,
            *HALVES,
            "--set",
            "e=1",
            "--set",
            "f=0",
            "--set",
            "J=1/2",
            "--check",
            "--json",
        )  # fmt: skip
    )
    assert data["exact"] == "(1/2)*sqrt(3)"
    assert data["agree"] is True
    assert data["projection"] == pytest.approx(3**0.5 / 2, abs=1e-15)  # referee's own value


def test_symbol_json_and_text() -> None:
    data = json.loads(ok("symbol", "6j", "1", "2", "3", "2", "1", "2", "--json"))
    assert data["exact"] == str(recouple.sixj(1, 2, 3, 2, 1, 2))
    assert data["symbol"] == "6j"
    assert ok("symbol", "cg", "1/2", "1/2", "1/2", "-1/2", "1", "0").startswith("sqrt(1/2)")


# ---------------------------------------------------------------------------
# matrix
# ---------------------------------------------------------------------------


def test_matrix_text() -> None:
    out = ok("matrix", JJ, LS, *P_AND_D, "--set", "J=2")
    m = transformation_matrix(JJ, LS, {"l1": 1, "l2": 2, "s1": "1/2", "s2": "1/2", "J": 2})
    assert "J=2: 4 x 4" in out
    assert "j1=1/2 j2=3/2" in out
    assert "L=1 S=1" in out
    assert f"max |M M^T - 1| = {m.orthogonality_error:.1e}: orthogonal to 1e-12" in out
    for line in m.exact:
        for x in line:
            assert str(x) in out
    assert "exact" not in ok("matrix", JJ, LS, *P_AND_D, "--set", "J=2", "--float-only")


def test_matrix_json_equals_the_api() -> None:
    data = json.loads(ok("matrix", JJ, LS, *P_AND_D, "--json"))
    m = transformation_matrix(JJ, LS, {"l1": 1, "l2": 2, "s1": "1/2", "s2": "1/2"})
    assert data == json.loads(json.dumps(matrix_json(m)))
    for key in ("rows", "columns", "matrix", "exact", "orthogonal", "from", "to", "leaves"):
        assert key in data
    assert data["rows"][0] == {"j1": "1/2", "j2": "3/2", "J": "1"}
    lean = json.loads(ok("matrix", JJ, LS, *P_AND_D, "--json", "--float-only"))
    assert "exact" not in lean


def test_matrix_csv_to_stdout_and_file(tmp_path: Path) -> None:
    out = ok("matrix", *THREE, *HALVES, "--csv", "-", "--float-only")
    assert out.splitlines() == [
        "FROM \\ TO,f=0 J=1/2,f=1 J=1/2,f=1 J=3/2",
        "e=0 J=1/2,-0.5,0.8660254037844386,0.0",
        "e=1 J=1/2,0.8660254037844386,0.5,0.0",
        "e=1 J=3/2,0.0,0.0,1.0",
    ]  # 1/2 and sqrt(3)/2: the 6j values of DLMF 34.4.2 at j = 1/2 (checked in test_matrix)
    target = tmp_path / "m.csv"
    printed = ok("matrix", *THREE, *HALVES, "--csv", str(target))
    assert f"CSV written to {target}" in printed
    assert target.read_text(encoding="utf-8").splitlines()[1] == "e=0 J=1/2,-1/2,(1/2)*sqrt(3),0"
    data = json.loads(ok("matrix", *THREE, *HALVES, "--csv", str(target), "--json"))
    assert data["csv"] == str(target)


# ---------------------------------------------------------------------------
# draw
# ---------------------------------------------------------------------------


def _svg_texts(path: Path) -> str:
    root = ET.parse(path).getroot()
    return " ".join("".join(el.itertext()) for el in root.iter() if el.tag.endswith("text"))


def test_draw_tree_in_every_format(tmp_path: Path) -> None:
    pytest.importorskip("matplotlib")
    for ext, magic in ((".svg", b"<?xml"), (".png", b"\x89PNG"), (".pdf", b"%PDF")):
        target = tmp_path / f"tree{ext}"
        out = ok("draw", "((j1,j2)j12,(j3,j4)j34)J", "-o", str(target))
        assert out.strip() == f"wrote {target} (one tree)"
        assert target.read_bytes().startswith(magic)


def test_draw_path_annotates_every_move(tmp_path: Path) -> None:
    pytest.importorskip("matplotlib")
    target = tmp_path / "path.svg"
    line = ok("draw", "((a,b)e,(c,d)f)J", "((a,c)g,(b,d)h)J", "--path", "-o", str(target), "--json")
    assert len(line.splitlines()) == 1
    data = json.loads(line)
    d = derive("((a,b)e,(c,d)f)J", "((a,c)g,(b,d)h)J")
    assert data["moves"] == [m.describe() for m in d.moves]
    assert data["trees"] == [str(t) for t in d.path]
    assert data["format"] == "svg"
    texts = _svg_texts(target)
    for i, move in enumerate(d.moves, 1):
        assert f"step {i}" in texts
        assert move.describe().split()[0] in texts  # "6j" or "exchange"


# ---------------------------------------------------------------------------
# help, version, exit status
# ---------------------------------------------------------------------------


def test_help_lists_commands_and_every_command_has_examples() -> None:
    top = ok("--help")
    for command in ("derive", "evaluate", "matrix", "draw", "symbol"):
        assert command in top
        text = ok(command, "--help")
        assert f"usage: recouple {command}" in text
        assert "example" in text
        assert f"recouple {command} " in text.split("example", 1)[1]
    assert ok("--version").strip() == f"recouple {recouple.__version__}"


@pytest.mark.parametrize("command", ["", "derive", "evaluate", "matrix", "draw", "symbol"])
def test_help_examples_run(command: str, tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    pytest.importorskip("matplotlib")
    monkeypatch.chdir(tmp_path)
    text = ok(*([command] if command else []), "--help").split("example", 1)[1]
    lines = text.splitlines()
    examples: list[str] = []
    for line in lines:
        if line.startswith("  recouple "):
            examples.append(line.strip())
        elif examples and examples[-1].endswith("\\"):
            examples[-1] = examples[-1][:-1] + " " + line.strip()
    assert examples
    for example in examples:
        assert ok(*shlex.split(example)[1:]), example


BAD_INPUT = [
    (["derive", "((a,b)e,c", "(a,(b,c)f)J"], "unclosed"),
    (["derive", "((a,b)e,c)J", "(a,(b,d)f)J"], "different angular momenta"),
    (["derive", "((a,b)e,c)J", "((a,c)e,b)J"], "label 'e' names"),
    (["derive", "((a,b)e,c)J"], "required"),
    (["derive", *THREE, "--latex", "--json"], "not allowed"),
    (["evaluate", *THREE, "--set", "a=1/2"], "b"),
    (["evaluate", *THREE, "--set", "a"], "NAME=VALUE"),
    (
        [
            "evaluate",
            *THREE,
            *HALVES[:4],
            "--set",
            "c=1/3",
            "--set",
            "e=1",
            "--set",
            "f=1",
            "--set",
            "J=1/2",
        ],
        "'1/3'",
    ),  # fmt: skip
    (["evaluate", *THREE, "--set", "a=1/2", "--set", "a=1"], "given twice"),
    (["matrix", *THREE, "--set", "a=1/2", "--set", "b=1/2"], "no value given for leaf 'c'"),
    (["matrix", *THREE, *HALVES[:4], "--set", "c=1/3"], "'1/3'"),
    (["matrix", *THREE, *HALVES, "--set", "c=1"], "given twice"),
    (["matrix", *THREE, *HALVES, "--set", "e=1"], "'e' cannot be set"),
    (["matrix", *THREE, *HALVES, "--set", "J=7"], "no basis state has J=7"),
    (["matrix", *THREE, *HALVES, "--set", "J=-1"], "non-negative"),
    (["matrix", *THREE, *HALVES, "--csv", "-", "--json"], "--csv -"),
    (["matrix", "(a,b)J", "(a,b)K,c"], "position"),
    (["draw", "((a,b)e,c)J"], "give an output file with -o"),
    (["draw", "((a,b)e,c)J", "-o", "tree.jpg"], "'.jpg'"),
    (["draw", "((a,b)e,c)J", "-o", "tree"], "without an extension"),
    (["draw", "((a,b)e,c)J", "--path", "-o", "p.svg"], "--path needs two schemes"),
    (["draw", *THREE, "-o", "p.svg"], "add --path"),
    (["draw", "((a,b)e,c", "-o", "p.svg"], "unclosed"),
    (["symbol", "7j", "1", "2", "3", "1", "2", "3"], "unknown symbol '7j'"),
    (["symbol", "6j", "1", "2", "3"], "takes 6 entries, got 3"),
    (["symbol", "9j", "1", "2", "3", "1", "2", "3"], "takes 9 entries, got 6"),
    (["symbol", "6j", "1", "2", "3", "1/3", "2", "3"], "'1/3'"),
    (["frobnicate"], "invalid choice"),
    (["derive", *THREE, "--max-expansions", "many"], "expected a whole number >= 0"),
    # entries that start like negative numbers are values, so the value parser names
    # the fault (they used to be "unrecognized arguments")
    (["symbol", "3j", "1", "1", "1", "-nan", "0", "0"], "value of 'm1' must be an integer"),
    (["symbol", "cg", "1", "-inf", "1", "0", "1", "0"], "value of 'm1' must be an integer"),
    (["symbol", "cg", "1", "-1e5", "1", "0", "1", "0"], "'-1e5', beyond the limit MAX_SPIN"),
    (["derive", *THREE, "--max-seconds", "-1e3"], "expected seconds >= 0, got '-1e3'"),
    # --standalone without --latex used to be ignored silently
    (["derive", *THREE, "--standalone"], "use it with --latex"),
    (["derive", *THREE, "--python", "--standalone"], "use it with --latex"),
]


@pytest.mark.parametrize(("argv", "fragment"), BAD_INPUT)
def test_bad_input_gives_one_line_and_status_2(argv: list[str], fragment: str) -> None:
    status, out, err = run(*argv)
    assert status == 2
    assert out == ""
    assert err.endswith("\n")
    assert err.count("\n") == 1, err
    assert "Traceback" not in err
    assert err.startswith("recouple")
    assert fragment in err


def test_negative_entries_in_exponent_form_are_values() -> None:
    # <1 -1 1 1|1 0> = -1/sqrt(2) (Condon-Shortley; sympy.physics.wigner.clebsch_gordan)
    assert (
        ok("symbol", "cg", "1", "-1e0", "1", "1", "1", "0") == "-sqrt(1/2)  (-0.707106781186548)\n"
    )
    assert ok("symbol", "cg", "1", "-1", "1", "1", "1", "0") == "-sqrt(1/2)  (-0.707106781186548)\n"


def test_python_function_name_steps_aside_for_a_label() -> None:
    # A total named 'overlap' used to be refused ("pick another"), which the command
    # line gives no way to do; the function is now called overlap_.
    source = ok("derive", "((a,b)e,c)overlap", "(a,(b,c)f)overlap", "--python")
    assert "\ndef overlap_(*, a, b, c, e, overlap, f):\n" in source
    namespace: dict[str, object] = {}
    exec(source, namespace)  # noqa: S102 - our own generated code
    values = {"a": "1/2", "b": "1/2", "c": "1/2", "e": 1, "f": 0, "overlap": "1/2"}
    expected = derive("((a,b)e,c)overlap", "(a,(b,c)f)overlap").formula.evaluate(values)
    assert namespace["overlap_"](**values) == expected  # type: ignore[operator]


class _ClosedPipe(io.StringIO):
    """stdout whose reader has gone away, as under ``recouple ... | head``."""

    def write(self, text: str) -> int:
        raise BrokenPipeError(32, "Broken pipe")


def test_closed_pipe_is_not_an_internal_error() -> None:
    # Used to print "internal error (BrokenPipeError ...)" and exit 1.
    err = io.StringIO()
    status = main(["derive", *THREE], out=_ClosedPipe(), err=err)
    assert (status, err.getvalue()) == (141, "")


def test_closed_pipe_subprocess() -> None:
    # the reading end is closed before the child writes anything
    child = subprocess.Popen(
        [sys.executable, "-m", "recouple", "derive", *THREE],
        stdout=subprocess.PIPE,
        stderr=subprocess.PIPE,
    )
    assert child.stdout is not None
    assert child.stderr is not None
    child.stdout.close()
    stderr = child.stderr.read()
    child.stderr.close()
    assert (child.wait(timeout=120), stderr) == (141, b"")


def test_unwritable_output_is_bad_input(tmp_path: Path) -> None:
    missing = tmp_path / "no" / "such" / "dir"
    status, _, err = run("draw", "(a,b)J", "-o", str(missing / "t.svg"))
    assert status == 2
    assert "cannot write" in err
    assert err.count("\n") == 1
    status, _, err = run("matrix", "(a,b)J", "(b,a)J", "--set", "a=1", "--set", "b=1",
                         "--csv", str(missing / "m.csv"))  # fmt: skip
    assert status == 2
    assert "cannot write" in err


def test_bad_output_names_fail_before_the_work(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    # The file name is checked before the matrix is built or the path searched: the
    # builders are replaced by a fault, so reaching them would be status 1, not 2.
    import recouple.outputs.drawing as drawing
    import recouple.recoupling.matrix as matrix

    def never(*args: object, **kwargs: object) -> None:
        raise RuntimeError("the work started before the file name was checked")

    monkeypatch.setattr(matrix, "transformation_matrix", never)
    monkeypatch.setattr(drawing, "draw_path", never)
    monkeypatch.setattr(drawing, "draw_tree", never)
    cases = [
        (["matrix", *THREE, *HALVES, "--csv", ""], "--csv: empty file name"),
        (["matrix", *THREE, *HALVES, "--csv", str(tmp_path)], "is a directory"),
        (["matrix", *THREE, *HALVES, "--csv", str(tmp_path / "no" / "m.csv")], "does not exist"),
        (["draw", *THREE, "--path", "-o", str(tmp_path / "no" / "p.svg")], "does not exist"),
        (["draw", "(a,b)J", "-o", str(tmp_path / "t.svg"), "--max-seconds", "2"], "--path"),
        (["draw", "(a,b)J", "-o", str(tmp_path / "t.svg"), "--max-expansions", "9"], "--path"),
    ]
    for argv, words in cases:
        status, out, err = run(*argv)
        assert (status, out) == (2, ""), (argv, err)
        assert words in err, (argv, err)
        assert err.count("\n") == 1, (argv, err)


def test_internal_error_is_status_1_and_one_line(monkeypatch: pytest.MonkeyPatch) -> None:
    import recouple.symbols.values as sv

    def broken(*args: object) -> None:
        raise RuntimeError("simulated fault")

    monkeypatch.setattr(sv, "sixj", broken)
    status, out, err = run("symbol", "6j", "1", "2", "3", "2", "1", "2")
    assert status == 1
    assert err.count("\n") == 1
    assert "internal error (RuntimeError: simulated fault)" in err


# ---------------------------------------------------------------------------
# The docs' commands run as written
# ---------------------------------------------------------------------------


def doc_commands(path: Path) -> list[tuple[list[str], str | None]]:
    """``$ recouple ...`` lines in fenced blocks (with ``\\`` continuations), and the
    error line the docs show right after a command (None when they show none)."""
    lines = path.read_text(encoding="utf-8").splitlines()
    found: list[tuple[list[str], str | None]] = []
    i = 0
    while i < len(lines):
        line = lines[i].strip()
        if line.startswith("$ recouple "):
            text = line[2:]
            while text.endswith("\\"):
                i += 1
                text = text[:-1] + " " + lines[i].strip()
            following = lines[i + 1].strip() if i + 1 < len(lines) else ""
            error = following if following.startswith("recouple: error:") else None
            found.append((shlex.split(text)[1:], error))
        i += 1
    return found


@pytest.mark.parametrize("doc", ["tutorial.md", "commands.md"])
def test_documented_commands_run(doc: str, tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    pytest.importorskip("matplotlib")
    monkeypatch.chdir(tmp_path)  # drawings and CSV files land in a scratch folder
    commands = doc_commands(DOCS / doc)
    assert len(commands) >= 8, f"{doc} shows too few commands"
    for argv, error in commands:
        status, out, err = run(*argv)
        if error is None:
            assert status == 0, (argv, err)
            assert out, argv
        else:
            assert status == 2, argv
            assert err.strip() == error


def test_tutorial_shows_real_output() -> None:
    """Every output block the tutorial prints right after a derive command is current."""
    text = (DOCS / "tutorial.md").read_text(encoding="utf-8")
    shown = re.findall(r"\$ recouple derive (\"[^\"]+\" \"[^\"]+\")\n(<[^\n]+)", text)
    assert shown, "the tutorial should show a derived formula"
    for schemes, formula in shown:
        source, target = shlex.split(schemes)
        assert formula == str(derive(source, target).formula)


def test_tutorial_python_session() -> None:
    import doctest

    text = (DOCS / "tutorial.md").read_text(encoding="utf-8")
    blocks = re.findall(r"```python\n(.*?)```", text, flags=re.S)
    assert blocks, "the tutorial should show the Python API"
    parser, runner = doctest.DocTestParser(), doctest.DocTestRunner(optionflags=doctest.ELLIPSIS)
    for n, block in enumerate(blocks):
        test = parser.get_doctest(block, {}, f"tutorial python block {n}", "tutorial.md", 0)
        assert test.examples
        runner.run(test, out=lambda s: None)
    assert runner.summarize(verbose=False).failed == 0


# ---------------------------------------------------------------------------
# Subprocess smoke tests: the module entry point and the console script
# ---------------------------------------------------------------------------


def test_python_m_recouple_derive() -> None:
    done = subprocess.run(
        [sys.executable, "-m", "recouple", "derive", *THREE],
        capture_output=True,
        text=True,
        timeout=120,
        check=False,
    )
    assert done.returncode == 0, done.stderr
    assert done.stdout.splitlines()[0] == str(derive(*THREE).formula)


def test_console_script_version() -> None:
    script = shutil.which("recouple") or str(Path(sys.executable).with_name("recouple"))
    if not Path(script).exists():
        pytest.skip("the console script is not installed (pip install -e .)")
    done = subprocess.run(
        [script, "--version"], capture_output=True, text=True, timeout=120, check=False
    )
    assert done.returncode == 0
    assert done.stdout.strip() == f"recouple {recouple.__version__}"
