"""The result of a circuit check, and the one function that builds results from the pipeline's arrays.

A :class:`CircuitResult` field is filled from the column of the same name that a stage offers
(``FaultLoop.figures()``, ``DeviceResponse.figures()``), from the checks, or from the check's detail
columns; renaming an output is a change to this class and to the stage that computes it.
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from dataclasses import dataclass, fields
from typing import TYPE_CHECKING, Any

import numpy as np

from service.electrical.checks import CHECKS
from service.electrical.checks.overload import OverloadResult
from service.electrical.checks.protective_conductor import ProtectiveConductorResult
from service.electrical.checks.selectivity import SelectivityResult
from service.electrical.checks.short_circuit import ShortCircuitResult
from service.electrical.checks.voltage_drop import VoltageDropResult
from service.electrical.devices.characteristic import BOUNDS
from service.electrical.results import precision, verdicts
from service.electrical.results.shapes import figure
from service.electrical.results.verdicts import Verdict
from service.electrical.rules import requirements

if TYPE_CHECKING:
    from service.electrical.checks import CheckColumns
    from service.electrical.circuit_arrays import CircuitColumns
    from service.electrical.devices.response import DeviceResponse
    from service.electrical.network.faults import FaultLoop

DISCONNECTED_BY = ("overcurrent-device", "rcd")
GENERAL_CAUTIONS = (
    "This result supports a competent person; it does not replace one. A competent person must verify the design.",
    "The current edition of BS 7671 / IEC 60364, local codes and licensed practice prevail over this result.",
    "Site measurements (Ze, Zs, R1+R2, RCD operation) must confirm the design before the circuit is put into service.",
)


@dataclass
class Checked:
    """The pipeline's arrays for N circuits: the loop, the devices' response and every check."""

    cols: CircuitColumns
    loop: FaultLoop
    trip: DeviceResponse
    checks: list[CheckColumns]
    cautions: list[tuple[np.ndarray, str]]


@dataclass
class Check:
    """One check of one circuit: verdict, value against limit in ``unit``, margin, the clause, a note."""

    SCHEMA_NAME = "CheckResult"
    check: str = figure("the check's name", nullable=False, choices=CHECKS)
    verdict: Verdict = figure(nullable=False, choices=verdicts.VERDICTS)
    value: float | None = figure("what the circuit has, in unit")
    limit: float | None = figure("what the rule allows or asks, in unit")
    unit: str = figure("of value and limit", nullable=False)
    margin_percent: float | None = figure("(limit - value) / limit x 100; for the cpc, (size - minimum) / size x 100")
    basis: str = figure("the clause or table the verdict rests on", nullable=False)
    note: str | None = figure("why the verdict is what it is, where it is not plain", default=None)


@dataclass
class DeviceSummary:
    """Who the device is and where its data come from."""

    device_id: str = figure(nullable=False)
    label: str = figure(nullable=False)
    source: str = figure(nullable=False)
    confidence: str = figure(nullable=False)
    notes: list[str] = figure(nullable=False)


@dataclass
class VerdictScope:
    """What the overall verdict covers."""

    covered: list[str] = figure(nullable=False, choices=CHECKS)
    left_out: list[str] = figure(nullable=False, choices=CHECKS)
    not_assessed: list[str] = figure(
        "what the service does not judge at all (the same on every result): a pass never covers these", nullable=False
    )


@dataclass
class CircuitResult:
    """The result of one circuit's check: every figure, every check and the overall verdict (circuits/check).

    ``lean``: a column of the lean table (``cell`` as it is, ``text`` as a position in its texts); ``csv``: a
    column of the CLI's CSV answer, at its place."""

    id: str | None = figure("the circuit's id, as given")
    r1_plus_r2_ohm: float | None = figure(
        "line and cpc resistance at the conductors' operating temperature", lean="cell", csv=(1, "r1_plus_r2_ohm")
    )
    zs_ohm: float = figure("Ze + R1+R2", nullable=False, lean="cell", csv=(2, "zs_ohm"))
    earth_fault_current_a: float = figure(
        "U0 x Cmin / Zs, Cmin 0.95", nullable=False, lean="cell", csv=(5, "earth_fault_current_a")
    )
    earth_fault_current_nominal_a: float = figure("U0 / Zs", nullable=False)
    prospective_fault_current_ka: float | None = figure(
        "the larger of line-neutral and line-earth at the origin (434.1); null where it cannot be known (TT)",
        lean="cell",
    )
    prospective_fault_current_basis: str = figure(
        "how the prospective fault current was found", nullable=False, lean="text"
    )
    line_neutral_loop_ohm: float | None = figure("at the origin, as used for the smallest short circuit", lean="cell")
    min_short_circuit_current_a: float | None = figure(
        "a line-neutral fault at the far end, Cmin, conductors hot", lean="cell"
    )
    device: dict[str, Any] = figure(nullable=False, shape=DeviceSummary)
    disconnection_time_s: float | None = figure(
        "null where no disconnection is shown", lean="cell", csv=(6, "disconnection_time_s")
    )
    disconnection_time_bound: str = figure(
        "how the time is known from the device's data",
        nullable=False,
        choices=BOUNDS,
        lean="cell",
        csv=(7, "disconnection_time_bound"),
    )
    disconnection_region: str = figure("the region of the device's characteristic the fault falls in", nullable=False)
    disconnected_by: str | None = figure("which device clears the fault", choices=DISCONNECTED_BY, lean="cell")
    max_disconnection_time_s: float | None = figure(
        "Table 41.1, or 5 s", lean="cell", csv=(8, "max_disconnection_time_s")
    )
    max_disconnection_basis: str = figure("the clause the permitted time rests on", nullable=False, lean="text")
    operating_current_a: float | None = figure("Ia for the required time", lean="cell")
    operating_current_bound: str = figure("how Ia is known from the device's data", nullable=False, choices=BOUNDS)
    max_zs_ohm: float | None = figure(
        "U0 x Cmin / Ia of the overcurrent device; null where its data show no Ia for the time",
        lean="cell",
        csv=(3, "max_zs_ohm"),
    )
    zs_margin_percent: float | None = figure(
        "(max_zs_ohm - zs_ohm) / max_zs_ohm x 100", lean="cell", csv=(4, "zs_margin_percent")
    )
    rcd_max_zs_ohm: float | None = figure(
        "where an RCD is fitted: 50 V / IΔn, the largest Zs (TN) or RA (TT) it protects", lean="cell"
    )
    protective_conductor: dict[str, Any] = figure(nullable=False, shape=ProtectiveConductorResult)
    short_circuit: dict[str, Any] = figure(nullable=False, shape=ShortCircuitResult)
    overload: dict[str, Any] = figure(nullable=False, shape=OverloadResult)
    three_phase_fault_current_ka: float | None = figure(
        "symmetrical, at the origin of the circuit; null where unknown", lean="cell"
    )
    voltage_drop_from_origin_percent: float | None = figure(
        "the board's drop from the origin plus the circuit's", lean="cell"
    )
    voltage_drop: dict[str, Any] = figure(nullable=False, shape=VoltageDropResult)
    selectivity: dict[str, Any] | None = figure(
        "against the device feeding the circuit's board; null where that is not known", shape=SelectivityResult
    )
    checks: list[Check] = figure(nullable=False)
    verdict: Verdict = figure(
        "fail if a check in scope fails, else not-verified if one could not be made, else pass",
        nullable=False,
        choices=verdicts.VERDICTS,
    )
    verdict_scope: dict[str, list[str]] = figure(nullable=False, shape=VerdictScope)
    cautions: list[str] = figure(nullable=False, default_factory=list)

    def check(self, name: str) -> Check | None:
        """The check called ``name``, or None where it does not apply to this circuit."""
        return next((c for c in self.checks if c.check == name), None)


