"""Run every benchmark section: ``python3 benchmarks/run.py [--smoke]``.

``--smoke`` runs a few samples of each section in seconds (CI runs it); without it
the full run takes a few minutes.  Each section prints its table and a PASS,
MISSED or REPORT line per target; a summary of those lines closes the run.  A
missed target does not change the exit status (these are measurements, not
tests); a section that crashes does (exit status 1), after the others have run.

Not part of pytest: speed lives here, never in timed tests (docs/performance.md).
"""

from __future__ import annotations

import inspect
import os
import platform
import sys
import time
import traceback
from collections.abc import Callable
from pathlib import Path

HERE = Path(__file__).resolve().parent
if str(HERE) not in sys.path:
    sys.path.insert(0, str(HERE))

from _common import VERDICTS, heading  # noqa: E402


def _sections() -> list[tuple[str, Callable[[bool], None] | None, str]]:
    import bench_compact
    import bench_evaluate
    import bench_matrix
    import bench_symbols

    out: list[tuple[str, Callable[[bool], None] | None, str]] = [
        ("symbols", bench_symbols.run, ""),
        ("matrix", bench_matrix.run, ""),
        ("derive, memory, evaluate", bench_evaluate.run, ""),
        ("fewest summations", bench_compact.run, ""),
    ]
    # The search benchmark belongs to the search's owner; run it when it is there.
    if (HERE / "bench_search.py").exists():
        try:
            import bench_search  # type: ignore[import-not-found]
        except Exception as exc:  # report, do not hide: its section then counts as failed
            out.append(("search", None, f"bench_search.py does not import: {exc!r}"))
        else:
            entry = getattr(bench_search, "run", None) or getattr(bench_search, "main", None)
            if entry is None:
                out.append(("search", None, "bench_search.py has no run(smoke) or main()"))
            else:
                out.append(("search", _search_entry(entry), ""))
    else:
        out.append(("search", None, "skip: benchmarks/bench_search.py is not there yet"))
    return out


def _search_entry(entry: Callable[..., object]) -> Callable[[bool], None]:
    def call(smoke: bool) -> None:
        if inspect.signature(entry).parameters:
            entry(smoke)
            return
        # A main() that reads sys.argv instead of taking the flag.
        saved = sys.argv
        sys.argv = [str(HERE / "bench_search.py"), *(["--smoke"] if smoke else [])]
        try:
            heading("search alone (benchmarks/bench_search.py, the search owner's script)")
            entry()
        finally:
            sys.argv = saved

    return call


def main(argv: list[str]) -> int:
    unknown = [a for a in argv if a != "--smoke"]
    if unknown:
        print(f"run.py: unknown argument {unknown[0]!r} (the only option is --smoke)")
        return 2
    smoke = "--smoke" in argv
    print(
        f"recouple benchmarks ({'smoke' if smoke else 'full'} run): python "
        f"{platform.python_version()} ({platform.python_implementation()}), "
        f"{os.cpu_count()} cores, {platform.machine()}"
    )
    print("times are CPU seconds of this process; ratios are measured in the same process")
    start = time.perf_counter()
    failed: list[str] = []
    for name, fn, note in _sections():
        if fn is None:
            print(f"\n[{name}] {note}")
            if not note.startswith("skip"):
                failed.append(name)
            continue
        try:
            fn(smoke)
        except Exception:
            traceback.print_exc()
            print(f"[{name}] FAILED: the section crashed (traceback above)")
            failed.append(name)
    heading("summary")
    for line in VERDICTS.lines:
        print(line)
    print(f"wall-clock time of the whole run: {time.perf_counter() - start:.1f} s")
    if failed:
        print(f"sections that did not run to the end: {', '.join(failed)}")
        return 1
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
