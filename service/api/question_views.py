"""The single questions: POST /v1/fault-current, /v1/disconnection-time, /v1/max-zs and /v1/protective-conductor.

Each view loads its request, asks one core function and returns its answer; the core does the work.
"""

from __future__ import annotations

import dataclasses

from service.api.base import Blueprint
from service.contract.question_schemas import (
    DisconnectionRequestSchema,
    DisconnectionResultSchema,
    FaultCurrentRequestSchema,
    FaultCurrentResultSchema,
    MaxZsRequestSchema,
    MaxZsResultSchema,
    ProtectiveRequestSchema,
    ProtectiveResultSchema,
)
from service.electrical.cables import protective
from service.electrical.devices.limits import max_zs_for
from service.electrical.devices.response import operating_time
from service.electrical.network.faults import fault_current as fault_current_of
from service.electrical.results import precision

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
    return precision.rounded_record(dataclasses.asdict(ask(*args, **kwargs)))


# ---------------------------------------------------------------- fault current


@fault_blp.route("", methods=["POST"])
@fault_blp.doc(operationId="faultCurrent")  # a stable name for client generators
@fault_blp.arguments(FaultCurrentRequestSchema())
@fault_blp.response(200, FaultCurrentResultSchema)
def fault_current(body):
    """Earth fault current from Zs, or from the supply and the conductors"""
    return _answer(fault_current_of, **body)


# ---------------------------------------------------------------- disconnection time


@disconnection_blp.route("", methods=["POST"])
@disconnection_blp.doc(operationId="disconnectionTime")  # a stable name for client generators
@disconnection_blp.arguments(DisconnectionRequestSchema())
@disconnection_blp.response(200, DisconnectionResultSchema)
def disconnection_time(body):
    """Maximum operating time of a device at a current, how it is bounded, and the region of the curve"""
    return _answer(operating_time, body["device"], body["current_a"])


# ---------------------------------------------------------------- max Zs


@max_zs_blp.route("", methods=["POST"])
@max_zs_blp.doc(operationId="maxZs")  # a stable name for client generators
@max_zs_blp.arguments(MaxZsRequestSchema())
@max_zs_blp.response(200, MaxZsResultSchema)
def max_zs(body):
    """Ia, the maximum Zs, and the limit for a value measured cold"""
    return _answer(max_zs_for, body["device"], body["time_s"], body["u0_v"], body["insulation"], body["ambient_c"])


# ---------------------------------------------------------------- protective conductor


@protective_blp.route("", methods=["POST"])
@protective_blp.doc(operationId="protectiveConductor")  # a stable name for client generators
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
