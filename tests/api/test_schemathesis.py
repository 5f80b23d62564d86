"""Property-based tests of the whole contract with schemathesis, in-process against the app.

Every operation; checks: no server errors, documented status codes, content types and headers, and
responses that conform to their schemas. CI runs a bounded number of examples per operation
(FAULTPATH_SCHEMATHESIS_EXAMPLES, default 25); `sh scripts/schemathesis.sh` runs a large count.
"""

import os

import schemathesis
from hypothesis import HealthCheck, settings
from schemathesis.checks import not_a_server_error
from schemathesis.generation.modes import GenerationMode
from schemathesis.specs.openapi.checks import (
    content_type_conformance,
    negative_data_rejection,
    response_headers_conformance,
    response_schema_conformance,
    status_code_conformance,
)

from service.app import create_app
from service.settings import Settings

APP = create_app({"SETTINGS": Settings(batch_limit=50)})
SCHEMA = schemathesis.openapi.from_wsgi("/openapi.json", APP)
CHECKS = [
    not_a_server_error,
    status_code_conformance,
    content_type_conformance,
    response_schema_conformance,
    response_headers_conformance,
]
EXAMPLES = int(os.environ.get("FAULTPATH_SCHEMATHESIS_EXAMPLES", "25"))


@SCHEMA.parametrize()
@settings(max_examples=EXAMPLES, deadline=None, suppress_health_check=list(HealthCheck))
def test_every_operation_conforms(case):
    case.call_and_validate(checks=CHECKS)


# Invalid input (negative generation): never a server error, always a 4xx, answers as documented.
# The API is stateless (pure computations, no resources to link), so there are no stateful links to follow.
NEGATIVE = schemathesis.openapi.from_wsgi("/openapi.json", APP)
NEGATIVE.config.generation.update(modes=[GenerationMode.NEGATIVE])
NEGATIVE_CHECKS = [
    not_a_server_error,
    negative_data_rejection,
    status_code_conformance,
    content_type_conformance,
    response_schema_conformance,
]


PER_ITEM = (
    "/v1/circuits/check-batch",
    "/v1/test-results/verify",
    "/v1/installations/check",
    "/v1/installations/report",  # the same body as installations/check, as a printable page
)


@NEGATIVE.parametrize()
@settings(max_examples=EXAMPLES, deadline=None, suppress_health_check=list(HealthCheck))
def test_every_operation_rejects_invalid_input(case):
    if case.path not in PER_ITEM:
        case.call_and_validate(checks=NEGATIVE_CHECKS)
        return
    # By contract a batch answers a bad item with a problem in its place (200), so the whole-request
    # rejection check does not apply; instead every item must come back, in order, as a result or a problem.
    response = case.call_and_validate(checks=[c for c in NEGATIVE_CHECKS if c is not negative_data_rejection])
    body = case.body if isinstance(case.body, dict) else {}
    content_type = (response.headers.get("content-type") or [""])[0]
    if (
        response.status_code == 200
        and content_type.startswith("application/json")
        and isinstance(body.get("circuits"), list)
    ):
        answer = response.json()
        if "results" in answer:
            results = answer["results"]
            assert [r["index"] for r in results] == list(range(len(body["circuits"])))
            assert all(("result" in r) != ("problem" in r) for r in results)
        else:  # the lean table: one cell per item in every column
            assert answer["columns"]["index"] == list(range(len(body["circuits"])))
    if response.status_code == 200 and isinstance(body.get("boards"), list):
        if content_type.startswith("text/html"):  # the report: one row per circuit sent, checked or not
            sent = sum(len(b.get("circuits") or []) for b in body["boards"] if isinstance(b, dict))
            assert response.text.count('<tr class="circuit"') == sent
            return
        for board in response.json()["boards"]:
            assert all(("result" in r) != ("problem" in r) for r in board["circuits"])
