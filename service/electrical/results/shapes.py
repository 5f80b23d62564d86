"""A result's shape, declared once: each field of a result dataclass says what it means, whether it may be
null, the words it may take, and where else it appears.

The contract's response schemas (:mod:`service.contract.shapes`), the lean table's columns and the CLI's CSV
columns are all made from these declarations, so a new figure of a result is one line here (and the step
that computes it), never four edits in four files.
"""

from __future__ import annotations

import dataclasses
from collections.abc import Sequence
from typing import Any

MISSING: Any = dataclasses.MISSING


def figure(
    description: str = "",
    *,
    nullable: bool = True,
    choices: Sequence[str] | None = None,
    shape: type | None = None,
    values: type | None = None,
    key: str | None = None,
    lean: str | None = None,
    csv: tuple[int, str] | None = None,
    default: Any = MISSING,
    default_factory: Any = MISSING,
) -> Any:
    """One declared field of a result.

    ``description``: what the figure is, with its unit where the name does not say it; ``nullable``: may be
    null (a figure that does not exist for the circuit); ``choices``: the words it (or each of its items) may
    take; ``shape``: the dataclass of a nested object (or of each value of a mapping, or item of a list);
    ``key``: its name in JSON where Python cannot spell it (``with``); ``lean``: ``"number"`` or ``"text"``
    where the lean table carries it as a column (texts as positions in the answer's texts); ``csv``: its
    place and column name in the CLI's CSV answer.
    """
    metadata = {
        "description": description,
        "nullable": nullable,
        "choices": tuple(choices) if choices is not None else None,
        "shape": shape,
        "values": values,
        "key": key,
        "lean": lean,
        "csv": csv,
    }
    return dataclasses.field(default=default, default_factory=default_factory, metadata=metadata)


def lean_figures(shape: type, kind: str) -> tuple[str, ...]:
    """The names of the fields the lean table carries as columns of ``kind`` (``number`` or ``text``), in order."""
    return tuple(f.name for f in dataclasses.fields(shape) if f.metadata.get("lean") == kind)


def csv_figures(shape: type) -> list[tuple[str, tuple[str, ...]]]:
    """The CSV columns a shape gives, in their order: ``(column, path)`` where ``path`` leads from the result to the
    value (a figure of a nested shape: ``("protective_conductor", "min_csa_mm2")``)."""
    found: list[tuple[int, str, tuple[str, ...]]] = []
    for f in dataclasses.fields(shape):
        if f.metadata.get("csv"):
            place, column = f.metadata["csv"]
            found.append((place, column, (f.name,)))
        nested = f.metadata.get("shape")
        if nested is not None:
            found += [(p, column, (f.name, *path)) for p, column, path in _places(nested)]
    return [(column, path) for _, column, path in sorted(found)]


def _places(shape: type) -> list[tuple[int, str, tuple[str, ...]]]:
    return [
        (*f.metadata["csv"], (f.metadata.get("key") or f.name,))
        for f in dataclasses.fields(shape)
        if f.metadata.get("csv")
    ]