FIGURES = tuple(f.name for f in fields(CircuitResult))


def lists_of(columns: Mapping[str, Any], exact: bool = True, rules: Mapping[str, Any] | None = None) -> dict[str, list]:
    """Each column as a list: floats with None where NaN or infinite (JSON has neither), texts as they are.

    Unless ``exact``, numbers are rounded by their unit (:mod:`service.electrical.results.precision`; ``rules``
    gives the rule of a column, None to keep it as it is, where its name does not say it, or where the key
    is not a name). All float columns go through numpy together.
    """
    numeric = [name for name, col in columns.items() if isinstance(col, np.ndarray) and col.dtype.kind in "fiu"]
    converted: dict[str, list[Any]] = {}
    if numeric:
        stacked = np.vstack([np.asarray(columns[name], dtype=float) for name in numeric])
        if not exact:  # one rounding per rule, over every column it serves
            by_rule: dict[Any, list[int]] = {}
            for row, name in enumerate(numeric):
                rule = rules[name] if rules is not None and name in rules else precision.rule_for(name)
                by_rule.setdefault(rule, []).append(row)
            for rule, rows in by_rule.items():
                stacked[rows] = precision.rounded(stacked[rows], rule)
        missing = ~np.isfinite(stacked)
        if missing.any():  # None in those cells, set in one pass over Python objects
            cells = stacked.astype(object)
            cells[missing] = None
            stacked = cells
        converted = dict(zip(numeric, stacked.tolist(), strict=True))
    return {
        name: converted[name] if name in converted else (col.tolist() if isinstance(col, np.ndarray) else list(col))
        for name, col in columns.items()
    }


