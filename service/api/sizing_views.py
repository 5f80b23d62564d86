"""POST /v1/circuits/size and /v1/circuits/max-length."""

from __future__ import annotations

from service.api.base import Blueprint
from service.api.errors import json_response, problem_roots
from service.contract.sizing_schemas import (
    MaxLengthRequestSchema,
    MaxLengthResultSchema,
    SizeRequestSchema,
    SizeResultSchema,
)
from service.electrical.cables.reach import max_length, size_with_reach
from service.electrical.cables.sizing import Demand

blp = Blueprint(
    "sizing",
    __name__,
    url_prefix="/v1/circuits",
    description="Cable and device sizing, and the longest run that complies",
)


@blp.route("/size", methods=["POST"])
@blp.doc(operationId="sizeCircuit")  # a stable name for client generators
@blp.arguments(SizeRequestSchema())
@blp.response(200, SizeResultSchema)
@problem_roots({"supply": "/supply", "circuit": ""})
def size(body):
    """Size a circuit for a load at a distance

    The smallest standard device rating at or above Ib, and the smallest line conductor and cpc that
    pass every check (capacity, voltage drop, disconnection time, adiabatic, breaking capacity); each
    smaller size tried is listed with the check that ruled it out, and the longest run for the choice.
    """
    demand = Demand(
        length_m=body["length_m"],
        phases=body["phases"],
        design_current_a=body.get("design_current_a"),
        power_kw=body.get("power_kw"),
        power_factor=body["power_factor"],
        use=body["use"],
        supply_kind=body["supply_kind"],
        voltage_drop_limit_percent=body.get("voltage_drop_limit_percent"),
        role=body["role"],
        load=body.get("load"),
        id=body.get("id"),
        conditional_short_circuit_ka=body.get("conditional_short_circuit_ka"),
        parallel_cables=body["parallel_cables"],
        ring=body["ring"],
        cpc=body["cpc"],
        cores=body.get("cores"),
        equipment=body.get("equipment"),
        socket_outlet_rating_a=body.get("socket_outlet_rating_a"),
        location=body.get("location"),
        ev=body.get("ev"),
    )
    result, reach = size_with_reach(body["supply"], demand, body["installation"], body["device"])
    out = {
        "design_current_a": result.design_current_a,
        "device": result.device,
        "selected": result.selected,
        "tried": result.tried,
        "max_length": reach,
        "cautions": result.cautions,
        "requirements": result.requirements,
        "edition": body["edition"],
    }
    return json_response(out)


@blp.route("/max-length", methods=["POST"])
@blp.doc(operationId="longestRun")  # a stable name for client generators
@blp.arguments(MaxLengthRequestSchema())
@blp.response(200, MaxLengthResultSchema)
@problem_roots({"supply": "/supply", "circuit": "/circuit"})
def longest(body):
    """The longest run that keeps every check passing, and the check that limits it"""
    circuit = body["circuit"]
    demand = Demand(
        length_m=circuit.conductors.length_m,
        phases=body["phases"],
        design_current_a=circuit.design_current_a,
        use=body["use"],
        supply_kind=body["supply_kind"],
        voltage_drop_limit_percent=body.get("voltage_drop_limit_percent"),
    )
    found = max_length(body["supply"], circuit, body.get("installation"), demand)
    return json_response({**found, "edition": body["edition"]})
