"""The package layers, read with ``ast``: imports point down, side effects stay at the top.

Every module under src/recouple is parsed (never imported), so the checks see
exactly what is written and cost no import time.
"""

from __future__ import annotations

import ast
from dataclasses import dataclass
from pathlib import Path

import pytest

SRC = Path(__file__).resolve().parents[1] / "src" / "recouple"

# The floors of the house, lowest first (RULES.md "How we write code"; STYLE.md §9).
# A *unit* is a subpackage of recouple, or one of the files at the package root.
# A module may import from its own unit and from units on lower floors only, so
# the import graph between units has no cycles and each floor can be read,
# tested and reused without the ones above it.  Two units share floor 4 and must
# not lean on each other: the referee checks recoupling results by an
# independent route, so it may not borrow any of recoupling's machinery (nor the
# reverse).  The three root files form the top floor together (``__main__``
# calls ``cli.main``; ``cli`` reads ``__version__``).
FLOORS: dict[str, int] = {
    "errors": 1,
    "numbers": 2,
    "schemes": 2,
    "symbols": 3,
    "referee": 4,
    "recoupling": 4,
    "outputs": 5,
    "verification": 5,
    "cli": 6,
    "__init__": 6,
    "__main__": 6,
}
TOP = 6
APART = frozenset({"referee", "recoupling"})  # never import each other, even lazily

# Heavy optional libraries: matplotlib only at module level in outputs/ and the
# command line; sympy not at module level anywhere below outputs/.  Imports inside
# functions and under ``if TYPE_CHECKING:`` do not run at import time and are fine.
MATPLOTLIB_UNITS = frozenset({"outputs", "cli"})
SYMPY_FLOOR = FLOORS["outputs"]

PRINTS_AND_EXITS = frozenset({"cli"})  # only the command line talks to the terminal
RAISES_SYSTEM_EXIT = frozenset({"cli", "__main__"})


@dataclass(frozen=True, slots=True)
class Import:
    """One imported module, resolved to an absolute dotted name."""

    target: str
    line: int
    module_level: bool  # runs when the importing module is imported
    type_only: bool  # inside ``if TYPE_CHECKING:``


def module_name(path: Path, root: Path = SRC) -> str:
    """``src/recouple/numbers/spins.py`` -> ``recouple.numbers.spins``."""
    parts = list(path.relative_to(root.parent).with_suffix("").parts)
    if parts[-1] == "__init__":
        parts.pop()
    return ".".join(parts)


def unit_of(dotted: str) -> str:
    """The layer unit of a recouple module: its subpackage, or the root file's name."""
    parts = dotted.split(".")
    return parts[1] if len(parts) > 1 else "__init__"


def _is_type_checking(test: ast.expr) -> bool:
    return (isinstance(test, ast.Name) and test.id == "TYPE_CHECKING") or (
        isinstance(test, ast.Attribute) and test.attr == "TYPE_CHECKING"
    )


def find_imports(tree: ast.Module, module: str, is_package: bool, known: set[str]) -> list[Import]:
    """Every import in ``tree``, with relative imports resolved against ``module``.

    ``from pkg import name`` counts as importing ``pkg.name`` when that is a
    module in ``known``, and ``pkg`` otherwise.
    """
    package = module if is_package else module.rpartition(".")[0]
    found: list[Import] = []

    def add(target: str, node: ast.stmt, top: bool, typing_only: bool) -> None:
        found.append(Import(target, node.lineno, top, typing_only))

    def visit(stmts: list[ast.stmt], top: bool, typing_only: bool) -> None:
        for node in stmts:
            if isinstance(node, ast.Import):
                for alias in node.names:
                    add(alias.name, node, top, typing_only)
            elif isinstance(node, ast.ImportFrom):
                if node.level:
                    base = package.split(".")
                    base = base[: len(base) - (node.level - 1)]
                    source = ".".join(base + ([node.module] if node.module else []))
                else:
                    source = node.module or ""
                for alias in node.names:
                    sub = f"{source}.{alias.name}"
                    add(sub if sub in known else source, node, top, typing_only)
            elif isinstance(node, ast.FunctionDef | ast.AsyncFunctionDef):
                visit(node.body, False, typing_only)
            elif isinstance(node, ast.If) and _is_type_checking(node.test):
                visit(node.body, top, True)
                visit(node.orelse, top, typing_only)
            else:
                # Class bodies, if/try/with/for blocks: same timing as their parent.
                for field in ("body", "orelse", "finalbody", "handlers", "cases"):
                    block = getattr(node, field, None)
                    if isinstance(block, list):
                        inner = [s for s in block if isinstance(s, ast.stmt)]
                        for item in block:
                            if isinstance(item, ast.ExceptHandler | ast.match_case):
                                inner += item.body
                        visit(inner, top, typing_only)

    visit(tree.body, True, False)
    return found


