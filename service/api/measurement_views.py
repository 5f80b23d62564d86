"""POST /v1/test-results/verify: measured values judged against each circuit's limits."""

from __future__ import annotations

from collections import Counter

import flask

from service.api.base import Blueprint, body_types
from service.api.errors import json_response
from service.contract.item_lists import ItemProblem
from service.contract.measurement_schemas import VerifyRequestSchema, VerifyResultSchema
from service.contract.problems import failed_item, invalid_item
from service.electrical.circuit_arrays import CircuitFailure
from service.electrical.results import verdicts
from service.electrical.testing.verification import verify

blp = Blueprint(
    "test_results",
    __name__,
    url_prefix="/v1/test-results",
    description="Measured test results against the design limits",
)


CSV_BODY = (
    "a filled test sheet as installations/test-sheet wrote it in CSV (one row a circuit; the measured_ cells filled, "
    "the design cell left as it is); problems name the line of the file (the header is line 1) and the column"
)


@blp.route("/verify", methods=["POST"])
@blp.doc(operationId="verifyTestResults")  # a stable name for client generators
@blp.arguments(VerifyRequestSchema())
@blp.doc(requestBody={"content": {"text/csv": {"schema": {"type": "string", "description": CSV_BODY}}}})
@blp.response(200, VerifyResultSchema)
@body_types("application/json", "text/csv")
def verify_results(body):
    """Judge measured Ze, fault level, Zs, R1+R2, ring continuity, insulation, RCD tests and polarity per circuit

    Zs and R1+R2 measured cold are compared with the design limit scaled by the ratio of resistances,
    with the 0.8 rule shown beside it. One result or problem per item, in order.
    """
    items = body["circuits"]
    good = [item for item in items if not isinstance(item, ItemProblem)]
    supplies = [item.get("supply") or body["supply"] for item in good]
    pairs = [(item["circuit"], item["measured"]) for item in good]
    outcomes = iter(verify(supplies, pairs) if good else [])
    results, counts = [], Counter()
    for index, item in enumerate(items):
        if isinstance(item, ItemProblem):
            results.append(invalid_item(index, item.id, item.messages, f"/circuits/{index}", "item"))
            continue
        outcome = next(outcomes)
        if isinstance(outcome, CircuitFailure):
            at = f"/circuits/{index}"
            supply_at = f"{at}/supply" if item.get("supply") is not None else "/supply"
            roots = {"supply": supply_at, "circuit": f"{at}/circuit", "measured": f"{at}/measured"}
            results.append(failed_item(index, item["circuit"].id, outcome, roots, "item"))
        else:
            results.append({"index": index, "id": outcome.id, "result": outcome})
            counts[outcome.verdict] += 1
    as_read = flask.g.get("body_pointer")
    if as_read is not None:  # read from a filled test sheet's CSV: the problems name its lines and columns
        for record in results:
            for e in record.get("problem", {}).get("errors", []):
                e["pointer"] = as_read(e["pointer"])
    summary = verdicts.summary(counts, len(items))
    return json_response({"results": results, "summary": summary, "edition": body["edition"]})
