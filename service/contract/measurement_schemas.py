"""The request and answer schemas of test-results/verify: measured values, and each judged against its limit."""

from __future__ import annotations

import csv
import dataclasses
import functools
import io
import json
from typing import Any

from marshmallow import ValidationError, fields, post_load

from service.contract.circuit_schemas import CircuitSchema, FastSchema, SupplySchema
from service.contract.fields import ContractSchema, Flag, Number, Text, choice, csv_cell
from service.contract.item_lists import PerItemList
from service.contract.requirement_schemas import HEAD, JobSchema, with_edition
from service.contract.result_schemas import BatchSummarySchema, edition_answer
from service.contract.shapes import schema_of
from service.contract.strictjson import strict_loads
from service.electrical.devices import defaults as device_defaults
from service.electrical.testing.measured import CIRCUIT_VOLTAGES, Judgement, Measured, VerificationResult
from service.electrical.testing.sheet import SiteLimits


class MeasuredSchema(ContractSchema):
    """What was measured; a value left null (an empty cell of the test sheet) was not measured."""

    temperature_c = Number(
        minimum=-20, maximum=60, load_default=20.0, metadata={"description": "conductor temperature when measured"}
    )
    zs_ohm = Number(allow_none=True, minimum=0.001, maximum=2000)
    r1_plus_r2_ohm = Number(allow_none=True, minimum=0.0001, maximum=100)
    insulation_resistance_megohm = Number(allow_none=True, minimum=0, maximum=100000)
    insulation_test_voltage_v = Number(allow_none=True, minimum=50, maximum=5000)
    circuit_voltage = choice(CIRCUIT_VOLTAGES, load_default="up-to-500v")
    rcd_time_ms_at_idn = Number(allow_none=True, minimum=0, maximum=10000)
    rcd_time_ms_at_5idn = Number(allow_none=True, minimum=0, maximum=10000)
    polarity_confirmed = Flag(allow_none=True)
    ze_ohm = Number(
        allow_none=True, minimum=0.001, maximum=2000, metadata={"description": "against the Ze the design assumed"}
    )
    prospective_fault_current_ka = Number(
        allow_none=True, minimum=0.001, maximum=200, metadata={"description": "against the device's breaking capacity"}
    )
    ring_r1_ohm = Number(
        allow_none=True, minimum=0.0001, maximum=100, metadata={"description": "ring: line, end to end"}
    )
    ring_rn_ohm = Number(
        allow_none=True, minimum=0.0001, maximum=100, metadata={"description": "ring: neutral, end to end"}
    )
    ring_r2_ohm = Number(
        allow_none=True, minimum=0.0001, maximum=100, metadata={"description": "ring: cpc, end to end"}
    )
    rcd_tripped_at_half_idn = Flag(
        allow_none=True, metadata={"description": "did the RCD trip at half IΔn (it must not)"}
    )

    @post_load
    def make(self, data, **kwargs):
        return Measured(**{name: value for name, value in data.items() if value is not None})


class VerifyItemSchema(ContractSchema):
    board = Text(max_length=200, metadata={"description": "the board the circuit is on (a test sheet's), echoed"})
    supply = fields.Nested(
        SupplySchema, metadata={"description": "the supply at the circuit's board, where it is not the top level's"}
    )
    circuit = fields.Nested(CircuitSchema, required=True)
    expected = fields.Dict(
        metadata={
            "description": "the test sheet's limits, as it gave them: verify works them out again from the circuit"
        }
    )
    measured = fields.Nested(MeasuredSchema, required=True)


class VerifyRequestSchema(FastSchema, JobSchema):
    supply = fields.Nested(SupplySchema, required=True)
    circuits = PerItemList(fields.Nested(VerifyItemSchema), required=True)

    @staticmethod
    def reads_csv(text: str) -> tuple[dict, Any]:
        """A filled test sheet's CSV (text/csv) as the body it stands for, and how a pointer into that body reads
        in the file (its line and column)."""
        body, lines = verify_body_of_csv(text)
        return body, functools.partial(csv_pointer, lines=lines)

    @post_load
    def onto_items(self, data, **kwargs):
        """Each item's own supply (a test sheet's circuit on a board below the origin) takes the request's edition
        and premises too (as :func:`with_edition` gives the top level's)."""
        for item in data["circuits"]:
            if isinstance(item, dict) and item.get("supply") is not None:
                item["supply"] = with_edition({**data, "supply": item["supply"]})["supply"]
        return data

    def complete_devices(self, data: dict, given: list) -> None:
        """Each item's circuit (an item that did not validate stays as it is)."""
        for item in data["circuits"]:
            if isinstance(item, dict):
                item["circuit"] = device_defaults.with_defaults_of(item["circuit"], given)


# made from the core's dataclasses (service.electrical.testing.measured): declared there, once
JudgementSchema = schema_of(Judgement)
VerificationSchema = schema_of(VerificationResult)


