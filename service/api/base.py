"""What every resource blueprint shares: the strict JSON parser."""

from __future__ import annotations

from typing import Any

import flask_smorest
from webargs import core
from webargs.flaskparser import FlaskParser, abort

from service.contract.strictjson import LoneSurrogate, strict_loads


class StrictParser(FlaskParser):
    """webargs' Flask parser reading bodies with :func:`strict_loads`."""

    def _raw_load_json(self, req):
        if not req.get_data(cache=True):
            return core.missing
        return strict_loads(req.get_data(cache=True))

    def _handle_invalid_json_error(self, error, req, *args, **kwargs):
        message = getattr(error, "msg", str(error))
        if isinstance(error, LoneSurrogate):  # name the field
            nested: Any = [message]
            for key in reversed(error.path):
                nested = {str(key): nested}
            abort(400, messages={"json": nested})
        abort(400, messages={"json": {"": [f"the body is not strict JSON: {message}"]}})


class Blueprint(flask_smorest.Blueprint):
    """A flask-smorest blueprint whose bodies are read by the strict JSON parser."""

    ARGUMENTS_PARSER = StrictParser()
