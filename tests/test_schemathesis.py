"""Property-based tests of the whole contract with schemathesis, in-process against the app.

Every operation; checks: no server errors, documented status codes, content types and headers, and
responses that conform to their schemas. CI runs a bounded number of examples per operation
(FAULTPATH_SCHEMATHESIS_EXAMPLES, default 25); `sh scripts/schemathesis.sh` runs a large count.
"""

import os

import schemathesis
from hypothesis import HealthCheck, settings
from schemathesis.checks import not_a_server_error
from schemathesis.specs.openapi.checks import (
    content_type_conformance, response_headers_conformance, response_schema_conformance, status_code_conformance,
)

from service.app import create_app
from service.settings import Settings

APP = create_app({"SETTINGS": Settings(batch_limit=50)})
SCHEMA = schemathesis.openapi.from_wsgi("/openapi.json", APP)
CHECKS = [not_a_server_error, status_code_conformance, content_type_conformance, response_schema_conformance, response_headers_conformance]
EXAMPLES = int(os.environ.get("FAULTPATH_SCHEMATHESIS_EXAMPLES", "25"))


@SCHEMA.parametrize()
@settings(max_examples=EXAMPLES, deadline=None, suppress_health_check=list(HealthCheck))
def test_every_operation_conforms(case):
    case.call_and_validate(checks=CHECKS)
