"""The ``recouple`` command line: the only place that parses argv, prints or exits.

Every command returns an exit status: 0 on success, 2 on bad input (one line on
stderr, no traceback), 1 on an unexpected internal error (a plain message asking
for a report).
"""

from __future__ import annotations

import argparse
import json
import os
import re
import sys
import textwrap
import threading
from collections.abc import Callable, Iterator, Sequence
from contextlib import contextmanager, redirect_stdout, suppress
from pathlib import Path
from typing import Any, NoReturn, TextIO

from recouple import __version__
from recouple.errors import BadValue, RecoupleError

__all__ = ["main"]

PROG = "recouple"

_EPILOG_MAIN = """\
examples:
  recouple derive "((a,b)e,c)J" "(a,(b,c)f)J"
  recouple derive "((l1,s1)j1,(l2,s2)j2)J" "((l1,l2)L,(s1,s2)S)J" --latex
  recouple evaluate "((a,b)e,c)J" "(a,(b,c)f)J" --set a=1/2 --set b=1/2 --set c=1/2 \\
      --set e=1 --set f=0 --set J=1/2 --check
  recouple matrix "((l1,s1)j1,(l2,s2)j2)J" "((l1,l2)L,(s1,s2)S)J" --set l1=1 --set l2=2 \\
      --set s1=1/2 --set s2=1/2 --set J=2
  recouple draw "((a,b)e,c)J" "(a,(b,c)f)J" --path -o path.svg
  recouple symbol 6j 1 2 3 2 1 2

Every command takes --json for output that other programs read, and --help for
its options and examples. Exit status: 0 done, 2 bad input (one line on stderr),
1 internal error.

Conventions: Condon-Shortley phases; (a,b)c couples a first (a fills the first slot
of the Clebsch-Gordan coefficient). Results hold in these conventions only: check a
few numbers against your own code before you rely on them (docs/conventions.md).
"""


def _wrap(text: str) -> str:
    """A help paragraph wrapped for an 80-column terminal."""
    return textwrap.fill(text, 78)


class _Parser(argparse.ArgumentParser):
    """argparse with one-line errors and exit status 2.

    Anything that starts like a negative number (``-1/2``, ``-1e3``, ``-.5``, also
    ``-nan`` and ``-inf``) is read as a value, not as an unknown option, so the
    value parser can accept it or say what is wrong with it.
    """

    def __init__(self, *args: Any, **kwargs: Any) -> None:
        super().__init__(*args, **kwargs)
        self._negative_number_matcher = re.compile(r"^-(\d|\.\d|(inf|infinity|nan)$)", re.I)

    def error(self, message: str) -> NoReturn:
        raise _UsageError(f"{self.prog}: {message} (see '{self.prog} --help')")


class _UsageError(Exception):
    pass


def _parse_sets(items: Sequence[str] | None) -> dict[str, str]:
    """``NAME=VALUE`` pairs from repeated ``--set``; a name given twice is an error."""
    out: dict[str, str] = {}
    for item in items or ():
        name, sep, value = item.partition("=")
        name, value = name.strip(), value.strip()
        if not sep or not name or not value:
            raise BadValue(f"--set expects NAME=VALUE, got {item!r}")
        if name in out:
            raise BadValue(f"--set given twice for {name!r} ({out[name]!r} and {value!r})")
        out[name] = value
    return out


@contextmanager
def _progress(message: str, stream: TextIO) -> Iterator[None]:
    """Say ``message`` on stderr if the block takes more than a second."""
    timer = threading.Timer(1.0, lambda: print(f"{PROG}: {message} ...", file=stream, flush=True))
    timer.daemon = True
    timer.start()
    try:
        yield
    finally:
        timer.cancel()


def _search_options(args: argparse.Namespace) -> dict[str, Any]:
    options: dict[str, Any] = {}
    if args.max_expansions is not None:
        options["max_expansions"] = args.max_expansions
    if args.max_seconds is not None:
        options["max_seconds"] = args.max_seconds
    return options