def floor_violations(module: str, imports: list[Import]) -> list[str]:
    """Imports of recouple modules that point up or sideways (see FLOORS)."""
    here = unit_of(module)
    if here not in FLOORS:
        return [f"{module}: unit {here!r} has no floor in the FLOORS table of tests/test_layers.py"]
    out = []
    for imp in imports:
        if imp.target != "recouple" and not imp.target.startswith("recouple."):
            continue
        there = unit_of(imp.target)
        if there not in FLOORS:
            out.append(f"{module}:{imp.line} imports {imp.target}, which has no floor")
        elif {here, there} == APART:
            out.append(f"{module}:{imp.line} imports {imp.target}: {here} and {there} stay apart")
        elif imp.type_only or not imp.module_level:
            # Deferred imports run after every module is loaded, so they cannot
            # form an import cycle (STYLE.md habit 9: the lazy hook is the one
            # allowed way around a cycle); only the referee/recoupling rule binds.
            continue
        elif there != here and FLOORS[there] >= FLOORS[here] and FLOORS[here] != TOP:
            out.append(
                f"{module}:{imp.line} imports {imp.target} (floor {FLOORS[there]})"
                f" from floor {FLOORS[here]}"
            )
    return out


def heavy_import_violations(module: str, imports: list[Import]) -> list[str]:
    """matplotlib or sympy imported at module level where the rules forbid it."""
    here = unit_of(module)
    out = []
    for imp in imports:
        if not imp.module_level or imp.type_only:
            continue
        library = imp.target.partition(".")[0]
        if library == "matplotlib" and here not in MATPLOTLIB_UNITS:
            out.append(f"{module}:{imp.line} imports matplotlib at module level")
        if library == "sympy" and FLOORS.get(here, TOP) < SYMPY_FLOOR:
            out.append(f"{module}:{imp.line} imports sympy at module level")
    return out


def side_effect_violations(module: str, tree: ast.Module) -> list[str]:
    """Calls to print / sys.exit / exit, and ``raise SystemExit``, outside the allowed files."""
    here = unit_of(module)
    out = []
    for node in ast.walk(tree):
        if isinstance(node, ast.Call) and here not in PRINTS_AND_EXITS:
            func = node.func
            if isinstance(func, ast.Name) and func.id in ("print", "exit", "quit"):
                out.append(f"{module}:{node.lineno} calls {func.id}()")
            elif (
                isinstance(func, ast.Attribute)
                and isinstance(func.value, ast.Name)
                and (func.value.id, func.attr) in (("sys", "exit"), ("os", "_exit"))
            ):
                out.append(f"{module}:{node.lineno} calls {func.value.id}.{func.attr}()")
        if isinstance(node, ast.Raise) and node.exc is not None and here not in RAISES_SYSTEM_EXIT:
            exc = node.exc.func if isinstance(node.exc, ast.Call) else node.exc
            if isinstance(exc, ast.Name) and exc.id == "SystemExit":
                out.append(f"{module}:{node.lineno} raises SystemExit")
    return out


# ---------------------------------------------------------------------------
# The package as it is now
# ---------------------------------------------------------------------------

FILES = sorted(SRC.rglob("*.py"))
KNOWN = {module_name(p) for p in FILES}


def _parse(path: Path) -> tuple[str, ast.Module, list[Import]]:
    module = module_name(path)
    tree = ast.parse(path.read_text(encoding="utf-8"), filename=str(path))
    return module, tree, find_imports(tree, module, path.name == "__init__.py", KNOWN)


def _ids(path: Path) -> str:
    return str(path.relative_to(SRC))


def test_the_package_is_found() -> None:
    assert {"recouple", "recouple.errors", "recouple.schemes.tree"} <= KNOWN


