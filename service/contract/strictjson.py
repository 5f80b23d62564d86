"""A strict JSON reader for request bodies.

Python's json module accepts NaN and Infinity, keeps the last of duplicate keys, reads integers of
thousands of digits and recurses on deep nesting. A request body gets none of that: each is a
JSONDecodeError, which the parser turns into a 400 problem.
"""

from __future__ import annotations

import json
import math
import re
from typing import Any

MAX_INTEGER_DIGITS = 18


class _Refused(json.JSONDecodeError):
    """A refusal worded here (not the json module's own sentence)."""


def _reject(message: str, doc: str = " ") -> json.JSONDecodeError:
    return _Refused(message, doc or " ", 0)


def _constant(name: str) -> Any:
    raise _reject(f"{name} is not a JSON number")


def _integer(text: str) -> int:
    if len(text.lstrip("-")) > MAX_INTEGER_DIGITS:
        raise _reject(f"an integer of {len(text)} digits is out of range")
    return int(text)


def _float(text: str) -> float:
    value = float(text)
    if not math.isfinite(value):
        raise _reject(f"the number {text[:40]} is out of range")
    return value


def _pairs(pairs: list[tuple[str, Any]]) -> dict[str, Any]:
    out = dict(pairs)
    if len(out) != len(pairs):  # a key came twice: name the first that did
        seen: set[str] = set()
        for key, _ in pairs:
            if key in seen:
                raise _reject(f"duplicate key {key[:60]!r}")
            seen.add(key)
    return out


SURROGATE_ESCAPE = re.compile(r"\\u[dD][89a-fA-F]")  # a \uD800-\uDFFF escape: checked for its partner


def _lone_surrogate(node: Any, path: tuple = ()) -> tuple | None:
    """The path of the first key or string holding a lone surrogate (not text: no writer can answer with it)."""
    if isinstance(node, str):
        try:
            node.encode("utf-8")
        except UnicodeEncodeError:
            return path
        return None
    if isinstance(node, dict):
        for key, value in node.items():
            found = _lone_surrogate(key, path + (key,)) if isinstance(key, str) else None
            found = found if found is not None else _lone_surrogate(value, path + (key,))
            if found is not None:
                return found
    elif isinstance(node, list):
        for k, value in enumerate(node):
            found = _lone_surrogate(value, path + (k,))
            if found is not None:
                return found
    return None


class LoneSurrogate(_Refused):
    """A string with a lone surrogate, at ``path`` (a 400 that names the field)."""

    def __init__(self, path: tuple):
        super().__init__("a lone surrogate (\\uD800-\\uDFFF without its pair) is not text", " ", 0)
        safe = lambda key: key.encode("utf-8", "backslashreplace").decode() if isinstance(key, str) else key  # noqa: E731
        self.path = tuple(safe(key) for key in path)


def strict_loads(data: bytes | str) -> Any:
    """Parse ``data`` as strict JSON (UTF-8); raise JSONDecodeError on anything doubtful."""
    try:
        text = data.decode("utf-8") if isinstance(data, bytes) else data
    except UnicodeDecodeError as exc:
        raise _reject(f"the body is not UTF-8 ({exc.reason})") from None
    try:
        value = json.loads(
            text, parse_constant=_constant, parse_int=_integer, parse_float=_float, object_pairs_hook=_pairs
        )
    except json.JSONDecodeError as exc:
        if isinstance(exc, _Refused):  # raised by the hooks above: already in our words
            raise _reject(exc.msg, text[:80]) from None
        raise _reject(f"not JSON at line {exc.lineno}, column {exc.colno}", text[:80]) from None
    except RecursionError:
        raise _reject("the body is nested too deeply") from None
    except ValueError as exc:  # e.g. Python's own limit on integer digits
        raise _reject(str(exc)) from None
    if "\\u" in text and SURROGATE_ESCAPE.search(text):  # only then look for a partnerless one
        try:
            found = _lone_surrogate(value)
        except RecursionError:
            raise _reject("the body is nested too deeply") from None
        if found is not None:
            raise LoneSurrogate(found)
    return value
