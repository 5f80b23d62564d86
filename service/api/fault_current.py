"""POST /v1/fault-current: If from Zs, or from a supply and conductors."""

from __future__ import annotations

from marshmallow import Schema, ValidationError, fields, validates_schema

from ..electrical import faults
from ..electrical.circuit import conductor_columns
from ..electrical.errors import ElectricalError
from .base import Blueprint
from .errors import CoreInputError, from_core
from .fields import Number
from .schemas import FastSchema, ConductorsSchema, SupplySchema, nullable_number

blp = Blueprint("fault_current", __name__, url_prefix="/v1/fault-current", description="Earth fault current")


class FaultCurrentRequestSchema(FastSchema):
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
    earth_fault_current_a = fields.Float(required=True, metadata={"description": "U0 x Cmin / Zs, Cmin 0.95 (IEC 60909-0)"})
    earth_fault_current_nominal_a = fields.Float(required=True, metadata={"description": "U0 / Zs"})
    prospective_fault_current_ka = nullable_number("largest at the origin, for breaking capacity")
    basis = fields.String(required=True)


@blp.route("", methods=["POST"])
@blp.arguments(FaultCurrentRequestSchema)
@blp.response(200, FaultCurrentResultSchema)
def fault_current(body):
    """Earth fault current from Zs, or from the supply and the conductors"""
    r1r2 = None
    pfc = None
    if "supply" in body:
        supply = body["supply"]
        try:
            figures = conductor_columns([body["conductors"]])
        except ElectricalError as err:
            raise CoreInputError([from_core(err, "/conductors")]) from None
        r1r2 = float(figures["r1"][0] + figures["r2"][0])
        u0, zs = supply.u0_v, supply.ze_ohm + r1r2
        pfc = float(faults.prospective_fault_current_ka(supply.u0_v, supply.ze_ohm, supply.prospective_fault_current_ka, supply.c_max)[0])
    else:
        u0, zs = body["u0_v"], body["zs_ohm"]
    return {
        "zs_ohm": zs,
        "r1_plus_r2_ohm": r1r2,
        "earth_fault_current_a": float(faults.earth_fault_current_a(u0, zs)[0]),
        "earth_fault_current_nominal_a": float(faults.earth_fault_current_a(u0, zs, voltage_factor=1.0)[0]),
        "prospective_fault_current_ka": pfc,
        "basis": "Zs = Ze + (R1+R2); If = U0 x Cmin / Zs with Cmin 0.95 (IEC 60909-0 Table 1; BS 7671:2018 411.4.4)",
    }
