"""Calling Faultpath from Python with the client openapi-python-client generates from schemas/openapi.json.

    openapi-python-client generate --path schemas/openapi.json --meta none --output-path faultpath_client
    FAULTPATH_URL=http://127.0.0.1:8000 FAULTPATH_KEY=... python python_demo.py

The README shows this file; the test suite runs it against a live service.
"""

import json
import os
from pathlib import Path

from faultpath_client import AuthenticatedClient
from faultpath_client.api.circuits import check_circuit, check_circuits
from faultpath_client.api.sizing import size_circuit
from faultpath_client.models import BatchRequest, CheckAnswer, CheckRequest, LeanBatch, Problem, SizeRequest

EXAMPLES = Path(os.environ.get("FAULTPATH_EXAMPLES", "schemas/examples"))
client = AuthenticatedClient(
    base_url=os.environ["FAULTPATH_URL"], token=os.environ["FAULTPATH_KEY"], prefix="", auth_header_name="X-API-Key"
)


def example(name):
    return json.loads((EXAMPLES / name).read_text())


# one circuit
result = check_circuit.sync(client=client, body=CheckRequest.from_dict(example("circuits-check.json")))
assert isinstance(result, CheckAnswer), result
print("check:", result.id, result.verdict.value, "Zs", result.zs_ohm, "ohm,", result.edition.value)

# a batch with one bad item: the lean table, one cell per circuit; the bad one is a problem in its place
batch = check_circuits.sync(client=client, body=BatchRequest.from_dict(example("circuits-check-batch.json")))
assert isinstance(batch, LeanBatch), batch
columns = batch.columns.additional_properties
for index, verdict, problem in zip(columns["index"], columns["verdict"], columns["problem"], strict=True):
    said = batch.problems[problem].problem.errors[0].pointer if problem is not None else ""
    print("batch:", index, verdict, said)

# sizing
sized = size_circuit.sync(client=client, body=SizeRequest.from_dict(example("circuits-size.json")))
print("size:", sized.device.rating_a, "A,", sized.selected.line_csa_mm2, "mm2")

# a 422, read as a problem
bad = example("circuits-check.json")
bad["supply"]["u0_v"] = 20
answer = check_circuit.sync_detailed(client=client, body=CheckRequest.from_dict(bad))
problem = Problem.from_dict(json.loads(answer.content))
print("problem:", answer.status_code, problem.errors[0].pointer, problem.errors[0].message)
