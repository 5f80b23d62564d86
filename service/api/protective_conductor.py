"""POST /v1/protective-conductor: k, the minimum csa, the standard size to use."""

from __future__ import annotations

import math

import numpy as np
from marshmallow import Schema, ValidationError, fields, validate, validates_schema

from ..electrical import conductors as cond
from ..electrical import protective
from ..electrical.errors import ElectricalError
from .base import Blueprint
from ..electrical.arrays import finite_or_none as _num
from .device_questions import device_of
from .errors import CoreInputError, from_core
from .fields import Number, choice
from .schemas import FastSchema, DeviceSchema, nullable_number

blp = Blueprint("protective_conductor", __name__, url_prefix="/v1/protective-conductor", description="Protective conductor size by the adiabatic equation")


class ProtectiveRequestSchema(FastSchema):
    fault_current_a = Number(minimum=0.001, maximum=1e6, required=True)
    time_s = Number(minimum=0.001, maximum=100, metadata={"description": "disconnection time; or give the device"})
    device = fields.Nested(DeviceSchema, metadata={"description": "read the time off this device at fault_current_a"})
    material = choice(protective.CPC_MATERIALS, required=True)
    insulation = choice(cond.insulation_names(), metadata={"description": "of the cable the cpc belongs to or touches; not for bare"})
    arrangement = choice(protective.ARRANGEMENTS, required=True)
    bare_condition = choice(protective.BARE_CONDITIONS)
    cpc_csa_mm2 = Number(minimum=0.5, maximum=630, metadata={"description": "the cpc chosen, to get a verdict"})
    line_csa_mm2 = Number(minimum=0.5, maximum=630, metadata={"description": "for the Table 54.7 alternative"})
    line_material = choice(cond.MATERIALS, metadata={"description": "for Table 54.7 when it differs from the cpc"})
    let_through_a2s = Number(minimum=1, maximum=1e10)

    @validates_schema
    def time_or_device(self, data, **kwargs):
        if ("time_s" in data) == ("device" in data):
            raise ValidationError("give either time_s or a device", "time_s")
        if data.get("arrangement") == "bare":
            if "bare_condition" not in data:
                raise ValidationError("a bare cpc needs bare_condition", "bare_condition")
        elif "insulation" not in data:
            raise ValidationError("give the insulation of the cable the cpc belongs to or touches", "insulation")


class ProtectiveResultSchema(Schema):
    k = fields.Float(required=True)
    k_formula = fields.Float(required=True)
    k_tabulated = nullable_number()
    k_basis = fields.String(required=True)
    initial_c = fields.Float(required=True)
    final_c = fields.Float(required=True)
    time_s = nullable_number()
    time_bound = fields.String(required=True)
    energy_a2s = nullable_number()
    energy_basis = fields.String(required=True)
    min_csa_mm2 = nullable_number()
    csa_mm2 = nullable_number("the next standard size at or above min_csa_mm2")
    selection_csa_mm2 = nullable_number("BS 7671 Table 54.7, where line_csa_mm2 is given")
    verdict = fields.String(allow_none=True, required=True, validate=validate.OneOf(["pass", "fail", "not-verified"]))
    basis = fields.String(required=True)


@blp.route("", methods=["POST"])
@blp.arguments(ProtectiveRequestSchema)
@blp.response(200, ProtectiveResultSchema)
def protective_conductor(body):
    """k, the minimum protective conductor size and the standard size to use"""
    size_for_case = body.get("cpc_csa_mm2") or body.get("line_csa_mm2") or 1.0
    try:
        case = protective.k_case(body["material"], body["arrangement"], body.get("insulation"), size_for_case, body.get("bare_condition"))
    except ElectricalError as err:
        field = {"cpc_material": "material", "cpc_arrangement": "arrangement"}.get(err.field, err.field)
        raise CoreInputError([{"pointer": f"/{field}", "message": err.message}]) from None
    if "device" in body:
        dev = device_of(body["device"])
        t, bound = dev.time_at(body["fault_current_a"])
        time_s, time_bound = float(t[0]), str(bound[0])
        let_through = body.get("let_through_a2s", body["device"].let_through_a2s)
    else:
        time_s, time_bound, let_through = body["time_s"], "given", body.get("let_through_a2s")
    energy, method = protective.fault_energy_a2s(body["fault_current_a"], time_s, let_through)
    s_min = float(protective.min_csa_mm2(energy, case["k"])[0])
    selection = None
    if "line_csa_mm2" in body:
        line_material = body.get("line_material", body["material"])
        if line_material == body["material"]:
            selection = protective.selection_csa_mm2(body["line_csa_mm2"])[0]
        else:
            try:
                k_line = protective.k_case(line_material, "in-cable", body.get("insulation"), body["line_csa_mm2"])["k"]
            except ElectricalError as err:
                raise CoreInputError([from_core(err, "")]) from None
            selection = protective.selection_csa_mm2(body["line_csa_mm2"], k_line, case["k"])[0]
    verdict = None
    if "cpc_csa_mm2" in body:
        verdict = str(protective.cpc_verdicts(body["cpc_csa_mm2"], s_min, np.nan if selection is None else selection)[0][0])
    return {
        "k": case["k"], "k_formula": case["k_formula"], "k_tabulated": case["k_tabulated"], "k_basis": case["table"],
        "initial_c": case["initial_c"], "final_c": case["final_c"],
        "time_s": _num(time_s), "time_bound": time_bound,
        "energy_a2s": _num(energy[0]), "energy_basis": str(method[0]),
        "min_csa_mm2": _num(s_min), "csa_mm2": _num(protective.next_standard_size_mm2(s_min)[0]) if math.isfinite(s_min) else None,
        "selection_csa_mm2": None if selection is None else _num(selection),
        "verdict": verdict,
        "basis": "BS 7671:2018 543.1.3, S = sqrt(I^2 t) / k; k from IEC 60364-5-54 Annex A" + ("; Table 54.7 (543.1.4)" if selection is not None else ""),
    }
