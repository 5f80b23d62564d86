"""POST /v1/installations/design and `python -m service design`: an installation body whose circuits may leave out
``device.rating_a``, ``conductors.line_csa_mm2`` and ``conductors.cpc_csa_mm2``, with optional ``prices`` and
``allowance_percent``; and the answer: the completed body, its check, the choices and the bill of quantities."""

from __future__ import annotations

import copy
import csv
import io
from typing import Any

from marshmallow import ValidationError, fields, validate

from service.contract.fields import ContractSchema, Number, Text, WholeNumber
from service.contract.installation_schemas import (
    InstallationRequestSchema,
    InstallationResultSchema,
    installation_of,
    records,
)
from service.contract.problems import flatten
from service.electrical.cables.design import design_installation, failures, outcomes_of
from service.electrical.cables.design_search import Unknown
from service.electrical.cables.quantities import bill_of_quantities, run_cost
from service.electrical.checks.overload import NOTES

LEFT_OUT = (("device", "rating_a"), ("conductors", "line_csa_mm2"), ("conductors", "cpc_csa_mm2"))
# a value the schema takes in the place of one left out; the design replaces it before anything is checked
STAND_IN = {"rating_a": 1.0, "line_csa_mm2": 1.0, "cpc_csa_mm2": 1.0}


class CablePriceSchema(ContractSchema):
    cable = Text(max_length=100, required=True, metadata={"description": "a cable family of GET /v1/cables"})
    line_csa_mm2 = Number(minimum=0.5, maximum=630, required=True)
    per_m = Number(minimum=0, maximum=1e6, required=True, metadata={"description": "price per metre of the cable"})


class DevicePriceSchema(ContractSchema):
    standard = Text(max_length=100, required=True)
    type = Text(max_length=20, metadata={"description": "left out: every type of the standard"})
    rating_a = Number(minimum=0.1, maximum=1000, required=True)
    each = Number(minimum=0, maximum=1e7, required=True)


class PricesSchema(ContractSchema):
    cables = fields.List(fields.Nested(CablePriceSchema), load_default=list, validate=validate.Length(max=2000))
    devices = fields.List(fields.Nested(DevicePriceSchema), load_default=list, validate=validate.Length(max=2000))


class DesignExtrasSchema(ContractSchema):
    """What a design's body adds to installations/check's."""

    prices = fields.Nested(PricesSchema, metadata={"description": "with prices the design keeps the cost least"})
    allowance_percent = Number(
        minimum=0, maximum=100, load_default=0.0, metadata={"description": "added to every cable length in the bill"}
    )


class DesignRequestSchema(InstallationRequestSchema, DesignExtrasSchema):
    """The body as the design loads it, once a stand-in holds each value left out (:func:`stand_ins`)."""


def stand_ins(raw: Any) -> tuple[Any, dict[tuple[int, int], Unknown]]:
    """The body with a stand-in for each value left out, and what each circuit left out (by board and circuit)."""
    if not isinstance(raw, dict) or not isinstance(raw.get("boards"), list):
        return raw, {}
    body, unknowns = copy.deepcopy(raw), {}
    for b, board in enumerate(body["boards"]):
        circuits = board.get("circuits") if isinstance(board, dict) else None
        for c, circuit in enumerate(circuits if isinstance(circuits, list) else []):
            if not isinstance(circuit, dict):
                continue
            missing = {
                name for part, name in LEFT_OUT if isinstance(circuit.get(part), dict) and name not in circuit[part]
            }
            for part, name in LEFT_OUT:
                if name in missing:
                    circuit[part][name] = STAND_IN[name]
            if missing:
                unknowns[(b, c)] = Unknown("rating_a" in missing, "line_csa_mm2" in missing, "cpc_csa_mm2" in missing)
    return body, unknowns


def design_inputs(raw: Any) -> tuple[Any, Any, Any, dict]:
    """The loaded request, the core's installation and what each circuit left out; a circuit that does not read is
    a 422 for the whole design (no design can leave it out)."""
    body, unknowns = stand_ins(raw)
    loaded = DesignRequestSchema().load(body)
    inst, problems = installation_of(loaded)
    if problems:
        errors = {}
        for (b, c), problem in problems.items():
            for e in flatten(problem.messages, f"/boards/{b}/circuits/{c}"):
                errors.setdefault(e["pointer"], []).append(e["message"])
        raise ValidationError(errors)
    return body, loaded, inst, unknowns