def check_numbers(check: CheckColumns) -> dict[str, tuple[Any, Any]]:
    """A check's value, limit and margin columns, each with the precision rule it is rounded by (the value
    and limit by the check's unit, the margin as margins are)."""
    unit = precision.rule_for_unit(check.unit)
    return {
        "value": (check.value, unit),
        "limit": (check.limit, unit),
        "margin_percent": (check.margin_percent, precision.RULES["margin_percent"]),
    }


def _cells(checked: Checked, exact: bool) -> tuple[dict[str, list], list[dict[Any, list]]]:
    """The circuit's figures, and each check's value, limit, margin, basis, note and detail cells, as lists:
    every number of the results through numpy in one pass (:func:`lists_of`), rounded by its unit."""
    from_checks = {name: col for c in checked.checks for name, col in c.figures.items()}
    figures = {**checked.loop.figures(), **checked.trip.figures(), **from_checks}
    columns: dict[Any, Any] = dict(figures)
    rules: dict[Any, Any] = {}  # the figures' rules come from their names (lists_of); the other keys are tuples
    for k, c in enumerate(checked.checks):
        parts: dict[Any, tuple[Any, Any]] = {**check_numbers(c), "basis": (c.basis, None), "note": (c.note, None)}
        for name, col in (c.detail[1] if c.detail is not None else {}).items():
            if name != "verdict":  # words or codes of the detail's own scale, decoded by _detail_records
                parts[("detail", name)] = (col, precision.rule_for(name))
        for part, (col, rule) in parts.items():
            columns[(k, part)], rules[(k, part)] = col, rule
    cells = lists_of(columns, exact, rules)
    per_check: list[dict[Any, list]] = [{} for _ in checked.checks]
    for key in columns:
        if isinstance(key, tuple):
            per_check[key[0]][key[1]] = cells[key]
    return {name: cells[name] for name in figures}, per_check


def _check_records(check: CheckColumns, cells: Mapping[Any, list], n: int) -> list[Check | None]:
    """One :class:`Check` per circuit where the check applies (None elsewhere)."""
    v = verdicts.decode(check.verdict)
    applies = [True] * n if check.applies is None else np.asarray(check.applies, dtype=bool).tolist()
    value, limit, margin, basis, note = (cells[k] for k in ("value", "limit", "margin_percent", "basis", "note"))
    return [
        Check(check.check, v[i], value[i], limit[i], check.unit, margin[i], basis[i], note[i]) if applies[i] else None
        for i in range(n)
    ]


