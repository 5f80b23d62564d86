"""POST /v1/circuits/check and /v1/circuits/check-batch."""

from __future__ import annotations

import dataclasses

import flask

from ..electrical.circuit import CircuitFailure, check_circuits
from . import metrics
from .base import Blueprint
from .errors import CoreInputError, field_pointer, flatten, problem_body
from .schemas import BatchRequestSchema, BatchResultSchema, CheckRequestSchema, CircuitResultSchema, ItemProblem

blp = Blueprint("circuits", __name__, url_prefix="/v1/circuits", description="Whole-circuit checks: every figure, every check, a verdict")


def _pointer(base: str, field: str) -> str:
    return field_pointer("", field) if field.startswith("supply.") else field_pointer(base, field)


def _failure_errors(failure: CircuitFailure, base: str) -> list[dict[str, str]]:
    return [{"pointer": _pointer(base, failure.field), "message": failure.message}]


@blp.route("/check", methods=["POST"])
@blp.arguments(CheckRequestSchema)
@blp.response(200, CircuitResultSchema)
def check(body):
    """Check one circuit

    Zs, earth fault current, disconnection time, the limits, the protective conductor, and a
    verdict for each check with the clause it rests on.
    """
    result = check_circuits(body["supply"], [body["circuit"]])[0]
    if isinstance(result, CircuitFailure):
        raise CoreInputError(_failure_errors(result, "/circuit"))
    metrics.count_verdicts([result.verdict])
    return dataclasses.asdict(result)


@blp.route("/check-batch", methods=["POST"])
@blp.arguments(BatchRequestSchema)
@blp.response(200, BatchResultSchema)
def check_batch(body):
    """Check many circuits sharing a supply

    One result or one problem per item, in order, each with its index and id; a bad item never
    sinks the others. The summary counts the verdicts.
    """
    items = body["circuits"]
    limit = flask.current_app.config["FAULTPATH_BATCH_LIMIT"]
    if len(items) > limit:
        flask.abort(413, description=f"a batch holds at most {limit} circuits")
    valid = [(i, item) for i, item in enumerate(items) if not isinstance(item, ItemProblem)]
    checked = check_circuits(body["supply"], [item for _, item in valid]) if valid else []
    results: list[dict] = [None] * len(items)  # type: ignore[list-item]
    for index, item in enumerate(items):
        if isinstance(item, ItemProblem):
            results[index] = {"index": index, "id": item.id,
                              "problem": problem_body(422, "This circuit did not validate.", flatten(item.messages, f"/circuits/{index}"))}
    for (index, item), outcome in zip(valid, checked):
        if isinstance(outcome, CircuitFailure):
            results[index] = {"index": index, "id": item.id,
                              "problem": problem_body(422, "The rules or the data do not cover this circuit.", _failure_errors(outcome, f"/circuits/{index}"))}
        else:
            results[index] = {"index": index, "id": outcome.id, "result": dataclasses.asdict(outcome)}
    verdicts = [r["result"]["verdict"] for r in results if "result" in r]
    metrics.count_verdicts(verdicts)
    summary = {
        "circuits": len(items),
        "passed": verdicts.count("pass"),
        "failed": verdicts.count("fail"),
        "not_verified": verdicts.count("not-verified"),
        "invalid": len(items) - len(verdicts),
    }
    return {"results": results, "summary": summary}
