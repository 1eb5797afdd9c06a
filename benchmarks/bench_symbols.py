"""Exact 6j and 9j against sympy.physics.wigner; the float path against exact and a
compiled library.

Run through ``python3 benchmarks/run.py`` (or this file alone: same flags).
Streams are seeded and hold distinct arguments (distinct up to the symbols'
symmetries), and recouple's caches are emptied before each timed pass, so every
value is computed from scratch.  sympy (reference: sympy.physics.wigner.wigner_6j,
wigner_9j) gets a prefix of the same stream, fewer samples where it is slow.
"""

from __future__ import annotations

import sys
from typing import Any

import numpy as np
from _common import (
    VERDICTS,
    clear_symbol_caches,
    fmt_ratio,
    fmt_time,
    heading,
    ninej_stream,
    per_call,
    sixj_stream,
    table,
    timed,
    warm_up,
)

from recouple.symbols.bulk import ninej_float_many, sixj_float_many
from recouple.symbols.canonical import canonical_sixj
from recouple.symbols.floats import ninej_float_doubled, sixj_float_doubled
from recouple.symbols.values import ninej_doubled, sixj_doubled

# (name, j from, j to, recouple samples, sympy samples; smoke and full)
SIXJ_CASES = {
    False: [("small", 0, 3, 250, 60), ("medium", 10, 20, 400, 40), ("large", 50, 100, 200, 15)],
    True: [("small", 0, 3, 60, 10), ("medium", 10, 20, 40, 4)],
}
NINEJ_CASES = {
    False: [("small", 0, 3, 200, 12), ("medium", 10, 20, 40, 3), ("large", 50, 100, 6, 1)],
    True: [("small", 0, 3, 20, 2)],
}
# Targets: exact vs sympy, per size (None: report only).
SIXJ_TARGET = {"small": None, "medium": 100.0, "large": 20.0}
NINEJ_TARGET = {"small": 200.0, "medium": 200.0, "large": None}


def _halves(args: tuple[int, ...]) -> list[Any]:
    from sympy import Rational

    return [Rational(x, 2) for x in args]


def _exact_vs_sympy(kind: str, smoke: bool) -> None:
    from sympy.physics.wigner import wigner_6j, wigner_9j

    from recouple.numbers.radicals import Radical

    cases = SIXJ_CASES[smoke] if kind == "6j" else NINEJ_CASES[smoke]
    ours_fn = sixj_doubled if kind == "6j" else ninej_doubled
    ref_fn = wigner_6j if kind == "6j" else wigner_9j
    stream = sixj_stream if kind == "6j" else ninej_stream
    targets = SIXJ_TARGET if kind == "6j" else NINEJ_TARGET
    heading(f"exact {kind} against sympy.physics.wigner.wigner_{kind} (distinct arguments)")
    rows = []
    results = []
    for k, (name, lo, hi, n_ours, n_ref) in enumerate(cases):
        args = stream(100 + k, n_ours, lo, hi)
        clear_symbol_caches()
        t_ours = per_call(ours_fn, args)
        ref_args = [_halves(a) for a in args[:n_ref]]
        t_ref = per_call(ref_fn, ref_args)
        # Same values (reference: sympy.physics.wigner), checked on the timed prefix.
        for a, ra in zip(args, ref_args, strict=False):
            assert ours_fn(*a) == Radical.from_sympy(ref_fn(*ra)), (kind, a)
        ratio = t_ref / t_ours
        times = (fmt_time(t_ours), fmt_time(t_ref))
        rows.append((name, f"{lo}-{hi}", fmt_ratio(ratio), *times, len(args), n_ref))
        results.append((name, ratio))
    table(("j", "range", "sympy/recouple", "recouple", "sympy", "n recouple", "n sympy"), rows)
    for name, ratio in results:
        target = targets[name]
        label = f"exact {kind} at {name} j, speed-up over sympy"
        if target is None:
            VERDICTS.report(label, fmt_ratio(ratio))
        else:
            VERDICTS.check(label, ratio >= target, fmt_ratio(ratio), f">= {target:.0f}x")
    _standard_form_share(kind, smoke)


def _standard_form_share(kind: str, smoke: bool) -> None:
    """Where the exact time goes: the same stream through the raw Racah sum alone.

    Diagnostic only.  The public functions first bring the arguments to a standard
    form among the symbol's symmetric arrangements (24 for a 6j, 72 for a 9j) so
    that equal values share one cache entry; this measures what that step costs on
    a stream where nothing repeats.
    """
    from recouple.symbols import values

    raw = values._sixj_parts if kind == "6j" else values._ninej_parts

    def compute(*a: int) -> object:
        return values._radical(raw(*a))

    args = (sixj_stream if kind == "6j" else ninej_stream)(100, 60 if smoke else 200, 0, 3)
    clear_symbol_caches()
    t_public = per_call(sixj_doubled if kind == "6j" else ninej_doubled, args)
    t_raw = per_call(compute, args)
    print(
        f"diagnostic, small j: public {kind} {fmt_time(t_public)} per call, of which the "
        f"Racah sum and radical {fmt_time(t_raw)} ({100 * t_raw / t_public:.0f}%); the rest "
        "is argument checks, the standard-form key and the caches"
    )


