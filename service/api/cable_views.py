"""GET /v1/cables: the cable families, their methods and sizes, and where each table comes from."""

from __future__ import annotations

from service.api.base import Blueprint
from service.api.errors import json_response
from service.contract.catalogue_schemas import CableCatalogueSchema
from service.electrical.cables import capacity

blp = Blueprint("cables", __name__, url_prefix="/v1/cables", description="The cable families the tables hold")


@blp.route("", methods=["GET"])
@blp.doc(operationId="listCables")  # a stable name for client generators
@blp.response(200, CableCatalogueSchema)
def cables():
    """The cable families

    Each family's conductor material and insulation, its installation methods with the sizes tabulated for
    each, how sizing takes its cpc, and the source and confidence of its table, so that a form can offer only
    what exists.
    """
    response = json_response({"cables": capacity.families()})
    response.headers["Cache-Control"] = "public, max-age=3600"
    return response
