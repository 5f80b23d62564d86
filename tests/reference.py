"""The published values the tests compare against, read from tests/data (see its README for the sources)."""

from __future__ import annotations

import csv
from pathlib import Path

DATA = Path(__file__).resolve().parent / "data"


def rows(name: str) -> list[dict[str, str]]:
    """The rows of a reference CSV under tests/data (comment lines, which carry the sources, skipped)."""
    text = (DATA / name).read_text(encoding="utf-8")
    return list(csv.DictReader(line for line in text.splitlines() if not line.startswith("#")))