@pytest.mark.parametrize("path", FILES, ids=_ids)
def test_imports_point_down(path: Path) -> None:
    module, _, imports = _parse(path)
    assert floor_violations(module, imports) == []


@pytest.mark.parametrize("path", FILES, ids=_ids)
def test_heavy_libraries_load_lazily(path: Path) -> None:
    module, _, imports = _parse(path)
    assert heavy_import_violations(module, imports) == []


@pytest.mark.parametrize("path", FILES, ids=_ids)
def test_only_the_command_line_prints_or_exits(path: Path) -> None:
    module, tree, _ = _parse(path)
    assert side_effect_violations(module, tree) == []


def test_every_unit_has_a_floor() -> None:
    units = {unit_of(m) for m in KNOWN if m != "recouple"} | {"__init__"}
    assert units - set(FLOORS) == set()


# ---------------------------------------------------------------------------
# The checker itself, on made-up modules: it must catch what it claims to catch
# ---------------------------------------------------------------------------

FAKE_KNOWN = {"recouple", "recouple.errors", "recouple.schemes", "recouple.schemes.tree"}


def _check(module: str, source: str, is_package: bool = False) -> list[str]:
    tree = ast.parse(source)
    imports = find_imports(tree, module, is_package, FAKE_KNOWN)
    return (
        floor_violations(module, imports)
        + heavy_import_violations(module, imports)
        + side_effect_violations(module, tree)
    )


@pytest.mark.parametrize(
    ("module", "source", "complaint"),
    [
        ("recouple.numbers.spins", "from recouple.symbols import x", "floor 3) from floor 2"),
        ("recouple.numbers.spins", "import recouple.schemes.tree", "floor 2) from floor 2"),
        ("recouple.numbers.spins", "from recouple import parse", "floor 6) from floor 2"),
        (
            "recouple.schemes.tree",
            "from ..outputs import drawing",
            "outputs (floor 5) from floor 2",
        ),
        ("recouple.referee.a", "def f():\n    from recouple.recoupling import m", "stay apart"),
        ("recouple.recoupling.a", "from recouple.referee.b import c", "stay apart"),
        ("recouple.extra", "import os", "has no floor"),
        ("recouple.symbols.v", "try:\n    import sympy\nexcept ImportError:\n    pass", "sympy"),
        ("recouple.referee.a", "class A:\n    import matplotlib.pyplot as plt", "matplotlib"),
        ("recouple.__init__", "import matplotlib", "matplotlib at module level"),
        ("recouple.outputs.text", "print('hello')", "calls print()"),
        ("recouple.outputs.text", "import sys\ndef f():\n    sys.exit(2)", "calls sys.exit()"),
        ("recouple.schemes.tree", "raise SystemExit(1)", "raises SystemExit"),
    ],
)
def test_checker_catches(module: str, source: str, complaint: str) -> None:
    problems = _check(module, source)
    assert any(complaint in p for p in problems), problems


@pytest.mark.parametrize(
    ("module", "source"),
    [
        ("recouple.schemes.notation", "from recouple.schemes.tree import Leaf"),
        ("recouple.schemes.notation", "from .tree import Leaf\nfrom ..errors import BadValue"),
        ("recouple.symbols.v", "from recouple.numbers import spins\nfrom recouple import errors"),
        ("recouple.numbers.r", "def f():\n    import sympy\n    return sympy"),
        (
            "recouple.numbers.r",
            "from typing import TYPE_CHECKING\nif TYPE_CHECKING:\n    import sympy",
        ),
        (
            "recouple.outputs.t",
            "from typing import TYPE_CHECKING\nif TYPE_CHECKING:\n"
            "    from recouple.recoupling.formula import Formula",
        ),  # fmt: skip
        ("recouple.outputs.drawing", "import matplotlib"),
        ("recouple.recoupling.f", "def latex(self):\n    from recouple.outputs.latex import w"),
        ("recouple.cli", "import sys\nfrom recouple import __version__\nprint(1)\nsys.exit(2)"),
        ("recouple.__main__", "from recouple.cli import main\nraise SystemExit(main())"),
        ("recouple.errors", '"""\n>>> print(err)\n"""'),
    ],
)
def test_checker_allows(module: str, source: str) -> None:
    assert _check(module, source, is_package=False) == []
