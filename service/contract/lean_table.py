"""The lean form of many results: a table, one cell per circuit in each column, straight from the arrays.

A batch of ten thousand circuits repeats the same few dozen texts (clauses, notes, cautions) and device
descriptions in every result. Here every text is said once, in a list the cells point into by position, and
so is every device; the general cautions are said once for the whole answer. The answer is a table held by
column: each column (named once) has one cell per circuit, in order: the circuit's figures and, per check,
its verdict, value, limit, margin and the positions of its basis and note. Numbers carry the precision of
the full results (:mod:`service.electrical.results.precision`). Nothing is built per circuit.
"""

from __future__ import annotations

from collections.abc import Hashable, Sequence
from dataclasses import dataclass
from operator import attrgetter
from typing import Any

import numpy as np

from service.electrical.circuit_arrays import CircuitFailure
from service.electrical.inputs import Circuit, Supply
from service.electrical.pipeline import Checked, checked_run
from service.electrical.results import verdicts
from service.electrical.results.circuit_result import CircuitResult, check_numbers, lists_of, verdict_scopes
from service.electrical.results.shapes import lean_figures

# the circuit's own figures, as its shape declares them (lean="cell"; "text": given as text positions)
FIGURES = lean_figures(CircuitResult, "cell")
TEXT_FIGURES = lean_figures(CircuitResult, "text")
CHECK_FIELDS = ("verdict", "value", "limit", "margin_percent", "basis", "note")


class Interned:
    """Values said once: each distinct value gets the next position; rows hold positions."""

    def __init__(self) -> None:
        self.position: dict[Hashable, int] = {}
        self.items: list[Any] = []

    def code(self, key: Hashable, value: Any = None) -> int | None:
        if key is None:
            return None
        at = self.position.get(key)
        if at is None:
            at = self.position[key] = len(self.items)
            self.items.append(key if value is None else value)
        return at

    def codes(self, keys: Any) -> list[int | None]:
        """The positions of many keys: the distinct ones are interned once, then looked up in one pass."""
        keys = keys.tolist() if isinstance(keys, np.ndarray) else list(keys)
        known = {k: self.code(k) for k in dict.fromkeys(keys)}
        return list(map(known.__getitem__, keys))


def column_names(check_names: Sequence[str]) -> list[str]:
    """The names of the answer's columns, in order."""
    per_check = [f"{name}.{f}" for name in check_names for f in CHECK_FIELDS]
    return ["index", "id", "verdict", "device", *FIGURES, *TEXT_FIGURES, *per_check, "left_out", "cautions", "problem"]


_ID = attrgetter("id")
WORDS = np.array([str(v) for v in verdicts.VERDICTS], dtype=object)


def columns_of_checked(
    checked: Checked,
    indices: Sequence[int],
    texts: Interned,
    devices: Interned,
    scope: Sequence[str] | None = None,
    exact: bool = False,
) -> dict[str, list]:
    """The answer's columns for the circuits of ``checked`` (``indices``: each circuit's place in the request)."""
    cols, n = checked.cols, checked.cols.n
    codes, scopes = verdict_scopes(checked, scope)
    figures = {**checked.loop.figures(), **checked.trip.figures()}
    for check in checked.checks:
        figures.update(check.figures)
    out: dict[str, list] = {"index": list(indices), "id": list(map(_ID, cols.circuits))}
    out["verdict"] = WORDS[codes].tolist()
    distinct = {id(d): d for d in cols.devices}
    device_codes = {key: devices.code((d.device_id, d.label), d.summary()) for key, d in distinct.items()}
    out["device"] = list(map(device_codes.__getitem__, map(id, cols.devices)))
    out.update(lists_of({name: figures[name] for name in FIGURES}, exact))
    for name in TEXT_FIGURES:
        out[name] = texts.codes(figures[name])
    for check in checked.checks:
        out.update(_check_columns(check, exact, texts))
    out["left_out"] = [s["left_out"] or None for s in scopes]
    out["cautions"] = _caution_codes(checked, texts)
    out["problem"] = [None] * n
    return out


def _check_columns(check, exact: bool, texts: Interned) -> dict[str, list]:
    parts = check_numbers(check)
    numbers = lists_of({k: col for k, (col, _) in parts.items()}, exact, {k: rule for k, (_, rule) in parts.items()})
    words = WORDS[np.asarray(check.verdict, dtype=np.intp)]
    if check.applies is not None:
        words = np.where(np.asarray(check.applies, bool), words, None)
    name = check.check
    return {
        f"{name}.verdict": words.tolist(),
        **{f"{name}.{k}": v for k, v in numbers.items()},
        f"{name}.basis": texts.codes(check.basis),
        f"{name}.note": texts.codes(check.note),
    }


def _caution_codes(checked: Checked, texts: Interned) -> list[list[int] | None]:
    """Each circuit's own cautions as text positions (the general ones are said once for the answer).

    The circuits fall into a few patterns of cautions; each pattern is spelled out once."""
    n = checked.cols.n
    pairs = [(np.asarray(mask, bool), text) for mask, text in checked.cautions if np.any(mask)]
    if not pairs:
        return [None] * n
    patterns, inverse = _patterns(np.vstack([mask for mask, _ in pairs]).T)
    codes = [texts.code(text) for _, text in pairs]
    spelled = [[codes[j] for j in np.flatnonzero(row).tolist()] or None for row in patterns]
    return [spelled[k] for k in np.asarray(inverse).reshape(-1).tolist()]


def _patterns(matrix: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """The distinct rows of a boolean matrix and each row's place among them (``np.unique(axis=0)``'s answer,
    in another order: through one integer a row where the rows are short, which is many times quicker)."""
    width = matrix.shape[1]
    if width > 62:
        return np.unique(matrix, axis=0, return_inverse=True)
    bits = np.arange(width, dtype=np.int64)
    distinct, inverse = np.unique(matrix.astype(np.int64) @ (np.int64(1) << bits), return_inverse=True)
    return ((distinct[:, None] >> bits) & 1).astype(bool), inverse


def empty_columns(names: Sequence[str]) -> dict[str, list]:
    return {name: [] for name in names}


def extend(table: dict[str, list], part: dict[str, list]) -> None:
    for name, values in part.items():
        table[name].extend(values)


def add_problem(table: dict[str, list], index: int, ident: str | None, problem: int) -> None:
    """The cells of an item that could not be checked: its place, its id, ``invalid``, its problem's position."""
    for values in table.values():
        values.append(None)
    table["index"][-1], table["id"][-1], table["verdict"][-1], table["problem"][-1] = index, ident, "invalid", problem


@dataclass
class TablePart:
    """What one run gives: the columns of the circuits that could be checked (``good``: their positions in
    the list given), and a failure for each of the others."""

    columns: dict[str, list] | None
    good: list[int]
    failures: list[CircuitFailure]


def check_table(
    supply: Supply | Sequence[Supply],
    circuits: Sequence[Circuit],
    texts: Interned,
    devices: Interned,
    scope: Sequence[str] | None = None,
    exact: bool = False,
) -> TablePart:
    """:func:`~service.electrical.pipeline.check_circuits` in the lean form."""
    good, failures, checked = checked_run(supply, circuits)
    if checked is None:
        return TablePart(None, good, failures)
    return TablePart(columns_of_checked(checked, good, texts, devices, scope, exact), good, failures)
