"""Loading of the core's data tables.

Every table is a JSON file beside the code with ``source`` and ``edition`` next to the numbers.
Tables are read once per process.
"""

from __future__ import annotations

import json
from functools import cache
from importlib import resources
from typing import Any

_REQUIRED = ("title", "source")


@cache
def load(package: str, name: str) -> dict[str, Any]:
    """Return the parsed table ``name`` (without ``.json``) from ``package``'s ``data`` folder."""
    text = resources.files(package).joinpath("data", f"{name}.json").read_text(encoding="utf-8")
    table = json.loads(text)
    missing = [key for key in _REQUIRED if key not in table]
    if missing:
        raise RuntimeError(f"data table {package}/{name} lacks {missing}")
    return table


def core_table(name: str) -> dict[str, Any]:
    """A table from ``service/electrical/data``."""
    return load("service.electrical", name)


def device_table(name: str) -> dict[str, Any]:
    """A table from ``service/electrical/devices/data``."""
    return load("service.electrical.devices", name)


def provenance(table: dict[str, Any]) -> dict[str, Any]:
    """The source fields of a table, for a catalogue or a result."""
    return {key: table[key] for key in ("title", "source", "edition", "confidence", "notes") if key in table}