def _derive(
    args: argparse.Namespace,
    err: TextIO,
    values: dict[str, str] | None = None,
    *,
    projecting: bool = False,
) -> Any:
    from recouple.recoupling.derive import as_scheme, check_pair, derive
    from recouple.recoupling.evaluate import check_labels
    from recouple.recoupling.formula import free_labels
    from recouple.referee.projection import check_size

    # Read and compare the schemes, and check the values (and, when the referee will
    # run, the size of its product space) first: bad input fails at once, before a
    # search that may take seconds and before any progress line.
    source, target = as_scheme(args.source), as_scheme(args.target)
    check_pair(source, target)
    if values is not None:
        check_labels(free_labels(source, target), values)
        if projecting:
            check_size(source, target, values)
    with _progress("searching for the shortest path", err):
        return derive(source, target, **_search_options(args))


def _count(text: str) -> int:
    """An argparse type: a whole number >= 0."""
    try:
        value = int(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"expected a whole number >= 0, got {text!r}") from None
    if value < 0:
        raise argparse.ArgumentTypeError(f"expected a whole number >= 0, got {text!r}")
    return value


def _seconds(text: str) -> float:
    """An argparse type: a finite number of seconds >= 0."""
    import math

    try:
        value = float(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"expected seconds >= 0, got {text!r}") from None
    if not math.isfinite(value) or value < 0:
        raise argparse.ArgumentTypeError(f"expected seconds >= 0, got {text!r}")
    return value


def _derivation_json(d: Any) -> dict[str, Any]:
    f = d.formula
    counts = f.counts()
    return {
        "from": str(d.source),
        "to": str(d.target),
        "steps": d.steps,
        "lower_bound": d.lower_bound,
        "optimal": d.optimal,
        "method": d.search.method,
        "sums": list(f.sums),
        "sums_on_plain_path": d.sums_on_plain_path,
        "fewer_sums_search": d.compact_status,
        "sums_lower_bound": d.sums_lower_bound,
        "racah_moves_used": d.racah_moves,
        "ninej_moves_used": d.ninej_moves,
        "symbols": {"6j": counts["6j"], "9j": counts["9j"]},
        "deltas": [list(pair) for pair in f.deltas],
        "moves": [m.describe() for m in d.moves],
        "text": str(f),
    }


def _cmd_derive(args: argparse.Namespace, out: TextIO, err: TextIO) -> int:
    if args.standalone and not args.latex:
        raise BadValue("--standalone makes a whole LaTeX document: use it with --latex")
    d = _derive(args, err)
    f = d.formula
    if args.json:
        print(json.dumps(_derivation_json(d), indent=2), file=out)
        return 0
    if args.latex:
        if args.standalone:
            from recouple.outputs.latex import latex_document

            print(latex_document(f), file=out)
        else:
            print(f.latex(), file=out)
        return 0
    if args.python:
        from recouple.outputs.pycode import formula_python, python_names

        # The function is called overlap, unless a label takes that name already.
        taken = set(python_names(f).values())
        name = "overlap"
        while name in taken:
            name += "_"
        print(formula_python(f, name=name), file=out)
        return 0
    print(str(f), file=out)
    counts = f.counts()
    proof = "proven shortest" if d.optimal else f"not proven shortest (lower bound {d.lower_bound})"
    print(
        f"# shortest Racah path: {d.steps} move(s), {proof}; this formula: "
        f"{counts['sums']} sum(s), {counts['6j']} 6j, {counts['9j']} 9j",
        file=out,
    )
    if len(f.sums) < d.sums_on_plain_path:
        print(
            f"# a form with fewer sums than the shortest Racah path: {len(f.sums)} instead of "
            f"{d.sums_on_plain_path} (uses {d.ninej_moves} 9j move(s))",
            file=out,
        )
    if f.sums and d.sums_lower_bound < len(f.sums):
        print(
            f"# fewer sums not ruled out: paths of Racah and 9j moves need at least "
            f"{d.sums_lower_bound} ({d.compact_status})",
            file=out,
        )
    if args.moves:
        for i, move in enumerate(d.moves, 1):
            print(f"#  {i}. {move.describe()}: {move.before} -> {move.after}", file=out)
        # labels the listed path introduces that the printed formula no longer sums over
        ends = set(d.path[0].labels()) | set(d.path[-1].labels())
        folded = [
            name
            for name in dict.fromkeys(x for tree in d.path for x in tree.labels())
            if name not in ends and name not in f.sums
        ]
        if folded:
            print(
                f"# {', '.join(folded)}: summed along this path, absent from the formula"
                " above (folded by a 9j, a sum rule or a path with 9j moves)",
                file=out,
            )
    return 0


