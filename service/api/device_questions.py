"""POST /v1/disconnection-time and /v1/max-zs: a device and a current, or a device and a time."""

from __future__ import annotations

from marshmallow import Schema, fields, validate

from ..electrical import conductors as cond
from ..electrical.arrays import finite_or_none as _num
from ..electrical.devices import residual
from ..electrical.devices.base import Device
from ..electrical.devices.catalogue import resolve
from ..electrical.devices.characteristic import BOUNDS
from ..electrical.errors import ElectricalError
from ..electrical.limits import max_zs_ohm, measured_limit_ohm
from .base import Blueprint
from .errors import CoreInputError, from_core
from .fields import Number, choice
from .schemas import FastSchema, DeviceSchema, DeviceSummarySchema, nullable_number

disconnection_blp = Blueprint("disconnection_time", __name__, url_prefix="/v1/disconnection-time", description="Disconnection time of a device at a current")
max_zs_blp = Blueprint("max_zs", __name__, url_prefix="/v1/max-zs", description="Maximum Zs for a device and a required time")


def device_of(spec) -> Device:
    try:
        return resolve(spec.as_mapping())
    except ElectricalError as err:
        raise CoreInputError([from_core(err, "/device")]) from None


def summary(dev: Device) -> dict:
    return {"device_id": dev.device_id, "label": dev.label, "source": dev.source, "confidence": dev.confidence, "notes": list(dev.notes)}


class DisconnectionRequestSchema(FastSchema):
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
@disconnection_blp.arguments(DisconnectionRequestSchema)
@disconnection_blp.response(200, DisconnectionResultSchema)
def disconnection_time(body):
    """Maximum operating time of a device at a current, how it is bounded, and the region of the curve"""
    dev = device_of(body["device"])
    current = body["current_a"]
    t, bound = dev.time_at(current)
    rcd_t, rcd_bound = None, None
    rcd = body["device"].rcd
    if rcd is not None:
        rt, rb = residual.rcd_characteristic(rcd.residual_current_ma, rcd.delay).time_at(current)
        rcd_t, rcd_bound = _num(rt[0]), str(rb[0])
    return {"time_s": _num(t[0]), "bound": str(bound[0]), "region": str(dev.region_at(current)[0]),
            "rcd_time_s": rcd_t, "rcd_bound": rcd_bound, "device": summary(dev)}


class MaxZsRequestSchema(FastSchema):
    device = fields.Nested(DeviceSchema, required=True)
    time_s = Number(minimum=0.01, maximum=100, required=True, metadata={"description": "the required disconnection time"})
    u0_v = Number(minimum=50, maximum=1000, required=True)
    insulation = choice(cond.insulation_names(), load_default="thermoplastic-70", metadata={"description": "sets the operating temperature for the cold limit"})
    ambient_c = Number(minimum=-20, maximum=60, load_default=20, metadata={"description": "conductor temperature when measured"})


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
@max_zs_blp.arguments(MaxZsRequestSchema)
@max_zs_blp.response(200, MaxZsResultSchema)
def max_zs(body):
    """Ia, the maximum Zs, and the limit for a value measured cold"""
    dev = device_of(body["device"])
    ia, bound, zs = max_zs_ohm(dev, body["time_s"], body["u0_v"])
    operating = cond.operating_temperature_c(body["insulation"], 1)
    cold, rule = measured_limit_ohm(zs, operating, body["ambient_c"])
    rcd = body["device"].rcd
    return {
        "operating_current_a": _num(ia[0]), "bound": str(bound[0]), "max_zs_ohm": _num(zs[0]),
        "max_measured_zs_ohm": _num(cold[0]), "max_measured_zs_rule_of_thumb_ohm": _num(rule[0]),
        "rcd_max_zs_ohm": None if rcd is None else _num(residual.rcd_max_loop_ohm(rcd.residual_current_ma)[0]),
        "basis": "BS 7671:2018 411.4.4 / 411.5.4: Zs <= U0 x Cmin / Ia, Cmin 0.95 (Tables 41.2-41.4 form)",
        "device": summary(dev),
    }