def _float_section(smoke: bool) -> None:
    heading("float paths: speed against exact, worst relative error (DLMF 34.4.2, 34.6.2)")
    print(
        "per call: recouple.symbols.floats (exact sums, one rounding); bulk: "
        "recouple.symbols.bulk on the whole stream as one array (batch = stream size)"
    )
    rows = []
    worst_all = 0.0
    worst_bulk = 0.0
    cases = [("small", 0, 3), ("medium", 10, 20), ("j to 50", 25, 50)]
    for k, (name, lo, hi) in enumerate(cases):
        n6 = 30 if smoke else 200
        n9 = 5 if smoke else (40 if hi <= 20 else 10)
        six = sixj_stream(300 + k, n6, lo, hi)
        nine = ninej_stream(400 + k, n9, lo, hi)
        clear_symbol_caches()
        t6e = per_call(sixj_doubled, six)
        t6f = per_call(sixj_float_doubled, six)
        t9e = per_call(ninej_doubled, nine)
        t9f = per_call(ninej_float_doubled, nine)
        clear_symbol_caches()
        t6b, bulk6 = _bulk_call(sixj_float_many, six)
        t9b, bulk9 = _bulk_call(ninej_float_many, nine)
        worst = 0.0
        wbulk = 0.0
        for a, v in zip(six, bulk6, strict=True):
            ref = float(sixj_doubled(*a))
            worst = max(worst, _rel(sixj_float_doubled(*a), ref))
            wbulk = max(wbulk, _rel(float(v), ref))
        for a, v in zip(nine, bulk9, strict=True):
            ref = float(ninej_doubled(*a))
            worst = max(worst, _rel(ninej_float_doubled(*a), ref))
            wbulk = max(wbulk, _rel(float(v), ref))
        worst_all = max(worst_all, worst)
        worst_bulk = max(worst_bulk, wbulk)
        rows.append(
            (
                name,
                f"{lo}-{hi}",
                fmt_ratio(t6e / t6f),
                fmt_ratio(t6e / t6b),
                fmt_ratio(t9e / t9f),
                fmt_ratio(t9e / t9b),
                f"{worst:.1e}",
                f"{wbulk:.1e}",
                f"{len(six)} / {len(nine)}",
                fmt_time(t6b),
                fmt_time(t6f),
                fmt_time(t6e),
                fmt_time(t9b),
                fmt_time(t9f),
                fmt_time(t9e),
            )
        )
    table(
        (
            "j",
            "range",
            "6j exact/float",
            "6j exact/bulk",
            "9j exact/float",
            "9j exact/bulk",
            "worst rel err float",
            "worst rel err bulk",
            "batch 6j / 9j",
            "6j bulk",
            "6j float",
            "6j exact",
            "9j bulk",
            "9j float",
            "9j exact",
        ),
        rows,
    )
    VERDICTS.check(
        "float path worst relative error up to j = 50",
        worst_all <= 1e-12,
        f"{worst_all:.1e}",
        "<= 1e-12",
    )
    VERDICTS.check(
        "bulk float path worst relative error up to j = 50",
        worst_bulk <= 1e-12,
        f"{worst_bulk:.1e}",
        "<= 1e-12",
    )
    _compiled_section(smoke)


def _bulk_call(fn: Any, args: list[tuple[int, ...]]) -> tuple[float, Any]:
    """CPU seconds per symbol of one bulk call on the whole stream, and its values.

    The int64 array is built outside the timing (a caller of the bulk path holds
    its arguments as an array already).
    """
    batch = np.array(args, dtype=np.int64)
    seconds, values = timed(lambda: fn(batch))
    return seconds / max(1, len(args)), values


def _rel(x: float, ref: float) -> float:
    if ref == 0.0:
        return abs(x)
    return abs(x - ref) / abs(ref)