def _cmd_evaluate(args: argparse.Namespace, out: TextIO, err: TextIO) -> int:
    from recouple.recoupling.evaluate import check_values, evaluate, why_zero

    values = _parse_sets(args.set)
    d = _derive(args, err, values, projecting=args.check)
    f = d.formula
    doubled = check_values(f, values)
    with _progress("evaluating the formula", err):  # large j: sums of big symbols
        value = evaluate(f, values)
    reason = why_zero(f, doubled)
    result: dict[str, Any] = {"value": float(value), "exact": str(value)}
    if reason:
        result["zero_because"] = reason
    if args.check:
        from recouple.referee.projection import project

        with _progress("projecting onto the product basis", err):
            reference = project(d.source, d.target, values)
        difference = abs(float(value) - float(reference))
        result["projection"] = float(reference)
        result["difference"] = difference
        result["agree"] = difference <= 1e-12
    if args.json:
        print(json.dumps(result, indent=2), file=out)
        return 0
    print(str(f), file=out)
    print(f"value = {value}  ({float(value):.15g})", file=out)
    if reason:
        print(f"# zero: {reason}", file=out)
    if args.check:
        verdict = "agree" if result["agree"] else "DISAGREE"
        print(
            f"projection = {result['projection']:.15g}; difference {difference:.2e}: {verdict}",
            file=out,
        )
    return 0


# The entries of each symbol (their count is its arity), named as the symbol
# functions name them in their messages.
_SYMBOL_NAMES = {
    "3j": ("j1", "j2", "j3", "m1", "m2", "m3"),
    "cg": ("j1", "m1", "j2", "m2", "j", "m"),
    "6j": ("a", "b", "c", "d", "e", "f"),
    "9j": ("a", "b", "c", "d", "e", "f", "g", "h", "i"),
}


def _cmd_symbol(args: argparse.Namespace, out: TextIO, err: TextIO) -> int:
    from recouple.numbers.spins import parse_projection, parse_spin
    from recouple.symbols import values as sv

    kind = args.kind.lower()
    if kind not in _SYMBOL_NAMES:
        raise BadValue(f"unknown symbol {args.kind!r}: choose 3j, 6j, 9j or cg")
    need = len(_SYMBOL_NAMES[kind])
    if len(args.entries) != need:
        raise BadValue(f"a {kind} takes {need} entries, got {len(args.entries)}")
    functions: dict[str, Callable[..., Any]] = {
        "3j": sv.threej,
        "cg": sv.clebsch_gordan,
        "6j": sv.sixj,
        "9j": sv.ninej,
    }
    fn = functions[kind]
    # Read the entries first, so that bad ones fail before any progress line; the
    # value itself can take a while (an exact 9j at j ~ 1000 takes minutes).
    entries = [
        (parse_projection if name.startswith("m") else parse_spin)(text, name=name)
        for text, name in zip(args.entries, _SYMBOL_NAMES[kind], strict=True)
    ]
    with _progress("computing the symbol", err):
        value = fn(*entries)
    if args.json:
        print(
            json.dumps(
                {
                    "symbol": kind,
                    "entries": args.entries,
                    "value": float(value),
                    "exact": str(value),
                }
            ),
            file=out,
        )
    else:
        print(f"{value}  ({float(value):.15g})", file=out)
    return 0


