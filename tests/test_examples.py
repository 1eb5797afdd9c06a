"""Every script in examples/ runs, exits 0 and prints what it promises."""

from __future__ import annotations

import subprocess
import sys
from pathlib import Path

import pytest

EXAMPLES = Path(__file__).resolve().parents[1] / "examples"

# script -> lines (or fragments) its output must contain
EXPECTED = {
    "spin_cluster.py": [
        "{s1 s2 s12; s3 s4 s34; s13 s24 S}",
        "matrix at S=3 (10 x 10):",
        "max |M M^T - 1| = ",
        "  agree",
    ],
    "two_valence_particles.py": [
        "{l1 s1 j1; l2 s2 j2; L S J}",
        "12 x 12 in all",
        "J=2: 4 x 4",
        ": orthogonal",
    ],
    "three_body_chain.py": [
        r"\begin{Bmatrix}",
        "def overlap(*, j1, j2, j3, j4,",
        "formula (exact):    (7/10)*sqrt(3/5)",
        "agree",
    ],
}


def test_every_example_is_listed() -> None:
    assert sorted(p.name for p in EXAMPLES.glob("*.py")) == sorted(EXPECTED)


@pytest.mark.parametrize("script", sorted(EXPECTED))
def test_example_runs(script: str) -> None:
    done = subprocess.run(
        [sys.executable, str(EXAMPLES / script)],
        capture_output=True,
        text=True,
        timeout=300,
        check=False,
    )
    assert done.returncode == 0, done.stdout[-2000:] + done.stderr[-2000:]
    assert "DISAGREE" not in done.stdout
    assert "NOT orthogonal" not in done.stdout
    for fragment in EXPECTED[script]:
        assert fragment in done.stdout, fragment
