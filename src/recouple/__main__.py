"""``python -m recouple``: the command line."""

from __future__ import annotations

from recouple.cli import main

raise SystemExit(main())