def _check_writable(path: str, option: str) -> None:
    """Refuse, before any long computation, a file name that cannot be written."""
    if not path.strip():
        raise BadValue(f"{option}: empty file name")
    target = Path(path)
    if target.is_dir():
        raise BadValue(f"{option}: {path!r} is a directory, not a file name")
    parent = target.parent
    if not parent.is_dir():
        raise BadValue(f"{option}: cannot write {path!r}: directory {str(parent)!r} does not exist")


def _write_file(path: str, write: Callable[[Path], object]) -> Path:
    """Run ``write`` on ``path``; a file that cannot be written is bad input, not a bug."""
    target = Path(path)
    try:
        write(target)
    except OSError as exc:
        reason = exc.strerror or type(exc).__name__
        raise BadValue(f"cannot write {path!r}: {reason}") from None
    return target


def _cmd_matrix(args: argparse.Namespace, out: TextIO, err: TextIO) -> int:
    from recouple.numbers.spins import spin_text
    from recouple.outputs.table import matrix_csv, matrix_json, matrix_text
    from recouple.recoupling.derive import as_scheme
    from recouple.recoupling.matrix import matrix_values, transformation_matrix

    if args.csv == "-" and args.json:
        raise BadValue("--csv - and --json both write to stdout: give --csv a file name")
    if args.csv is not None and args.csv != "-":
        _check_writable(args.csv, "--csv")
    values = _parse_sets(args.set)
    # Bad input fails at once, before the search and before any progress line.
    source, target = as_scheme(args.source), as_scheme(args.target)
    matrix_values(source, target, values)
    with _progress("building the transformation matrix", err):
        m = transformation_matrix(source, target, values)
    if not m.rows:
        total = m.source.total if m.source.total in values else m.target.total
        raise BadValue(
            f"no basis state has {total}={values[total]}: it cannot be reached from "
            + ", ".join(f"{k}={spin_text(v)}" for k, v in m.leaves)
        )
    exact = not args.float_only
    if args.csv == "-":
        print(matrix_csv(m, exact=exact), file=out, end="")
        return 0
    if args.csv is not None:
        text = matrix_csv(m, exact=exact)
        _write_file(args.csv, lambda p: p.write_text(text, encoding="utf-8"))
    if args.json:
        data = matrix_json(m, exact=exact)
        if args.csv is not None:
            data["csv"] = args.csv
        print(json.dumps(data, indent=2), file=out)
        return 0
    leaves = ", ".join(f"{k}={spin_text(v)}" for k, v in m.leaves)
    print(f"<{m.source}|{m.target}> at {leaves}", file=out)
    print(str(m.derivation.formula), file=out)
    print(f"rows: states of {m.source}; columns: states of {m.target}", file=out)
    print("", file=out)
    print(matrix_text(m, exact=exact), file=out)
    print("", file=out)
    error = m.orthogonality_error
    verdict = "orthogonal to 1e-12" if m.orthogonal else "NOT orthogonal to 1e-12"
    print(
        f"{len(m.rows)} x {len(m.columns)}; max |M M^T - 1| = {error:.1e}: {verdict}",
        file=out,
    )
    if args.csv is not None:
        print(f"CSV written to {args.csv}", file=out)
    return 0


def _cmd_draw(args: argparse.Namespace, out: TextIO, err: TextIO) -> int:
    from recouple.outputs.drawing import FORMATS, check_mathtext, draw_path, draw_tree, save_figure
    from recouple.schemes.notation import parse

    if args.output is None:
        raise BadValue("give an output file with -o, e.g. -o tree.svg (.png, .svg or .pdf)")
    ext = Path(args.output).suffix.lower()
    if ext not in FORMATS:
        shown = repr(ext) if ext else "a file without an extension"
        raise BadValue(f"cannot draw into {shown} ({args.output!r}); use .png, .svg or .pdf")
    _check_writable(args.output, "-o")
    if not args.path:
        for given, flag in (
            (args.max_seconds, "--max-seconds"),
            (args.max_expansions, "--max-expansions"),
        ):
            if given is not None:
                raise BadValue(f"{flag} budgets the search of --path; one tree needs no search")
    if args.path and args.target is None:
        raise BadValue("--path needs two schemes: draw FROM TO --path -o FILE")
    if not args.path and args.target is not None:
        raise BadValue(
            "two schemes given: add --path to draw the path from the first to the second, "
            "or give one scheme to draw one tree"
        )
    check_mathtext(args.title, "--title")  # before the search, which may take seconds
    moves: list[str] = []
    if args.path:
        d = _derive(args, err)
        moves = [m.describe() for m in d.moves]
        trees = list(d.path)
        with _progress("drawing the path", err):
            fig = draw_path(trees, moves, title=args.title)
    else:
        trees = [parse(args.source)]
        fig = draw_tree(trees[0], title=args.title)
    written = _write_file(args.output, lambda p: save_figure(fig, p))
    if args.json:
        result = {
            "file": str(written),
            "format": ext[1:],
            "trees": [str(t) for t in trees],
            "moves": moves,
        }
        print(json.dumps(result), file=out)
    else:
        what = f"a path of {len(moves)} move(s)" if args.path else "one tree"
        print(f"wrote {written} ({what})", file=out)
    return 0


