"""POST /v1/test-results/verify: measured values judged against each circuit's limits."""

from __future__ import annotations

from service.api.base import Blueprint
from service.api.errors import json_response
from service.contract import fastload
from service.contract.item_lists import ItemProblem
from service.contract.measurement_schemas import VerifyItemSchema, VerifyRequestSchema, VerifyResultSchema
from service.contract.problems import failed_item, invalid_item
from service.electrical.circuit_arrays import CircuitFailure
from service.electrical.verification import verify

blp = Blueprint(
    "test_results",
    __name__,
    url_prefix="/v1/test-results",
    description="Measured test results against the design limits",
)


fastload.register(VerifyItemSchema)


@blp.route("/verify", methods=["POST"])
@blp.doc(operationId="verifyTestResults")  # a stable name for client generators
@blp.arguments(VerifyRequestSchema())
@blp.response(200, VerifyResultSchema)
def verify_results(body):
    """Judge measured Ze, fault level, Zs, R1+R2, ring continuity, insulation, RCD tests and polarity per circuit

    Zs and R1+R2 measured cold are compared with the design limit scaled by the ratio of resistances,
    with the 0.8 rule shown beside it. One result or problem per item, in order.
    """
    items = body["circuits"]
    good = [item for item in items if not isinstance(item, ItemProblem)]
    outcomes = iter(verify(body["supply"], [(item["circuit"], item["measured"]) for item in good]) if good else [])
    results = []
    for index, item in enumerate(items):
        if isinstance(item, ItemProblem):
            results.append(invalid_item(index, item.id, item.messages, f"/circuits/{index}", "item"))
            continue
        outcome = next(outcomes)
        if isinstance(outcome, CircuitFailure):
            roots = {
                "supply": "/supply",
                "circuit": f"/circuits/{index}/circuit",
                "measured": f"/circuits/{index}/measured",
            }
            results.append(failed_item(index, item["circuit"].id, outcome, roots, "item"))
        else:
            results.append({"index": index, "id": outcome.id, "result": outcome})
    return json_response({"results": results, "edition": body["edition"]})
