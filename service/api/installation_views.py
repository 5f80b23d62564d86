"""POST /v1/installations/check, /report, /test-sheet and /design: a whole installation in one call."""

from __future__ import annotations

import flask

from service.api import deadline, metrics
from service.api.base import Blueprint
from service.api.errors import json_response
from service.contract import batch
from service.contract.design_schemas import DesignAnswerSchema, DesignBodySchema, designed
from service.contract.installation_schemas import (
    InstallationRequestSchema,
    InstallationResultSchema,
    installation_of,
    problem_messages,
    records,
)
from service.contract.strictjson import strict_loads
from service.contract.test_sheet import TestSheetSchema, sheet_csv, sheet_of
from service.electrical.inputs import Installation
from service.electrical.network.installation import InstallationResult, check_installation

blp = Blueprint(
    "installations",
    __name__,
    url_prefix="/v1/installations",
    description="A whole installation: the origin, its boards and every circuit, with the values carried down",
)


def checked(body: dict) -> tuple[Installation, InstallationResult, dict]:
    """The request's installation, the core's check of it (a bad tree is a 422 naming the field), and the
    problems of the circuits that did not validate."""
    inst, problems = installation_of(body)
    count = sum(len(board.circuits) for board in inst.boards)
    limit = flask.current_app.config["FAULTPATH_BATCH_LIMIT"]
    if count > limit:
        flask.abort(413, description=f"an installation holds at most {limit} circuits")
    result = check_installation(inst, body.get("checks"), progress=deadline.check, chunk=batch.CHUNK)
    return inst, result, problems


@blp.route("/check", methods=["POST"])
@blp.doc(operationId="checkInstallation")  # a stable name for client generators
@blp.arguments(InstallationRequestSchema())
@blp.response(200, InstallationResultSchema)
def check(body):
    """Check a whole installation

    The boards form a tree from the origin (`fed_from`, and the circuit of the board above that names the
    board in `feeds_board`). Each board gets its Ze, line-neutral loop, largest and smallest fault
    currents, voltage drop from the origin and demand per phase; every circuit is checked with its
    board's values, its drop from the origin and its selectivity with the device feeding its board. One
    result or one problem per circuit; a bad tree is a 422 naming the field.
    """
    inst, result, problems = checked(body)
    metrics.count_verdicts([i.verdict for board in result.boards for i in board.circuits if hasattr(i, "checks")])
    return json_response(records(inst, result, problems))


HTML = "text/html"


@blp.route("/report", methods=["POST"])
@blp.doc(operationId="reportInstallation")  # a stable name for client generators
@blp.arguments(InstallationRequestSchema())
@blp.doc(
    responses={
        "200": {
            "description": "The printable report: per board its values and schedule, the pictures, the cautions",
            "content": {HTML: {"schema": {"type": "string"}}},
        }
    }
)
def report(body):
    """A printable report of a whole installation (HTML)

    The same body as installations/check. One HTML document with its print styles and pictures inline:
    per board its values carried down from the origin, a schedule of its circuits with their figures and
    verdicts, a coordination picture for each pair of devices, and the cautions.
    """
    from service.report import report_html

    inst, result, problems = checked(body)
    html = report_html(inst, result, problem_messages(problems), tick=deadline.check, job=body.get("job"))
    response = flask.Response(html, mimetype=HTML)
    response.headers["Content-Security-Policy"] = "default-src 'none'; style-src 'unsafe-inline'; img-src data:"
    response.headers["Cache-Control"] = "no-store"
    return response


CSV = "text/csv"
SHEET_FORMS = {
    CSV: {"schema": {"type": "string", "description": "a row a circuit: its limits, its measurements, its design"}},
    HTML: {"schema": {"type": "string", "description": "the sheet to print and fill in by hand"}},
}


@blp.route("/test-sheet", methods=["POST"])
@blp.doc(operationId="testSheet")  # a stable name for client generators
@blp.arguments(InstallationRequestSchema())
@blp.response(200, TestSheetSchema)
@blp.doc(responses={200: {"content": SHEET_FORMS}})
def test_sheet(body):
    """The site test sheet of an installation (JSON, CSV or printable HTML by Accept)

    The same body as installations/check. Per circuit, what a tester must find on site (`expected`: the largest
    Zs and R1+R2 at the test temperature, a ring's end-to-end values, the RCD to test and its times, the
    insulation test voltage and minimum) and the measured fields, empty. The JSON is the very body that
    test-results/verify takes: fill in `measured` and send it back; the CSV, filled in a spreadsheet, is taken
    by test-results/verify as `text/csv`. Both are judged against the same limits.
    """
    inst, result, _ = checked(body)
    sheet = sheet_of(strict_loads(flask.request.get_data(cache=True)), inst, result)
    form = flask.request.accept_mimetypes.best_match(["application/json", CSV, HTML])
    if form == CSV:
        response = flask.Response(sheet_csv(sheet), mimetype=CSV)
        response.headers["Content-Disposition"] = 'attachment; filename="test-sheet.csv"'
        return response
    if form == HTML:
        from service.report import test_sheet_html

        response = flask.Response(test_sheet_html(sheet, result), mimetype=HTML)
        response.headers["Content-Security-Policy"] = "default-src 'none'; style-src 'unsafe-inline'"
        return response
    return json_response(sheet)


@blp.route("/design", methods=["POST"])
@blp.doc(operationId="designInstallation")  # a stable name for client generators
@blp.arguments(DesignBodySchema())
@blp.response(200, DesignAnswerSchema)
def design(body):
    """Design an installation: every size and rating left out chosen, and the bill of quantities

    The body of installations/check, where any circuit or sub-main may leave out `device.rating_a`,
    `conductors.line_csa_mm2` and `conductors.cpc_csa_mm2`; with `prices` the cost is kept least, else the
    material. The answer: `installation` (the completed body, which installations/check passes), `checked`
    (that check), `choices` (per circuit, what was chosen and each smaller candidate with the check that ruled it
    out), `traded` (where a larger sub-main let the circuits below stay smaller), `failures` (where no design
    passes: the circuit, the check, what would) and `bill_of_quantities`.
    """
    answer = designed(strict_loads(flask.request.get_data(cache=True)), tick=deadline.check)
    return json_response(answer)