def _add_search_options(p: argparse.ArgumentParser) -> None:
    p.add_argument("source", metavar="FROM", help="the first scheme, e.g. '((a,b)e,c)J'")
    p.add_argument("target", metavar="TO", help="the second scheme, e.g. '(a,(b,c)f)J'")
    p.add_argument(
        "--max-expansions",
        type=_count,
        metavar="N",
        help="budget of the exact search in states expanded",
    )
    p.add_argument(
        "--max-seconds",
        type=_seconds,
        metavar="S",
        help="time budget of the exact search in seconds",
    )


def build_parser() -> argparse.ArgumentParser:
    """The argument parser of the whole command line."""
    parser = _Parser(
        prog=PROG,
        description=_wrap(
            "Exact recoupling coefficients of angular momenta: shortest paths "
            "of 6j moves between coupling schemes, formulas, values, LaTeX, drawings."
        ),
        epilog=_EPILOG_MAIN,
        formatter_class=argparse.RawDescriptionHelpFormatter,
    )
    parser.add_argument("--version", action="version", version=f"{PROG} {__version__}")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND", parser_class=_Parser)

    p = sub.add_parser(
        "derive",
        help="the formula for the overlap <FROM|TO>",
        description=_wrap(
            "Find the shortest path of Racah moves from FROM to TO and print the "
            "exact formula for the overlap <FROM|TO>."
        ),
        epilog="examples:\n"
        '  recouple derive "((a,b)e,c)J" "(a,(b,c)f)J" --moves\n'
        '  recouple derive "((a,b)e,(c,d)f)J" "((a,c)g,(b,d)h)J" --json\n'
        '  recouple derive "((l1,s1)j1,(l2,s2)j2)J" "((l1,l2)L,(s1,s2)S)J" --latex --standalone\n'
        '  recouple derive "((a,b)e,c)J" "(a,(b,c)f)J" --python\n'
        "\nJSON keys: from, to, steps, lower_bound, optimal, method, sums, sums_on_plain_path,"
        "\nfewer_sums_search, sums_lower_bound, racah_moves_used, ninej_moves_used, symbols,"
        " deltas, moves, text.",
        formatter_class=argparse.RawDescriptionHelpFormatter,
    )
    _add_search_options(p)
    fmt = p.add_mutually_exclusive_group()
    fmt.add_argument("--json", action="store_true", help="print a JSON object")
    fmt.add_argument("--latex", action="store_true", help="print LaTeX (amsmath)")
    fmt.add_argument(
        "--python", action="store_true", help="print a Python function that evaluates the overlap"
    )
    p.add_argument(
        "--standalone",
        action="store_true",
        help="with --latex: a complete document that compiles on its own",
    )
    p.add_argument("--moves", action="store_true", help="also list every move of the path")
    p.set_defaults(run=_cmd_derive)

    p = sub.add_parser(
        "evaluate",
        help="the exact value of <FROM|TO> at given label values",
        description=_wrap(
            "Evaluate the overlap <FROM|TO> exactly at the values given with --set "
            "(every label of both schemes needs one)."
        ),
        epilog="examples:\n"
        '  recouple evaluate "((a,b)e,c)J" "(a,(b,c)f)J" --set a=1/2 --set b=1/2 --set c=1/2 \\\n'
        "      --set e=1 --set f=0 --set J=1/2 --check\n"
        '  recouple evaluate "(a,b)J" "(b,a)J" --set a=1/2 --set b=1/2 --set J=0 --json\n'
        "\nJSON keys: value, exact, zero_because (only for a zero by a selection rule);"
        "\nwith --check also projection, difference, agree.",
        formatter_class=argparse.RawDescriptionHelpFormatter,
    )
    _add_search_options(p)
    p.add_argument(
        "--set",
        action="append",
        metavar="NAME=VALUE",
        help="value of one label, e.g. j1=3/2 (repeat for each label)",
    )
    p.add_argument(
        "--check",
        action="store_true",
        help="also compute the overlap by direct Clebsch-Gordan projection",
    )
    p.add_argument("--json", action="store_true", help="print a JSON object")
    p.set_defaults(run=_cmd_evaluate)

    p = sub.add_parser(
        "matrix",
        help="the whole transformation matrix between two schemes",
        description=_wrap(
            "Enumerate every basis state of FROM and of TO for the leaf values "
            "given with --set, and print the matrix of overlaps <FROM state|TO state>: one "
            "block per total, rows and columns named by their coupling labels, exact entries "
            "and floats, and the orthogonality check max |M M^T - 1|. Give every leaf a value; "
            "give the total too (under either scheme's name) to keep one block only."
        ),
        epilog="examples:\n"
        '  recouple matrix "((a,b)e,c)J" "(a,(b,c)f)J" --set a=1/2 --set b=1/2 --set c=1/2\n'
        '  recouple matrix "((l1,s1)j1,(l2,s2)j2)J" "((l1,l2)L,(s1,s2)S)J" \\\n'
        "      --set l1=1 --set l2=2 --set s1=1/2 --set s2=1/2 --set J=2\n"
        '  recouple matrix "((a,b)e,c)J" "(a,(b,c)f)J" --set a=1 --set b=1 --set c=1 '
        "--csv m.csv --float-only\n"
        '  recouple matrix "(a,b)J" "(b,a)J" --set a=1/2 --set b=1/2 --json\n'
        "\nJSON keys: from, to, leaves, total, formula, rows, columns (label -> value text),"
        "\nmatrix (floats), exact (text; not with --float-only), orthogonal,"
        " orthogonality_error.",
        formatter_class=argparse.RawDescriptionHelpFormatter,
    )
    p.add_argument("source", metavar="FROM", help="the scheme of the rows, e.g. '((a,b)e,c)J'")
    p.add_argument("target", metavar="TO", help="the scheme of the columns, e.g. '(a,(b,c)f)J'")
    p.add_argument(
        "--set",
        action="append",
        metavar="NAME=VALUE",
        help="value of a leaf, e.g. l1=1 (repeat for each leaf); optionally the total, e.g. J=2",
    )
    p.add_argument(
        "--csv",
        metavar="FILE",
        help="also write the matrix as CSV to FILE ('-' for stdout, then nothing else is "
        "printed); cells are exact text such as (1/2)*sqrt(3), floats with --float-only",
    )
    p.add_argument("--json", action="store_true", help="print a JSON object")
    p.add_argument(
        "--float-only",
        action="store_true",
        help="leave the exact entries out of the table, the CSV and the JSON",
    )
    p.set_defaults(run=_cmd_matrix)

    p = sub.add_parser(
        "draw",
        help="draw a coupling tree, or the path of moves between two schemes",
        description=_wrap(
            "Draw one coupling tree, or with --path the whole recoupling path from "
            "FROM to TO, each arrow labelled with its move (an exchange, or the 6j it costs). "
            "The format follows the extension of -o: .png, .svg or .pdf."
        ),
        epilog="examples:\n"
        '  recouple draw "((j1,j2)j12,(j3,j4)j34)J" -o tree.svg\n'
        '  recouple draw "((a,b)e,c)J" "(a,(b,c)f)J" --path -o path.png\n'
        '  recouple draw "((a,b)e,(c,d)f)J" "((a,c)g,(b,d)h)J" --path -o path.pdf --json\n'
        "\nJSON keys: file, format, trees, moves.",
        formatter_class=argparse.RawDescriptionHelpFormatter,
    )
    p.add_argument("source", metavar="SCHEME", help="the scheme to draw (FROM with --path)")
    p.add_argument("target", metavar="TO", nargs="?", help="with --path: the scheme to reach")
    p.add_argument("-o", "--output", metavar="FILE", help="the file to write (.png, .svg, .pdf)")
    p.add_argument("--path", action="store_true", help="draw the derived path from FROM to TO")
    p.add_argument("--title", help="a title above the drawing")
    p.add_argument("--json", action="store_true", help="print a one-line JSON object")
    p.add_argument(
        "--max-expansions",
        type=_count,
        metavar="N",
        help="with --path: budget of the exact search in states expanded",
    )
    p.add_argument(
        "--max-seconds",
        type=_seconds,
        metavar="S",
        help="with --path: time budget of the exact search in seconds",
    )
    p.set_defaults(run=_cmd_draw)

    p = sub.add_parser(
        "symbol",
        help="the exact value of a 3j, 6j or 9j symbol or a Clebsch-Gordan coefficient",
        description=_wrap(
            "Exact value of one symbol. Entries are integers or half-integers "
            "(3/2 or 1.5). 3j: j1 j2 j3 m1 m2 m3; cg: j1 m1 j2 m2 j m (<j1 m1 j2 m2|j m>); "
            "6j: six entries row by row; 9j: nine entries row by row."
        ),
        epilog="examples:\n  recouple symbol 6j 1 2 3 2 1 2"
        "\n  recouple symbol cg 1/2 1/2 1/2 -1/2 1 0"
        "\n  recouple symbol 9j 1/2 1/2 1 1/2 1/2 1 1 1 2 --json",
        formatter_class=argparse.RawDescriptionHelpFormatter,
    )
    p.add_argument("kind", metavar="KIND", help="3j, 6j, 9j or cg")
    p.add_argument("entries", metavar="ENTRY", nargs="+", help="the entries")
    p.add_argument("--json", action="store_true", help="print a JSON object")
    p.set_defaults(run=_cmd_symbol)
    return parser


