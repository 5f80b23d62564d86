"""What every resource blueprint shares: the strict JSON parser."""

from __future__ import annotations

import flask_smorest

from service.api.strictjson import StrictParser


class Blueprint(flask_smorest.Blueprint):
    """A flask-smorest blueprint whose bodies are read by the strict JSON parser."""

    ARGUMENTS_PARSER = StrictParser()
