"""Reading the hostile-input corpus (tests/api/hostile/*.json): each file one case, with the status and the
error pointer it must produce. Used by tests/api/test_hostile.py and by bench/reliability.py."""

from __future__ import annotations

import json
from pathlib import Path

from tests.paths import EXAMPLES

HOSTILE = Path(__file__).resolve().parent / "hostile"


def cases() -> list[tuple[str, dict]]:
    return [(p.stem, json.loads(p.read_text(encoding="utf-8"))) for p in sorted(HOSTILE.glob("*.json"))]


def body_of(case: dict) -> bytes | None:
    """The bytes a case sends: raw text, hex bytes, a JSON body, or a generated one."""
    if "raw" in case:
        return case["raw"].encode("utf-8")
    if "raw_hex" in case:
        return bytes.fromhex(case["raw_hex"])
    if "body" in case:
        return json.dumps(case["body"], ensure_ascii=False).encode("utf-8")
    gen = case.get("generate")
    if gen is None:
        return None
    if gen["kind"] == "digits":
        return b'{"supply": {"u0_v": ' + b"9" * gen["count"] + b"}}"
    if gen["kind"] == "nest":
        return b"[" * gen["depth"] + b"]" * gen["depth"]
    if gen["kind"] == "pad":
        return b'{"supply": "' + b"x" * gen["bytes"] + b'"}'
    if gen["kind"] == "batch":
        example = json.loads((EXAMPLES / "circuits-check.json").read_text())
        return json.dumps({"supply": example["supply"], "circuits": [example["circuit"]] * gen["count"]}).encode()
    raise ValueError(f"unknown generator {gen['kind']}")


def judge(case: dict, status: int, content_type: str, payload: bytes) -> list[str]:
    """What is wrong with an answer to a case (empty when it is as documented)."""
    problems = []
    if status != case["expect_status"]:
        problems.append(f"status {status}, expected {case['expect_status']}")
    if status >= 500:
        problems.append("a server error")
    if status >= 400:
        return problems + _problem_answer(case, content_type, payload)
    if "expect_items" in case:
        return problems + _items_answer(case["expect_items"], json.loads(payload)["results"])
    if "expect_echo_id" in case and json.loads(payload).get("id") != case["expect_echo_id"]:
        problems.append("the id did not come back unchanged")
    return problems


def _problem_answer(case: dict, content_type: str, payload: bytes) -> list[str]:
    problems = []
    if not content_type.startswith("application/problem+json"):
        problems.append(f"content type {content_type}, expected application/problem+json")
    try:
        body = json.loads(payload)
    except ValueError:
        return problems + ["the problem is not JSON"]
    problems.extend(f"the problem lacks {key}" for key in ("type", "title", "status", "errors") if key not in body)
    pointers = [e.get("pointer") for e in body.get("errors", [])]
    if "expect_pointer" in case and case["expect_pointer"] not in pointers:
        problems.append(f"no error at {case['expect_pointer']!r}: {body.get('errors')}")
    return problems


def _items_answer(expect: dict, results: list) -> list[str]:
    problems = []
    if len(results) != expect["count"] or [r["index"] for r in results] != list(range(expect["count"])):
        problems.append("items lost or out of order")
    problems.extend(f"item {i} has no result" for i in expect["results"] if "result" not in results[i])
    for i, pointer in expect["problems"].items():
        if pointer not in [e["pointer"] for e in results[int(i)].get("problem", {}).get("errors", [])]:
            problems.append(f"item {i} lacks an error at {pointer}")
    return problems