def main(
    argv: Sequence[str] | None = None, *, out: TextIO | None = None, err: TextIO | None = None
) -> int:
    """Run the command line; returns the exit status."""
    out = out or sys.stdout
    err = err or sys.stderr
    parser = build_parser()
    try:
        with redirect_stdout(out):  # --help and --version print to the caller's stream
            args = parser.parse_args(argv)
        if not getattr(args, "command", None):
            parser.print_help(out)
            return 0
        status: int = args.run(args, out, err)
        return status
    except _UsageError as exc:
        print(str(exc), file=err)
        return 2
    except RecoupleError as exc:
        print(f"{PROG}: error: {exc.one_line()}", file=err)
        return 2
    except SystemExit as exc:  # --help and --version end here
        return exc.code if isinstance(exc.code, int) else 0
    except KeyboardInterrupt:
        print(f"{PROG}: interrupted", file=err)
        return 130
    except BrokenPipeError:
        # The reader of stdout went away (``| head``): nothing is wrong and nothing
        # more can be written.  Point stdout at devnull so that the interpreter's
        # last flush stays quiet, and exit as a writer killed by SIGPIPE would.
        if out is sys.stdout:
            with suppress(OSError, ValueError):
                os.dup2(os.open(os.devnull, os.O_WRONLY), sys.stdout.fileno())
        return 141
    except Exception as exc:  # noqa: BLE001 - the last line of defence
        print(
            f"{PROG}: internal error ({type(exc).__name__}: {exc}). This is a bug in recouple; "
            "please report it with the command you ran.",
            file=err,
        )
        return 1


if __name__ == "__main__":  # pragma: no cover
    raise SystemExit(main())
