"""POST /v1/circuits/check, /v1/circuits/check-batch and /v1/circuits/picture."""

from __future__ import annotations

import flask

from service.api import deadline, metrics
from service.api.base import Blueprint
from service.api.errors import CoreInputError, json_response
from service.api.helpers import svg_response
from service.api.lean import FormSchema, LeanBatchSchema, lean_answer
from service.contract.circuit_schemas import BatchRequestSchema, CheckRequestSchema
from service.contract.item_lists import ItemProblem
from service.contract.problems import failed_item, invalid_item, json_bytes
from service.contract.result_schemas import CheckAnswerSchema
from service.electrical.circuit_arrays import CircuitFailure
from service.electrical.devices.catalogue import resolve
from service.electrical.pipeline import check_circuits
from service.electrical.results.verdicts import COUNTED
from service.electrical.results.verdicts import summary as verdicts_summary
from service.picture import characteristic_svg

blp = Blueprint(
    "circuits",
    __name__,
    url_prefix="/v1/circuits",
    description="Whole-circuit checks: every figure, every check, a verdict",
)

SINGLE = {"supply": "/supply", "circuit": "/circuit"}
NDJSON = "application/x-ndjson"
CHUNK = 2000


def _checked_one(body):
    """One circuit's result, computed with any other single checks in flight in this worker (coalesce.py)."""
    coalescer = flask.current_app.extensions["faultpath_coalescer"]
    result = coalescer.check(body["supply"], body["circuit"], body.get("checks"))
    if isinstance(result, CircuitFailure):
        raise CoreInputError.of(result, SINGLE)
    return result


@blp.route("/check", methods=["POST"])
@blp.arguments(CheckRequestSchema())
@blp.response(200, CheckAnswerSchema)
def check(body):
    """Check one circuit

    Zs, earth fault current, disconnection time, the limits, the protective conductor, and a
    verdict for each check with the clause it rests on.
    """
    result = _checked_one(body)
    metrics.count_verdicts([result.verdict])
    return json_response({**vars(result), "edition": body["edition"]})


@blp.route("/picture", methods=["POST"])
@blp.arguments(CheckRequestSchema())
@blp.doc(
    responses={
        "200": {
            "description": "The time-current picture of the checked circuit",
            "content": {"image/svg+xml": {"schema": {"type": "string"}}},
        }
    }
)
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
@blp.arguments(FormSchema(), location="query")
@blp.arguments(BatchRequestSchema())
@blp.response(200, LeanBatchSchema)
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
    if flask.request.accept_mimetypes.best_match(["application/json", NDJSON]) == NDJSON:
        return flask.Response(flask.stream_with_context(_ndjson(body, items)), mimetype=NDJSON)
    if query["form"] == "lean":
        return json_response(lean_answer(body["supply"], items, body.get("checks"), body["edition"]))
    return _full_answer(body, items)


def _full_answer(body, items) -> flask.Response:
    """The full form, written a chunk at a time: each chunk's results become JSON and are let go before the
    next chunk is checked, so a worker never holds every result object of a large batch and its text at once.
    The answer is the same JSON as ``{"results": [...], "summary": {...}}`` written whole."""
    counts = Counts()
    parts = [b'{"results":[']
    for start in range(0, len(items), CHUNK):
        deadline.check()
        chunk = json_bytes(_checked(body, items[start : start + CHUNK], start, counts))
        parts.append((b"," if start else b"") + chunk[1:-1])  # the chunk's items, without the list's brackets
    parts.append(b'],"summary":' + json_bytes(counts.summary(len(items))))
    parts.append(b',"edition":' + json_bytes(body["edition"]) + b"}")
    response = flask.current_app.response_class(parts, mimetype="application/json")
    response.headers["Content-Length"] = str(sum(map(len, parts)))
    return response


class Counts:
    """Verdicts counted as the items come."""

    def __init__(self):
        self.verdicts = dict.fromkeys(COUNTED, 0)

    def add(self, verdicts):
        for v in verdicts:
            self.verdicts[v] += 1
        metrics.count_verdicts(verdicts)

    def summary(self, n):
        return verdicts_summary(self.verdicts, n)


def _checked(body, items, offset, counts):
    """One record per item of a chunk, in order: a result, or a problem naming the fields."""
    valid = [item for item in items if not isinstance(item, ItemProblem)]
    outcomes = iter(check_circuits(body["supply"], valid, body.get("checks")) if valid else [])
    out = []
    verdicts = []
    for local, item in enumerate(items):
        index = offset + local
        if isinstance(item, ItemProblem):
            out.append(invalid_item(index, item.id, item.messages, f"/circuits/{index}"))
            continue
        outcome = next(outcomes)
        if isinstance(outcome, CircuitFailure):
            out.append(failed_item(index, item.id, outcome, {"supply": "/supply", "circuit": f"/circuits/{index}"}))
        else:
            out.append({"index": index, "id": outcome.id, "result": outcome})
            verdicts.append(outcome.verdict)
    counts.add(verdicts)
    return out


def _ndjson(body, items):
    """One JSON line per item, in order, computed a chunk at a time; the last line is the summary."""
    counts = Counts()
    for start in range(0, len(items), CHUNK):
        yield b"".join(
            json_bytes(record) + b"\n" for record in _checked(body, items[start : start + CHUNK], start, counts)
        )
    yield json_bytes({"summary": counts.summary(len(items)), "edition": body["edition"]}) + b"\n"
