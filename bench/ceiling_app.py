"""The ceiling for the single-check figure: the service as deployed, with the core's answer given ready.

Every request goes through the whole service (gunicorn, Flask, the strict reader, validation, the coalescing of
concurrent checks, writing the answer); only the core's run is replaced by the answer it gave once at start for
the bench's request. Its rate under load is what no faster core could beat. For the bench only.
"""

import json
from pathlib import Path

from service.app import create_app
from service.contract.circuit_schemas import CheckRequestSchema
from service.electrical.pipeline import check_circuits
from service.serving import coalescer as coalesce

app = create_app()
EXAMPLE = Path(__file__).resolve().parents[1] / "schemas" / "examples" / "circuits-check.json"
_REQUEST = json.loads(EXAMPLE.read_text())
with app.app_context():
    _body = CheckRequestSchema().load(_REQUEST)
_ANSWER = check_circuits([_body["supply"]], [_body["circuit"]])[0]


def _ready(supplies, circuits, scope=None):
    return [_ANSWER] * len(circuits)


coalesce.check_circuits = _ready