def _detail_records(check: CheckColumns, cells: Mapping[Any, list], n: int) -> list[dict[str, Any] | None]:
    """The check's detail per circuit, None where the check does not apply; its ``verdict`` column is verdict
    codes, or the words of the detail's own scale (selectivity: total, partial ...)."""
    columns = check.detail[1]
    names = [name for name in columns if name != "verdict"]
    table = zip(*(cells[("detail", name)] for name in names), strict=True)
    rows = [dict(zip(names, row, strict=True)) for row in table]
    rows = rows or [{} for _ in range(n)]
    words = columns["verdict"]
    words = verdicts.decode(words) if np.asarray(words).dtype.kind in "iu" else list(words)
    for row, v in zip(rows, words, strict=True):
        row["verdict"] = v
    if check.applies is None:
        return rows
    return [row if a else None for row, a in zip(rows, np.asarray(check.applies, bool).tolist(), strict=True)]


def _cautions(checked: Checked) -> list[list[str]]:
    out = [list(GENERAL_CAUTIONS) for _ in range(checked.cols.n)]
    for mask, text in checked.cautions:
        for i in np.flatnonzero(mask).tolist():
            out[i].append(text)
    return out


def verdict_scopes(checked: Checked, scope: Sequence[str] | None) -> tuple[np.ndarray, list[dict[str, list[str]]]]:
    """Overall verdict codes over the checks that count and are in scope, and what each result covered.

    ``covered``: the checks the verdict rests on; ``left_out``: the checks reported but outside it (not in the
    request's ``checks``, or reported only, like selectivity where it is not required); ``not_assessed``: what the
    service does not judge at all (the same on every result), so that a pass says exactly what it covers.
    """
    n = checked.cols.n
    applies = [np.ones(n, bool) if c.applies is None else np.asarray(c.applies, bool) for c in checked.checks]
    counted = [
        a & (True if c.counts is None else np.asarray(c.counts, bool)) & (scope is None or c.check in scope)
        for c, a in zip(checked.checks, applies, strict=True)
    ]
    codes = np.vstack(
        [np.where(a, c.verdict, verdicts.PASS) for c, a in zip(checked.checks, counted, strict=True)]
    ).max(axis=0)
    shown, counts = np.vstack(applies), np.vstack(counted)
    names = [c.check for c in checked.checks]
    # one pattern of (shown, counted) per circuit as an integer; the few distinct patterns are spelled out once
    weights = 1 << np.arange(len(names), dtype=np.int64)
    patterns = (shown.T.astype(np.int64) @ weights) << len(names) | (counts.T.astype(np.int64) @ weights)
    spelled: dict[int, dict[str, list[str]]] = {}
    not_assessed = requirements.not_assessed()
    for p in set(patterns.tolist()):
        s, k = p >> len(names), p & ((1 << len(names)) - 1)
        spelled[p] = {
            "covered": [x for j, x in enumerate(names) if k >> j & 1],
            "left_out": [x for j, x in enumerate(names) if s >> j & 1 and not k >> j & 1],
            "not_assessed": not_assessed,
        }
    return codes, [spelled[p] for p in patterns.tolist()]


def assemble(checked: Checked, scope: Sequence[str] | None = None, exact: bool = False) -> list[CircuitResult]:
    """One :class:`CircuitResult` per circuit, in order, from the pipeline's arrays.

    The overall verdict covers every check, or those named in ``scope`` (each result says which in
    ``verdict_scope``). Numbers are rounded to what the data support, unless ``exact``.
    """
    cols = checked.cols
    n = cols.n
    figures, cells = _cells(checked, exact)
    names = list(figures)
    per_check = [_check_records(c, cells[k], n) for k, c in enumerate(checked.checks)]
    details = {c.detail[0]: _detail_records(c, cells[k], n) for k, c in enumerate(checked.checks) if c.detail}
    codes, scopes = verdict_scopes(checked, scope)
    overall = verdicts.decode(codes)
    summaries = {id(d): d.summary() for d in {id(d): d for d in cols.devices}.values()}
    cautions = _cautions(checked)
    rows = zip(*(figures[name] for name in names), strict=True)
    return [
        CircuitResult(
            id=circuit.id,
            device=summaries[id(dev)],
            checks=[c[i] for c in per_check if c[i] is not None],
            verdict=overall[i],
            verdict_scope=scopes[i],
            cautions=cautions[i],
            **{key: details[key][i] for key in details},
            **dict(zip(names, row, strict=True)),
        )
        for i, (circuit, dev, row) in enumerate(zip(cols.circuits, cols.devices, rows, strict=True))
    ]