def _compiled_section(smoke: bool) -> None:
    """Against pywigxjpf (a compiled float library of Wigner symbols), if installed."""
    try:
        import pywigxjpf as wig  # type: ignore[import-not-found]
    except ImportError:
        print(
            "SKIP    float path against a compiled library: pywigxjpf is not installed "
            "(optional: pip install pywigxjpf)"
        )
        return
    wig.wig_table_init(2 * 100, 9)
    wig.wig_temp_init(2 * 100)
    cases = (("small", 0, 3), ("medium", 10, 20), ("j to 50", 25, 50))
    rows = []
    ratios = []
    for k, (name, lo, hi) in enumerate(cases):
        six = sixj_stream(500 + k, 30 if smoke else 200, lo, hi)
        nine = ninej_stream(600 + k, 5 if smoke else 30, lo, hi)
        clear_symbol_caches()
        t6 = per_call(sixj_float_doubled, six)
        t9 = per_call(ninej_float_doubled, nine)
        c6 = per_call(wig.wig6jj, six)
        c9 = per_call(wig.wig9jj, nine)
        # Same values (reference: pywigxjpf, a stand-alone numeric evaluator).
        agree = max(
            [_rel(sixj_float_doubled(*a), wig.wig6jj(*a)) for a in six]
            + [_rel(ninej_float_doubled(*a), wig.wig9jj(*a)) for a in nine]
        )
        ratios.append((name, t6 / c6, t9 / c9))
        rows.append(
            (
                name,
                fmt_ratio(t6 / c6),
                fmt_ratio(t9 / c9),
                f"{agree:.1e}",
                fmt_time(t6),
                fmt_time(c6),
                fmt_time(t9),
                fmt_time(c9),
            )
        )
    heading("float fast path against pywigxjpf (compiled; cold caches, distinct arguments)")
    table(
        (
            "j",
            "6j ours/compiled",
            "9j ours/compiled",
            "max rel diff",
            "6j ours",
            "6j compiled",
            "9j ours",
            "9j compiled",
        ),
        rows,
    )
    for name, r6, r9 in ratios:
        VERDICTS.report(f"float 6j per call against pywigxjpf at {name} j", f"{r6:.1f}x slower")
        VERDICTS.report(f"float 9j per call against pywigxjpf at {name} j", f"{r9:.1f}x slower")
    _bulk_against_compiled(smoke, wig, cases)


# Bulk batch sizes (6j, 9j) per j range, full and smoke.  At small j there are only
# 270 distinct 6j (up to symmetry), so that stream is repeated to the batch size;
# pywigxjpf is timed on exactly the same rows.
BULK_BATCH = {
    False: {"small": (2000, 1000), "medium": (2000, 200), "j to 50": (2000, 40)},
    True: {"small": (500, 100), "medium": (200, 10), "j to 50": (100, 2)},
}


def _bulk_against_compiled(smoke: bool, wig: Any, cases: tuple[tuple[str, int, int], ...]) -> None:
    """The issue's target: bulk float 6j/9j per symbol within 5x of pywigxjpf per call."""
    rows = []
    ratios = []
    for k, (name, lo, hi) in enumerate(cases):
        n6, n9 = BULK_BATCH[smoke][name]
        six = _repeat_to(sixj_stream(700 + k, n6, lo, hi), n6)
        nine = _repeat_to(ninej_stream(800 + k, n9, lo, hi), n9)
        clear_symbol_caches()
        b6, v6 = _bulk_call(sixj_float_many, six)
        b9, v9 = _bulk_call(ninej_float_many, nine)
        c6 = per_call(wig.wig6jj, six)
        c9 = per_call(wig.wig9jj, nine)
        # Same values (reference: pywigxjpf, a stand-alone numeric evaluator).
        agree = max(
            [_rel(float(v), wig.wig6jj(*a)) for a, v in zip(six, v6, strict=True)]
            + [_rel(float(v), wig.wig9jj(*a)) for a, v in zip(nine, v9, strict=True)]
        )
        distinct6 = len({canonical_sixj(a) for a in six})
        ratios.append((name, b6 / c6, b9 / c9, len(six), len(nine)))
        rows.append(
            (
                name,
                fmt_ratio(b6 / c6),
                fmt_ratio(b9 / c9),
                f"{len(six)} ({distinct6} distinct) / {len(nine)}",
                f"{agree:.1e}",
                fmt_time(b6),
                fmt_time(c6),
                fmt_time(b9),
                fmt_time(c9),
            )
        )
    heading("bulk float path (numpy, one call per batch) against pywigxjpf per call")
    table(
        (
            "j",
            "6j bulk/compiled",
            "9j bulk/compiled",
            "batch 6j / 9j",
            "max rel diff",
            "6j bulk per symbol",
            "6j compiled",
            "9j bulk per symbol",
            "9j compiled",
        ),
        rows,
    )
    for name, r6, r9, n6, n9 in ratios:
        VERDICTS.check(
            f"bulk float 6j (batch {n6}) within 5x of pywigxjpf at {name} j",
            r6 <= 5.0,
            f"{r6:.2f}x",
            "<= 5x",
        )
        VERDICTS.check(
            f"bulk float 9j (batch {n9}) within 5x of pywigxjpf at {name} j",
            r9 <= 5.0,
            f"{r9:.2f}x",
            "<= 5x",
        )


def _repeat_to(stream: list[tuple[int, ...]], size: int) -> list[tuple[int, ...]]:
    """The stream repeated (in order) up to ``size`` rows."""
    if not stream:
        return stream
    return [stream[k % len(stream)] for k in range(size)]


def run(smoke: bool) -> None:
    warm_up()
    _exact_vs_sympy("6j", smoke)
    _exact_vs_sympy("9j", smoke)
    _float_section(smoke)


if __name__ == "__main__":
    run("--smoke" in sys.argv[1:])
