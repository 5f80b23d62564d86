"""The lean answer of a batch: the table of :mod:`service.contract.lean_table`, its texts and devices said once."""

from __future__ import annotations

from collections import Counter
from collections.abc import Callable, Sequence
from typing import Any

from marshmallow import fields, validate

from service.contract import batch
from service.contract.fields import ContractSchema
from service.contract.item_lists import ItemProblem
from service.contract.lean_table import Interned, add_problem, check_table, column_names, empty_columns, extend
from service.contract.problems import ProblemSchema
from service.contract.result_schemas import BatchSummarySchema, DeviceSummarySchema, edition_answer
from service.electrical.checks import CHECKS, UNITS
from service.electrical.circuit_arrays import CircuitFailure
from service.electrical.results import verdicts
from service.electrical.results.circuit_result import GENERAL_CAUTIONS
from service.electrical.rules import requirements

FORMS = ("lean", "full")


class FormSchema(ContractSchema):
    form = fields.String(
        load_default="lean",
        validate=validate.OneOf(FORMS),
        metadata={"description": "lean: a table, each text once (default); full: a whole result per item"},
    )


class CheckUnitSchema(ContractSchema):
    check = fields.String(required=True, validate=validate.OneOf(CHECKS))
    unit = fields.String(required=True, metadata={"description": "of its value and limit"})


class ProblemItemSchema(ContractSchema):
    index = fields.Integer(required=True)
    id = fields.String(allow_none=True, required=True)
    problem = fields.Nested(ProblemSchema, required=True)


class LeanBatchSchema(ContractSchema):
    form = fields.String(required=True, validate=validate.Equal("lean"))
    columns = fields.Dict(
        keys=fields.String(),
        values=fields.List(fields.Raw(allow_none=True)),
        required=True,
        metadata={
            "description": "one list per column, one cell per item in order. Columns: index, id, verdict (or "
            "invalid), device (a position in devices), the circuit's figures as the full result names them, "
            "prospective_fault_current_basis and max_disconnection_basis (positions in texts), per check "
            "<check>.verdict (null where it does not apply), .value, .limit, .margin_percent, .basis and .note "
            "(positions in texts), left_out (the checks reported outside the verdict), cautions (positions in "
            "texts, beside the general ones), problem (a position in problems)"
        },
    )
    texts = fields.List(fields.String(), required=True, metadata={"description": "every text, once"})
    devices = fields.List(fields.Nested(DeviceSummarySchema), required=True)
    checks = fields.List(fields.Nested(CheckUnitSchema), required=True)
    problems = fields.List(fields.Nested(ProblemItemSchema), required=True)
    cautions = fields.List(fields.String(), required=True, metadata={"description": "for every result"})
    not_assessed = fields.List(
        fields.String(), required=True, metadata={"description": "what no result judges (verdict_scope.not_assessed)"}
    )
    summary = fields.Nested(BatchSummarySchema, required=True)
    edition = edition_answer()


def lean_answer(
    supply: Any,
    items: Sequence[Any],
    scope: Sequence[str] | None,
    edition: str,
    between: Callable[[], None] | None = None,
    counted: Callable[[list[str]], None] | None = None,
) -> dict[str, Any]:
    """The lean answer for the items of a batch, a chunk at a time through the core (:func:`batch.chunks`);
    ``between`` is called before each chunk, ``counted`` told the verdicts."""
    names = column_names(CHECKS)
    table, texts, devices = empty_columns(names), Interned(), Interned()
    problems: list[dict[str, Any]] = []
    for start, chunk in batch.chunks(items, between):
        places = [start + i for i, item in enumerate(chunk) if not isinstance(item, ItemProblem)]
        part = check_table(supply, [items[i] for i in places], texts, devices, scope) if places else None
        if part is not None and part.columns is not None:
            part.columns["index"] = [places[i] for i in part.good]
        _merge(table, part, places, chunk, start, problems)
    counts = [v for v in table["verdict"] if v != "invalid"]
    if counted is not None:
        counted(counts)
    summary = verdicts.summary(Counter(counts), len(items))
    steps = [{"check": name, "unit": UNITS[name]} for name in CHECKS]
    return {
        "form": "lean",
        "columns": table,
        "texts": texts.items,
        "devices": devices.items,
        "checks": steps,
        "problems": problems,
        "cautions": list(GENERAL_CAUTIONS),
        "not_assessed": requirements.not_assessed(),
        "summary": summary,
        "edition": edition,
    }


def _merge(table, part, places, chunk, start, problems) -> None:
    """A chunk's cells into the table, in the items' order: the checked ones, and a problem row for the others."""
    good, failures = (part.good, part.failures) if part is not None else ([], [])
    rows_at = {places[i]: k for k, i in enumerate(good)}
    failed_at = {places[f.index]: f for f in failures}
    pending = 0
    for offset, item in enumerate(chunk):
        index = start + offset
        if index in rows_at:
            pending += 1
            continue
        if pending:
            _take(table, part, rows_at, index - pending, pending)
            pending = 0
        problems.append(_problem(index, item, failed_at.get(index)))
        add_problem(table, index, problems[-1]["id"], len(problems) - 1)
    if pending:
        _take(table, part, rows_at, start + len(chunk) - pending, pending)


def _take(table, part, rows_at, first: int, count: int) -> None:
    k = rows_at[first]
    extend(table, {name: values[k : k + count] for name, values in part.columns.items()})


def _problem(index: int, item: Any, failure: CircuitFailure | None) -> dict[str, Any]:
    problem = batch.request_problem(index, item)
    return problem if problem is not None else batch.request_failure(index, item, failure)
