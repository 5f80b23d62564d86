"""Many circuits a chunk at a time, and the writers of their answer: the full form as one JSON document, and
NDJSON, a line an item (the lean form, a table, is :mod:`service.contract.lean`).

One iterator serves the batch view, the installation's flat batch and the CLI: :func:`chunks` cuts the items
(a list, or rows read from a file as they are needed) into chunks of :data:`CHUNK`; :func:`records` checks
the readable items of a chunk through the core in one run and gives one record per item, in order: a result,
or the problem that stopped it. Each chunk's records are written and let go before the next is checked, so
memory stays flat in the number of items.
"""

from __future__ import annotations

import itertools
from collections.abc import Callable, Iterable, Iterator, Sequence
from typing import Any

from service.contract.item_lists import ItemProblem
from service.contract.problems import failed_item, invalid_item, json_bytes
from service.electrical.circuit_arrays import CircuitFailure
from service.electrical.pipeline import check_circuits
from service.electrical.results.verdicts import COUNTED
from service.electrical.results.verdicts import summary as verdicts_summary

CHUNK = 2000  # circuits a core run: large enough that numpy's cost per call is spread thin, small enough to stream

Record = dict[str, Any]


def chunks(items: Iterable[Any], between: Callable[[], None] | None = None) -> Iterator[tuple[int, list[Any]]]:
    """``(offset, items)`` a chunk at a time, in order; ``between`` is called before each (a request's deadline)."""
    stream, offset = iter(items), 0
    while True:
        if between is not None:
            between()
        chunk = list(itertools.islice(stream, CHUNK))
        if not chunk:
            return
        yield offset, chunk
        offset += len(chunk)


def records(
    chunk: Sequence[Any],
    offset: int,
    run: Callable[[list[Any]], Sequence[Any]],
    unreadable: Callable[[int, Any], Record | None],
    failed: Callable[[int, Any, CircuitFailure], Record],
) -> list[Record]:
    """One record per item of a chunk, in order: ``{"index", "id", "result"}``, or the item's problem.

    ``unreadable(index, item)`` is the record of an item that could not be read (None for one that could);
    ``run(items)`` checks the readable items in one core run, one result or :class:`CircuitFailure` each;
    ``failed(index, item, failure)`` is the record of an item the rules or the data do not cover.
    """
    problems = [unreadable(offset + k, item) for k, item in enumerate(chunk)]
    readable = [item for item, problem in zip(chunk, problems, strict=True) if problem is None]
    outcomes = iter(run(readable) if readable else ())
    out: list[Record] = []
    for k, (item, problem) in enumerate(zip(chunk, problems, strict=True)):
        if problem is not None:
            out.append(problem)
            continue
        outcome = next(outcomes)
        if isinstance(outcome, CircuitFailure):
            out.append(failed(offset + k, item, outcome))
        else:
            out.append({"index": offset + k, "id": outcome.id, "result": outcome})
    return out


def request_problem(index: int, item: Any) -> Record | None:
    """The record of a request's item that did not validate (an :class:`ItemProblem`), None for a circuit."""
    return invalid_item(index, item.id, item.messages, f"/circuits/{index}") if isinstance(item, ItemProblem) else None


def request_failure(index: int, item: Any, failure: CircuitFailure) -> Record:
    """The record of a request's item the rules or the data do not cover, its path a pointer into the body."""
    return failed_item(index, item.id, failure, {"supply": "/supply", "circuit": f"/circuits/{index}"})


def request_records(
    supply: Any, items: Sequence[Any], scope: Sequence[str] | None, between: Callable[[], None] | None = None
) -> Iterator[list[Record]]:
    """The records of a request's items (circuits sharing ``supply``, or problems), a chunk at a time."""
    for offset, chunk in chunks(items, between):
        yield records(
            chunk, offset, lambda valid: check_circuits(supply, valid, scope), request_problem, request_failure
        )


class Counts:
    """Verdicts counted as the records come; ``counted`` is told each chunk's verdicts (the service's metrics)."""

    def __init__(self, counted: Callable[[list[str]], None] | None = None):
        self.verdicts = dict.fromkeys(COUNTED, 0)
        self.items = 0
        self.counted = counted

    def add(self, chunk: Sequence[Record]) -> None:
        verdicts = [r["result"].verdict for r in chunk if "result" in r]
        for v in verdicts:
            self.verdicts[v] += 1
        self.items += len(chunk)
        if self.counted is not None:
            self.counted(verdicts)

    def summary(self) -> dict[str, int]:
        """``circuits``, the count of each verdict, and ``invalid`` for the items that could not be checked."""
        return verdicts_summary(self.verdicts, self.items)


def full_json(
    record_chunks: Iterable[list[Record]], counts: Counts, tail: dict[str, Any], end: bytes = b""
) -> Iterator[bytes]:
    """The full form, ``{"results": [...], "summary": {...}, **tail}``, written a chunk at a time: each chunk's
    results become JSON (one orjson call a chunk) and are let go before the next is checked."""
    yield b'{"results":['
    first = True
    for chunk in record_chunks:
        counts.add(chunk)
        if chunk:
            yield (b"" if first else b",") + json_bytes(chunk)[1:-1]  # the chunk's items, without the brackets
            first = False
    closing = b'],"summary":' + json_bytes(counts.summary())
    for key, value in tail.items():
        closing += b"," + json_bytes(key) + b":" + json_bytes(value)
    yield closing + b"}" + end


def ndjson(record_chunks: Iterable[list[Record]], counts: Counts, tail: dict[str, Any]) -> Iterator[bytes]:
    """One JSON line an item, in order, a chunk at a time; the last line is ``{"summary": ..., **tail}``."""
    for chunk in record_chunks:
        counts.add(chunk)
        yield b"".join(json_bytes(record) + b"\n" for record in chunk)
    yield json_bytes({"summary": counts.summary(), **tail}) + b"\n"