def prices_of(loaded: dict) -> dict | None:
    """The request's prices as the bill and the design read them: by (cable, size) and (standard, type, rating)."""
    given = loaded.get("prices")
    if not given:
        return None
    return {
        "cables": {(p["cable"], p["line_csa_mm2"]): p["per_m"] for p in given["cables"]},
        "devices": {(p["standard"], p.get("type"), p["rating_a"]): p["each"] for p in given["devices"]},
    }


# ------------------------------------------------------------------------------------------ the answer
class RuledOutSchema(ContractSchema):
    rating_a = fields.Float(required=True)
    line_csa_mm2 = fields.Float(required=True)
    cpc_csa_mm2 = fields.Float(required=True)
    check = fields.String(required=True, metadata={"description": "the rule that ruled this candidate out"})
    value = fields.Float(allow_none=True, required=True)
    limit = fields.Float(allow_none=True, required=True)
    unit = fields.String(allow_none=True, required=True)
    judged = fields.String(required=True, metadata={"description": "checked, or passed over by the check's figures"})


class ChoiceSchema(ContractSchema):
    board = fields.String(required=True)
    id = fields.String(allow_none=True, required=True)
    left_out = fields.List(fields.String(), required=True)
    chosen = fields.Dict(required=True, metadata={"description": "rating_a, line_csa_mm2, cpc_csa_mm2 chosen"})
    ruled_out = fields.List(fields.Nested(RuledOutSchema), required=True)
    device_added = fields.List(fields.String(), required=True, metadata={"description": "what the rules called for"})


class CableLineSchema(ContractSchema):
    cable = fields.String(allow_none=True, required=True)
    material = fields.String(required=True)
    line_csa_mm2 = fields.Float(required=True)
    cpc_csa_mm2 = fields.Float(required=True)
    length_m = fields.Float(
        required=True, metadata={"description": "the routes' total, cables in parallel each, plus the allowance"}
    )
    per_m = fields.Float(allow_none=True, required=True)
    cost = fields.Float(allow_none=True, required=True)


class DeviceLineSchema(ContractSchema):
    standard = fields.String(allow_none=True, required=True)
    type = fields.String(allow_none=True, required=True)
    rating_a = fields.Float(required=True)
    rcd = fields.String(allow_none=True, required=True)
    afdd = fields.Boolean(required=True)
    count = WholeNumber(minimum=0, maximum=10**9, required=True)
    each = fields.Float(allow_none=True, required=True)
    cost = fields.Float(allow_none=True, required=True)


class BillSchema(ContractSchema):
    allowance_percent = fields.Float(required=True)
    cables = fields.List(fields.Nested(CableLineSchema), required=True)
    devices = fields.List(fields.Nested(DeviceLineSchema), required=True)
    total_cost = fields.Float(allow_none=True, required=True)
    unpriced_lines = fields.Integer(allow_none=True, required=True)


class DesignFailureSchema(ContractSchema):
    board = fields.String(required=True)
    id = fields.String(allow_none=True, required=True)
    check = fields.String(allow_none=True, required=True)
    value = fields.Float(allow_none=True, required=True)
    limit = fields.Float(allow_none=True, required=True)
    unit = fields.String(allow_none=True, required=True)
    would = fields.String(required=True, metadata={"description": "what would let a design pass"})


class DesignAnswerSchema(ContractSchema):
    feasible = fields.Boolean(required=True, metadata={"description": "every circuit passes installations/check"})
    installation = fields.Dict(required=True, metadata={"description": "the completed body installations/check takes"})
    checked = fields.Nested(InstallationResultSchema, required=True)
    choices = fields.List(fields.Nested(ChoiceSchema), required=True)
    traded = fields.List(fields.String(), required=True, metadata={"description": "where a larger size saved more"})
    failures = fields.List(fields.Nested(DesignFailureSchema), required=True)
    bill_of_quantities = fields.Nested(BillSchema, required=True)
    cautions = fields.List(fields.String(), required=True)
    edition = fields.String(required=True)


MEMORY_CAUTION = (
    "Some chosen sizes rest on a capacity or a factor recalled from memory (unverified): confirm them against the "
    "tables of BS 7671 Appendix 4 or the maker's data before ordering."
)


def completed_body(body: dict, design: Any, unknowns: dict) -> dict:
    """The request's body with each left-out value chosen, and each device the rules called for: the body
    installations/check takes and passes."""
    out = copy.deepcopy(body)
    out.pop("prices", None)
    out.pop("allowance_percent", None)
    for (b, c), slot in design.slots.items():
        circuit = out["boards"][b]["circuits"][c]
        circuit["device"]["rating_a"] = slot.rating
        circuit["conductors"]["line_csa_mm2"], circuit["conductors"]["cpc_csa_mm2"] = slot.size
    for b, c in design.devices_added:
        device = design.installation.boards[b].circuits[c].device
        said = out["boards"][b]["circuits"][c]["device"]
        if device.rcd is not None:
            said["rcd"] = {k: v for k, v in vars(device.rcd).items() if v is not None}
        if device.afdd:
            said["afdd"] = True
    return out


