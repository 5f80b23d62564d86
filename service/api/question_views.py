"""The single questions: POST /v1/fault-current, /v1/disconnection-time, /v1/max-zs and /v1/protective-conductor.

Each view loads its request, asks one core function and returns its answer; the core does the work.
"""

from __future__ import annotations

import dataclasses

from marshmallow import Schema, ValidationError, fields, validate, validates_schema

from service.api.base import Blueprint
from service.api.errors import CoreInputError
from service.contract.circuit_schemas import ConductorsSchema, DeviceSchema, SupplySchema
from service.contract.fields import Number, choice
from service.contract.result_schemas import DeviceSummarySchema, nullable_number
from service.electrical.cables import conductors as cond
from service.electrical.cables import protective
from service.electrical.devices.characteristic import BOUNDS
from service.electrical.devices.limits import max_zs_for
from service.electrical.devices.response import operating_time
from service.electrical.errors import ElectricalError
from service.electrical.network.faults import fault_current as fault_current_of
from service.electrical.results import precision
from service.electrical.results.verdicts import VERDICTS

fault_blp = Blueprint("fault_current", __name__, url_prefix="/v1/fault-current", description="Earth fault current")
disconnection_blp = Blueprint(
    "disconnection_time",
    __name__,
    url_prefix="/v1/disconnection-time",
    description="Disconnection time of a device at a current",
)
max_zs_blp = Blueprint(
    "max_zs", __name__, url_prefix="/v1/max-zs", description="Maximum Zs for a device and a required time"
)
protective_blp = Blueprint(
    "protective_conductor",
    __name__,
    url_prefix="/v1/protective-conductor",
    description="Protective conductor size by the adiabatic equation",
)
BLUEPRINTS = (fault_blp, disconnection_blp, max_zs_blp, protective_blp)


def _answer(ask, *args, **kwargs):
    """The core's answer as a plain dict, each number to the precision its unit carries (the rules of
    ``precision``, as in every circuit result); its typed errors as a 422 naming the field."""
    try:
        return precision.rounded_record(dataclasses.asdict(ask(*args, **kwargs)))
    except ElectricalError as err:
        raise CoreInputError.of(err) from None


# ---------------------------------------------------------------- fault current


class FaultCurrentRequestSchema(Schema):
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


class FaultCurrentResultSchema(Schema):
    zs_ohm = fields.Float(required=True)
    r1_plus_r2_ohm = nullable_number()
    earth_fault_current_a = fields.Float(
        required=True, metadata={"description": "U0 x Cmin / Zs, Cmin 0.95 (IEC 60909-0)"}
    )
    earth_fault_current_nominal_a = fields.Float(required=True, metadata={"description": "U0 / Zs"})
    prospective_fault_current_ka = nullable_number("largest at the origin, for breaking capacity")
    basis = fields.String(required=True)


@fault_blp.route("", methods=["POST"])
@fault_blp.arguments(FaultCurrentRequestSchema())
@fault_blp.response(200, FaultCurrentResultSchema)
def fault_current(body):
    """Earth fault current from Zs, or from the supply and the conductors"""
    return _answer(fault_current_of, **body)


# ---------------------------------------------------------------- disconnection time


class DisconnectionRequestSchema(Schema):
    device = fields.Nested(DeviceSchema, required=True)
    current_a = Number(minimum=0.001, maximum=1e7, required=True, metadata={"description": "the fault current"})


class DisconnectionResultSchema(Schema):
    time_s = nullable_number("maximum operating time; null where the current is below the data")
    bound = fields.String(required=True, validate=validate.OneOf(BOUNDS))
    region = fields.String(required=True)
    rcd_time_s = nullable_number("the RCD's maximum break time at this residual current, where an RCD is given")
    rcd_bound = fields.String(allow_none=True, required=True)
    device = fields.Nested(DeviceSummarySchema, required=True)


@disconnection_blp.route("", methods=["POST"])
@disconnection_blp.arguments(DisconnectionRequestSchema())
@disconnection_blp.response(200, DisconnectionResultSchema)
def disconnection_time(body):
    """Maximum operating time of a device at a current, how it is bounded, and the region of the curve"""
    return _answer(operating_time, body["device"], body["current_a"])


# ---------------------------------------------------------------- max Zs


class MaxZsRequestSchema(Schema):
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


class MaxZsResultSchema(Schema):
    operating_current_a = nullable_number("Ia: the current that operates the device within time_s")
    bound = fields.String(required=True, validate=validate.OneOf(BOUNDS))
    max_zs_ohm = nullable_number("U0 x Cmin / Ia")
    max_measured_zs_ohm = nullable_number("limit for a Zs measured at ambient_c, scaled by the ratio of resistances")
    max_measured_zs_rule_of_thumb_ohm = nullable_number("0.8 x max Zs (common practice)")
    rcd_max_zs_ohm = nullable_number("50 V / IΔn where an RCD is given (BS 7671 Table 41.5)")
    basis = fields.String(required=True)
    device = fields.Nested(DeviceSummarySchema, required=True)


@max_zs_blp.route("", methods=["POST"])
@max_zs_blp.arguments(MaxZsRequestSchema())
@max_zs_blp.response(200, MaxZsResultSchema)
def max_zs(body):
    """Ia, the maximum Zs, and the limit for a value measured cold"""
    return _answer(max_zs_for, body["device"], body["time_s"], body["u0_v"], body["insulation"], body["ambient_c"])


# ---------------------------------------------------------------- protective conductor


class ProtectiveRequestSchema(Schema):
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
    verdict = fields.String(allow_none=True, required=True, validate=validate.OneOf(VERDICTS))
    basis = fields.String(required=True)


@protective_blp.route("", methods=["POST"])
@protective_blp.arguments(ProtectiveRequestSchema())
@protective_blp.response(200, ProtectiveResultSchema)
def protective_conductor(body):
    """k, the minimum protective conductor size and the standard size to use"""
    args = {key: body[key] for key in ("fault_current_a", "material", "arrangement")}
    return _answer(
        protective.size_for_fault,
        **args,
        insulation=body.get("insulation"),
        **{key: value for key, value in body.items() if key not in args and key != "insulation"},
    )
