"""GET /healthz (alive), /readyz (ready to compute), /metrics (Prometheus text)."""

from __future__ import annotations

import flask
from marshmallow import fields

from service.api import metrics
from service.api.base import Blueprint
from service.contract.fields import ContractSchema
from service.electrical.devices.catalogue import catalogue
from service.electrical.inputs import Circuit, Conductors, DeviceSpec, Supply
from service.electrical.pipeline import check_circuit

blp = Blueprint("health", __name__, description="Liveness, readiness and metrics")


class StatusSchema(ContractSchema):
    status = fields.String(required=True)


def self_check() -> None:
    """Load every data table and run one whole check: what a worker needs before taking traffic."""
    catalogue()
    check_circuit(
        Supply(earthing="TN-S", u0_v=230, ze_ohm=0.5),
        Circuit(
            device=DeviceSpec(rating_a=16, standard="BS EN 60898", type="B", breaking_capacity_ka=6),
            conductors=Conductors("copper", "thermoplastic-70", 2.5, 1.5, 10),
            role="final",
            load="fixed-equipment",
        ),
    )


@blp.route("/healthz", methods=["GET"])
@blp.doc(operationId="health")  # a stable name for client generators
@blp.response(200, StatusSchema)
def healthz():
    """The process is alive"""
    return {"status": "ok"}


@blp.route("/readyz", methods=["GET"])
@blp.doc(operationId="readiness")  # a stable name for client generators
@blp.response(200, StatusSchema)
@blp.alt_response(503, description="Not ready")
def readyz():
    """The data tables load and a check runs"""
    try:
        self_check()
    except Exception:  # noqa: BLE001 - any failure here means not ready
        flask.abort(503, description="the calculation core failed its self-check")
    return {"status": "ready"}


@blp.route("/metrics", methods=["GET"])
@blp.doc(operationId="metrics")  # a stable name for client generators
@blp.doc(
    responses={
        "200": {"description": "Prometheus text exposition", "content": {"text/plain": {"schema": {"type": "string"}}}}
    }
)
def metrics_view():
    """Prometheus metrics: requests, latency histogram, verdict counts"""
    return metrics.exposition()