def choices(design: Any) -> list[dict[str, Any]]:
    """Per circuit that left something out: what was chosen, and each candidate passed over with its rule."""
    out = []
    for (b, c), slot in design.slots.items():
        circuit = design.installation.boards[b].circuits[c]
        left = [
            name
            for name, flag in zip(("rating_a", "line_csa_mm2", "cpc_csa_mm2"), vars(slot.unknown).values(), strict=True)
            if flag
        ]
        line, cpc = slot.size
        out.append({
            "board": design.installation.boards[b].id, "id": circuit.id, "left_out": left,
            "chosen": {"rating_a": slot.rating, "line_csa_mm2": line, "cpc_csa_mm2": cpc},
            "ruled_out": slot.ruled_out, "device_added": design.devices_added.get((b, c), []),
        })  # fmt: skip
    return out


class DesignBodySchema(DesignExtrasSchema):
    """The design's body as documented: installations/check's (InstallationRequest), where a circuit may leave out
    device.rating_a, conductors.line_csa_mm2 and conductors.cpc_csa_mm2, with prices and an allowance. It is read
    whole by :func:`designed`, which marks what was left out and loads the rest as installations/check does."""

    class Meta:
        unknown = "include"

    supply = fields.Dict(required=True, metadata={"description": "as installations/check's supply"})
    boards = fields.List(
        fields.Dict(),
        required=True,
        metadata={"description": "as installations/check's boards; a circuit may leave out its sizes and rating"},
    )


def designed(raw: Any, tick: Any = None) -> dict[str, Any]:
    """The whole answer of a design request (the API's and the CLI's); ``tick`` is called as each round's check goes
    (the request's deadline may stop the work there)."""

    body, loaded, inst, unknowns = design_inputs(raw)
    prices = prices_of(loaded)
    cost = run_cost(prices) if prices else None
    design = design_installation(inst, unknowns, cost, loaded.get("checks"), tick)
    result = design.result  # the last round's check: the completed installation's, figures rounded
    cautions = list(result.cautions)
    if any(_from_memory(o) for o in _chosen_results(design, result)):
        cautions.append(MEMORY_CAUTION)
    return {
        "feasible": design.feasible,
        "installation": completed_body(body, design, unknowns),
        "checked": records(design.installation, result, {}),
        "choices": choices(design),
        "traded": design.traded,
        "failures": failures(design),
        "bill_of_quantities": bill_of_quantities(design.installation, loaded["allowance_percent"], prices),
        "cautions": cautions,
        "edition": result.edition,
    }


def _chosen_results(design: Any, result: Any) -> list[Any]:
    outcomes = outcomes_of(result, design.installation)
    return [outcomes[key] for key in design.slots if key in outcomes]


def _from_memory(outcome: Any) -> bool:
    """Whether the overload check said its capacity or a factor is from memory (its own caution)."""
    return NOTES["memory"] in getattr(outcome, "cautions", ())


BILL_COLUMNS = ("item", "cable_or_standard", "type_or_material", "size_or_rating", "cpc_mm2", "rcd", "quantity",
                "unit", "price", "cost")  # fmt: skip


def bill_csv(bill: dict) -> str:
    """The bill of quantities for a spreadsheet: a row a cable size (metres) and a row a device (count)."""
    out = io.StringIO()
    writer = csv.writer(out, lineterminator="\r\n")
    writer.writerow(BILL_COLUMNS)
    for line in bill["cables"]:
        writer.writerow(["cable", line["cable"], line["material"], line["line_csa_mm2"], line["cpc_csa_mm2"], "",
                         line["length_m"], "m", _blank(line["per_m"]), _blank(line["cost"])])  # fmt: skip
    for line in bill["devices"]:
        rcd = (line["rcd"] or "") + (" AFDD" if line["afdd"] else "")
        writer.writerow(["device", line["standard"], line["type"] or "", line["rating_a"], "", rcd.strip(),
                         line["count"], "each", _blank(line["each"]), _blank(line["cost"])])  # fmt: skip
    if bill["total_cost"] is not None:
        writer.writerow(["total", "", "", "", "", "", "", "", "", bill["total_cost"]])
    return out.getvalue()


def _blank(value):
    return "" if value is None else value
