"""The request and answer schemas of the single questions: fault current, disconnection time, max Zs, the cpc."""

from __future__ import annotations

from marshmallow import ValidationError, fields, validate, validates_schema

from service.contract.circuit_schemas import ConductorsSchema, DeviceSchema, SupplySchema
from service.contract.fields import ContractSchema, Number, choice
from service.contract.result_schemas import DeviceSummarySchema, nullable_number
from service.electrical.cables import conductors as cond
from service.electrical.cables import protective
from service.electrical.devices.characteristic import BOUNDS
from service.electrical.results.verdicts import VERDICTS


class FaultCurrentRequestSchema(ContractSchema):
    u0_v = Number(minimum=50, maximum=1000)
    zs_ohm = Number(minimum=0.001, maximum=2000)
    supply = fields.Nested(SupplySchema)
    conductors = fields.Nested(ConductorsSchema)

    @validates_schema
    def one_form(self, data, **kwargs):
        direct = "u0_v" in data or "zs_ohm" in data
        built = "supply" in data or "conductors" in data
        if direct == built:
            raise ValidationError("give u0_v and zs_ohm, or supply and conductors", "u0_v" if not direct else "supply")
        if direct and not ("u0_v" in data and "zs_ohm" in data):
            raise ValidationError("give both u0_v and zs_ohm", "zs_ohm" if "u0_v" in data else "u0_v")
        if built and not ("supply" in data and "conductors" in data):
            raise ValidationError("give both supply and conductors", "conductors" if "supply" in data else "supply")


class FaultCurrentResultSchema(ContractSchema):
    zs_ohm = fields.Float(required=True)
    r1_plus_r2_ohm = nullable_number()
    earth_fault_current_a = fields.Float(
        required=True, metadata={"description": "U0 x Cmin / Zs, Cmin 0.95 (IEC 60909-0)"}
    )
    earth_fault_current_nominal_a = fields.Float(required=True, metadata={"description": "U0 / Zs"})
    prospective_fault_current_ka = nullable_number("largest at the origin, for breaking capacity")
    basis = fields.String(required=True)


class DisconnectionRequestSchema(ContractSchema):
    device = fields.Nested(DeviceSchema, required=True)
    current_a = Number(minimum=0.001, maximum=1e7, required=True, metadata={"description": "the fault current"})


class DisconnectionResultSchema(ContractSchema):
    time_s = nullable_number("maximum operating time; null where the current is below the data")
    bound = fields.String(required=True, validate=validate.OneOf(BOUNDS))
    region = fields.String(required=True)
    rcd_time_s = nullable_number("the RCD's maximum break time at this residual current, where an RCD is given")
    rcd_bound = fields.String(allow_none=True, required=True)
    device = fields.Nested(DeviceSummarySchema, required=True)


class MaxZsRequestSchema(ContractSchema):
    device = fields.Nested(DeviceSchema, required=True)
    time_s = Number(
        minimum=0.01, maximum=100, required=True, metadata={"description": "the required disconnection time"}
    )
    u0_v = Number(minimum=50, maximum=1000, required=True)
    insulation = choice(
        cond.insulation_names(),
        load_default="thermoplastic-70",
        metadata={"description": "sets the operating temperature for the cold limit"},
    )
    ambient_c = Number(
        minimum=-20, maximum=60, load_default=20, metadata={"description": "conductor temperature when measured"}
    )


class MaxZsResultSchema(ContractSchema):
    operating_current_a = nullable_number("Ia: the current that operates the device within time_s")
    bound = fields.String(required=True, validate=validate.OneOf(BOUNDS))
    max_zs_ohm = nullable_number("U0 x Cmin / Ia")
    max_measured_zs_ohm = nullable_number("limit for a Zs measured at ambient_c, scaled by the ratio of resistances")
    max_measured_zs_rule_of_thumb_ohm = nullable_number("0.8 x max Zs (common practice)")
    rcd_max_zs_ohm = nullable_number("50 V / IΔn where an RCD is given (BS 7671 Table 41.5)")
    basis = fields.String(required=True)
    device = fields.Nested(DeviceSummarySchema, required=True)


class ProtectiveRequestSchema(ContractSchema):
    fault_current_a = Number(minimum=0.001, maximum=1e6, required=True)
    time_s = Number(minimum=0.001, maximum=100, metadata={"description": "disconnection time; or give the device"})
    device = fields.Nested(DeviceSchema, metadata={"description": "read the time off this device at fault_current_a"})
    material = choice(protective.CPC_MATERIALS, required=True)
    insulation = choice(
        cond.insulation_names(), metadata={"description": "of the cable the cpc belongs to or touches; not for bare"}
    )
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


class ProtectiveResultSchema(ContractSchema):
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
    verdict = fields.String(allow_none=True, required=True, validate=validate.OneOf(VERDICTS))
    basis = fields.String(required=True)
