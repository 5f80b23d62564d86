"""GET /v1/devices and /v1/devices/{device_id}/{rating_a}/characteristic."""

from __future__ import annotations

import flask

from service.api.base import Blueprint
from service.api.helpers import SVG, svg_response
from service.contract.catalogue_schemas import CatalogueSchema, CharacteristicSchema
from service.electrical.devices.catalogue import catalogue, device_by_id
from service.electrical.errors import ElectricalError
from service.picture import characteristic_svg

blp = Blueprint(
    "devices", __name__, url_prefix="/v1/devices", description="The built-in protective devices and their curves"
)


@blp.route("", methods=["GET"])
@blp.doc(operationId="listDevices")  # a stable name for client generators
@blp.response(200, CatalogueSchema)
def list_devices():
    """The built-in devices: standard, type, ratings, and each data table's source and confidence"""
    return {"devices": catalogue()}


@blp.route("/<string:device_id>/<number:rating_a>/characteristic", methods=["GET"])
@blp.doc(operationId="deviceCharacteristic")  # a stable name for client generators
@blp.response(200, CharacteristicSchema)
@blp.alt_response(404, description="No such device or rating")
@blp.doc(responses={200: {"content": {SVG: {"schema": {"type": "string", "description": "the curve as a picture"}}}}})
def characteristic(device_id, rating_a):
    """The time-current points of one device at one rating; as a picture with `Accept: image/svg+xml`"""
    try:
        dev = device_by_id(device_id, rating_a)
    except ElectricalError as err:
        flask.abort(404, description=err.message)
    if flask.request.accept_mimetypes.best_match(["application/json", SVG]) == SVG:
        return svg_response(characteristic_svg(dev), cache_seconds=86400)
    return {
        "device": dev.summary(),
        "rating_a": dev.rating_a,
        "points": dev.characteristic.points(),
        "regions": [{"from_current_a": lo, "region": name} for lo, name in dev.regions],
    }
