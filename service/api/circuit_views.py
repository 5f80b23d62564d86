"""POST /v1/circuits/check, /v1/circuits/check-batch and /v1/circuits/picture."""

from __future__ import annotations

import flask

from service.api import deadline, metrics
from service.api.base import Blueprint
from service.api.errors import json_response, problem_roots
from service.api.helpers import svg_response
from service.contract import batch
from service.contract.circuit_schemas import BatchRequestSchema, CheckRequestSchema
from service.contract.lean import FormSchema, LeanBatchSchema, lean_answer
from service.contract.result_schemas import CheckAnswerSchema
from service.electrical.circuit_arrays import CircuitFailure
from service.electrical.devices.catalogue import resolve
from service.picture import characteristic_svg

blp = Blueprint(
    "circuits",
    __name__,
    url_prefix="/v1/circuits",
    description="Whole-circuit checks: every figure, every check, a verdict",
)

SINGLE = {"supply": "/supply", "circuit": "/circuit"}
NDJSON = "application/x-ndjson"
# check-batch answers in one of two JSON forms (?form=), or as NDJSON (Accept)
ANSWER_FORMS = {
    "application/json": {
        "schema": {"oneOf": [LeanBatchSchema, {"$ref": "#/components/schemas/BatchResult"}]}  # form=full: BatchResult
    },
    NDJSON: {
        "schema": {
            "description": (
                'one JSON object per line: a BatchItem per circuit, in order, then {"summary": BatchSummary}'
            ),
            "type": "string",
        }
    },
}


def _checked_one(body):
    """One circuit's result, computed with any other single checks in flight in this worker (coalesce.py)."""
    coalescer = flask.current_app.extensions["faultpath_coalescer"]
    result = coalescer.check(body["supply"], body["circuit"], body.get("checks"))
    if isinstance(result, CircuitFailure):
        raise result.as_error()  # a 422 naming the field (api/errors.py core_problem, below the roots SINGLE)
    return result


@blp.route("/check", methods=["POST"])
@blp.doc(operationId="checkCircuit")  # a stable name for client generators
@blp.arguments(CheckRequestSchema())
@blp.response(200, CheckAnswerSchema)
@problem_roots(SINGLE)
def check(body):
    """Check one circuit

    Zs, earth fault current, disconnection time, the limits, the protective conductor, and a
    verdict for each check with the clause it rests on.
    """
    result = _checked_one(body)
    metrics.count_verdicts([result.verdict])
    return json_response({**vars(result), "edition": body["edition"]})


@blp.route("/picture", methods=["POST"])
@blp.doc(operationId="drawCircuit")  # a stable name for client generators
@blp.arguments(CheckRequestSchema())
@blp.doc(
    responses={
        "200": {
            "description": "The time-current picture of the checked circuit",
            "content": {"image/svg+xml": {"schema": {"type": "string"}}},
        }
    }
)
@problem_roots(SINGLE)
def picture(body):
    """The time-current picture of one checked circuit (SVG)

    The device's curve, the earth fault current, the permitted time and the operating point, with the
    verdict in the title; the body is the same as for circuits/check.
    """
    result = _checked_one(body)
    svg = characteristic_svg(
        resolve(body["circuit"].device),
        result.earth_fault_current_a,
        result.disconnection_time_s,
        result.max_disconnection_time_s,
        result.verdict,
        result.disconnection_time_bound,
    )
    return svg_response(svg, cache_seconds=0)


@blp.route("/check-batch", methods=["POST"])
@blp.doc(operationId="checkCircuits")  # a stable name for client generators
@blp.arguments(FormSchema(), location="query")
@blp.arguments(BatchRequestSchema())
@blp.response(200, LeanBatchSchema)
@blp.doc(responses={200: {"content": ANSWER_FORMS}})
def check_batch(query, body):
    """Check many circuits sharing a supply

    One result or one problem per item, in order, each with its index and id; a bad item never
    sinks the others. The summary counts the verdicts. The answer is lean by default: a table with one
    cell per circuit in each column, every text and device said once (`form=full`: a whole result per
    item, texts inline). With `Accept: application/x-ndjson` the answer streams one JSON line per item
    (the full form), computed a chunk at a time, and a last line `{"summary": ...}`.
    """
    items = body["circuits"]
    limit = flask.current_app.config["FAULTPATH_BATCH_LIMIT"]
    if len(items) > limit:
        flask.abort(413, description=f"a batch holds at most {limit} circuits")
    scope, tail = body.get("checks"), {"edition": body["edition"]}
    counts = batch.Counts(metrics.count_verdicts)
    if flask.request.accept_mimetypes.best_match(["application/json", NDJSON]) == NDJSON:
        lines = batch.ndjson(batch.request_records(body["supply"], items, scope), counts, tail)
        return flask.Response(flask.stream_with_context(lines), mimetype=NDJSON)
    if query["form"] == "lean":
        answer = lean_answer(body["supply"], items, scope, body["edition"], deadline.check, metrics.count_verdicts)
        return json_response(answer)
    # the full form, written a chunk at a time (a worker never holds every result of a large batch at once)
    parts = list(batch.full_json(batch.request_records(body["supply"], items, scope, deadline.check), counts, tail))
    response = flask.current_app.response_class(parts, mimetype="application/json")
    response.headers["Content-Length"] = str(sum(map(len, parts)))
    return response
