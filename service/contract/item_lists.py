"""Lists whose items are validated one by one: a bad item becomes an :class:`ItemProblem` in its place, never a
422 for the whole request (a batch's circuits, a board's circuits, the items of a test sheet)."""

from __future__ import annotations

from marshmallow import ValidationError, fields

from service.contract.fastload import Refused, fast_load
from service.contract.fields import safe_text

ECHO_CHARS = 200  # an invalid item's id is echoed cut to this many characters (the longest valid id)


def echoed(ident: str | None) -> str | None:
    """An id as an answer may echo it: cut to ECHO_CHARS, and None where it is not text to show."""
    if ident is None or not safe_text(ident):
        return None
    return ident if len(ident) <= ECHO_CHARS else ident[: ECHO_CHARS - 1] + "…"


class ItemProblem:
    """A batch item that did not validate: its place, its id if readable, and its messages."""

    def __init__(self, index: int, messages, raw):
        self.index = index
        self.messages = messages
        self.raw = raw
        ident = raw.get("id") if isinstance(raw, dict) and isinstance(raw.get("id"), str) else None
        self.id = echoed(ident)


class PerItemList(fields.List):
    """A list whose items are validated one by one: a bad item becomes an ItemProblem, never a 422."""

    def _deserialize(self, value, attr, data, **kwargs):
        if not isinstance(value, list):
            raise self.make_error("invalid")
        out = []
        schema = self.inner.schema
        for index, item in enumerate(value):
            try:
                out.append(fast_load(schema, item))
                continue
            except Refused:
                pass
            try:  # marshmallow itself: the same answer, with the documented messages
                out.append(self.inner.deserialize(item, **kwargs))
            except ValidationError as err:
                out.append(ItemProblem(index, err.messages, item))
        return out