class VerifyItemResultSchema(ContractSchema):
    index = fields.Integer(required=True)
    id = fields.String(allow_none=True, required=True)
    result = fields.Nested(VerificationSchema)
    problem = fields.Nested("ProblemSchema")


class VerifyResultSchema(ContractSchema):
    results = fields.List(fields.Nested(VerifyItemResultSchema), required=True)
    summary = fields.Nested(
        BatchSummarySchema, required=True, metadata={"description": "the circuits by verdict, and those not judged"}
    )
    edition = edition_answer()


# ------------------------------------------------------------------------------------------ a filled sheet as CSV
# the test sheet's CSV (service.contract.test_sheet writes it): one row a circuit, its limits, a cell a measurement,
# and its design (the circuit, its supply and the request's head as JSON)
LIMIT_COLUMNS = tuple(f.name for f in dataclasses.fields(SiteLimits))
MEASURED_COLUMNS = tuple(f"measured_{f.name}" for f in dataclasses.fields(Measured))
COLUMNS = ("board", "id", *LIMIT_COLUMNS, *MEASURED_COLUMNS, "design")


def _kind(field: fields.Field) -> str:
    return "flag" if isinstance(field, fields.Boolean) else "number" if isinstance(field, fields.Number) else "text"


def verify_body_of_csv(text: str) -> tuple[dict[str, Any], list[int]]:
    """A filled sheet's CSV as the verify body it stands for, and the line of the file each item starts on (the
    header is line 1). Raises ValidationError naming the line (and the column) of what cannot be read: its messages
    keyed by line, then column."""
    kinds = {f"measured_{name}": _kind(field) for name, field in MeasuredSchema().fields.items()}
    reader = csv.reader(io.StringIO(text.removeprefix("\ufeff")))
    header = next(reader, None)
    if not header:
        raise ValidationError({"1": ["an empty CSV body: its first line is the header, as the test sheet wrote it"]})
    repeated = sorted({c for c in header if header.count(c) > 1})
    unknown = [c for c in header if c not in COLUMNS]
    if repeated or unknown or "design" not in header:
        said = f"repeated {repeated}" if repeated else f"unknown {unknown}" if unknown else "no design column"
        raise ValidationError({"1": [f"the header is not the test sheet's ({said}): the columns are {list(COLUMNS)}"]})
    items, lines, line = [], [], reader.line_num + 1
    for cells in reader:
        start, line = line, reader.line_num + 1
        if cells:
            items.append(_item(header, cells, start, kinds))
            lines.append(start)
    if not items:
        raise ValidationError({"2": ["the sheet has no circuits: one row a circuit, below the header"]})
    head = {k: v for k, v in items[0].pop("head").items()}
    for item in items[1:]:
        item.pop("head")
    return {**head, "supply": items[0]["supply"], "circuits": items}, lines


def _item(header: list[str], cells: list[str], line: int, kinds: dict[str, str]) -> dict[str, Any]:
    if len(cells) > len(header):
        raise ValidationError({str(line): [f"line {line} has {len(cells)} cells and the header {len(header)}"]})
    record = dict(zip(header, cells, strict=False))
    try:
        design = strict_loads(record.get("design", ""))
    except json.JSONDecodeError as err:
        raise ValidationError({str(line): {"design": [f"not the sheet's design (JSON): {err.msg}"]}}) from None
    if not isinstance(design, dict) or not isinstance(design.get("circuit"), dict) or "supply" not in design:
        raise ValidationError(
            {str(line): {"design": ['the design is {"supply": {...}, "circuit": {...}}, as written']}}
        )
    measured = {
        name.removeprefix("measured_"): csv_cell(value, kinds[name])
        for name, value in record.items()
        if name in kinds and value.strip() != ""
    }
    item = {"supply": design["supply"], "circuit": design["circuit"], "measured": measured}
    if record.get("board", "").strip():
        item = {"board": record["board"].strip(), **item}
    return {**item, "head": {k: design[k] for k in HEAD if k in design}}


def csv_pointer(pointer: str, lines: list[int]) -> str:
    """A pointer into the verify body read from CSV (/circuits/3/measured/zs_ohm) as the sheet's line and column
    (/5/measured_zs_ohm); a part of the design as its cell (/5/design/circuit/device/rating_a)."""
    parts = pointer.split("/")
    if parts[1:2] == ["supply"] and lines:  # the top level's supply is the first row's
        return f"/{lines[0]}/design" + pointer
    if len(parts) < 3 or parts[1] != "circuits" or not parts[2].isdigit() or int(parts[2]) >= len(lines):
        return pointer
    line, rest = lines[int(parts[2])], parts[3:]
    if rest[:1] == ["measured"] and len(rest) > 1:
        return f"/{line}/measured_{rest[1]}"
    if rest[:1] in (["circuit"], ["supply"]):
        return f"/{line}/design/" + "/".join(rest)
    return f"/{line}" + "".join(f"/{p}" for p in rest)
