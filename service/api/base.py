"""What every resource blueprint shares: the strict JSON parser."""

from __future__ import annotations

from typing import Any

import flask
import flask_smorest
from marshmallow import ValidationError
from webargs import core
from webargs.flaskparser import FlaskParser, abort

from service.contract.strictjson import LoneSurrogate, strict_loads


class StrictParser(FlaskParser):
    """webargs' Flask parser reading bodies with :func:`strict_loads`."""

    def _raw_load_json(self, req):
        if not req.get_data(cache=True):
            return core.missing
        return strict_loads(req.get_data(cache=True))

    def load_json(self, req, schema):
        """A CSV body where the schema reads one (a filled test sheet): the body it stands for; each item's line in
        the file is kept for the problems' pointers (flask.g.body_pointer: a pointer into the body as it reads in
        the file)."""
        if req.mimetype == "text/csv" and hasattr(schema, "reads_csv"):
            try:
                body, flask.g.body_pointer = schema.reads_csv(req.get_data(cache=True).decode("utf-8-sig"))
            except UnicodeDecodeError:
                abort(400, messages={"json": {"": ["the CSV body is not UTF-8"]}})
            except ValidationError as err:
                abort(422, messages={"json": err.messages})
            return body
        return super().load_json(req, schema)

    def _handle_invalid_json_error(self, error, req, *args, **kwargs):
        message = getattr(error, "msg", str(error))
        if isinstance(error, LoneSurrogate):  # name the field
            nested: Any = [message]
            for key in reversed(error.path):
                nested = {str(key): nested}
            abort(400, messages={"json": nested})
        abort(400, messages={"json": {"": [f"the body is not strict JSON: {message}"]}})


def body_types(*types: str):
    """Declare on a view the media types its body may come in (application/json where it declares none)."""

    def declare(view):
        view.body_types = types
        return view

    return declare


class Blueprint(flask_smorest.Blueprint):
    """A flask-smorest blueprint whose bodies are read by the strict JSON parser."""

    ARGUMENTS_PARSER = StrictParser()
