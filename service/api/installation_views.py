"""POST /v1/installations/check and /v1/installations/report: a whole installation in one call."""

from __future__ import annotations

from typing import Any

import flask

from ..electrical.arrays import paused_gc
from ..electrical.columns import CircuitFailure
from ..electrical.errors import ElectricalError
from ..electrical.installation import InstallationResult, check_installation
from ..electrical.model import Unread
from . import metrics
from .base import Blueprint
from .errors import CoreInputError, json_response
from .helpers import failed_item, invalid_item
from .installation_schemas import InstallationRequestSchema, InstallationResultSchema, installation_of

blp = Blueprint(
    "installations",
    __name__,
    url_prefix="/v1/installations",
    description="A whole installation: the origin, its boards and every circuit, with the values carried down",
)


def checked(body: dict) -> tuple[InstallationResult, dict, dict[str, int]]:
    """The core's check of the request's installation (a bad tree is a 422 naming the field), the problems of
    the circuits that did not validate, and each board's position in the request."""
    inst, problems = installation_of(body)
    count = sum(len(board.circuits) for board in inst.boards)
    limit = flask.current_app.config["FAULTPATH_BATCH_LIMIT"]
    if count > limit:
        flask.abort(413, description=f"an installation holds at most {limit} circuits")
    try:
        with paused_gc():
            result = check_installation(inst, body.get("checks"))
    except ElectricalError as err:
        raise CoreInputError.of(err) from None
    return result, problems, {board.id: b for b, board in enumerate(inst.boards)}


def records(result: InstallationResult, problems: dict, positions: dict[str, int]) -> dict[str, Any]:
    """The answer: each board with its circuits as results or problems, the pointers into the request."""
    boards = []
    for board in result.boards:
        b = positions[board.id]
        items = [_item(b, c, item, problems) for c, item in enumerate(board.circuits)]
        boards.append({**vars(board), "circuits": items})
    return {**vars(result), "boards": boards}


def _item(b: int, c: int, item: Any, problems: dict) -> dict[str, Any]:
    base = f"/boards/{b}/circuits/{c}"
    if isinstance(item, Unread):
        problem = problems[(b, c)]
        return invalid_item(c, problem.id, problem.messages, base)
    if isinstance(item, CircuitFailure):
        return failed_item(c, item.id, item, {"supply": "/supply", "circuit": base})
    return {"index": c, "id": item.id, "result": item}


@blp.route("/check", methods=["POST"])
@blp.arguments(InstallationRequestSchema)
@blp.response(200, InstallationResultSchema)
def check(body):
    """Check a whole installation

    The boards form a tree from the origin (`fed_from`, and the circuit of the board above that names the
    board in `feeds_board`). Each board gets its Ze, line-neutral loop, largest and smallest fault
    currents, voltage drop from the origin and demand per phase; every circuit is checked with its
    board's values, its drop from the origin and its selectivity with the device feeding its board. One
    result or one problem per circuit; a bad tree is a 422 naming the field.
    """
    result, problems, positions = checked(body)
    metrics.count_verdicts([i.verdict for board in result.boards for i in board.circuits if hasattr(i, "checks")])
    return json_response(records(result, problems, positions))
