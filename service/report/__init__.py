"""The printable report of an installation, the papers a designer files: a cover (the job, the edition applied,
the supply, the verdict with its counts), then per board its values, a schedule of its circuits with what a
designer records, what to look at in words, and the coordination pictures, two to a page; the notes said once at
the end. One HTML file with its print styles and pictures inline (no CDN), for A4 landscape.
"""

from __future__ import annotations

import datetime as dt
import importlib.metadata
from collections.abc import Callable, Mapping, Sequence
from pathlib import Path
from typing import Any

from jinja2 import Environment, FileSystemLoader, select_autoescape
from markupsafe import Markup

from service.electrical.circuit_arrays import CircuitFailure
from service.electrical.devices.catalogue import resolve
from service.electrical.inputs import Circuit, Installation, Unread
from service.electrical.network.installation import BoardResult, InstallationResult
from service.electrical.results.circuit_result import GENERAL_CAUTIONS, CircuitResult
from service.electrical.results.verdicts import Verdict
from service.electrical.testing.judges import largest_zs_at
from service.electrical.testing.ring import TOLERANCE_OHM as RING_TOLERANCE_OHM
from service.report.loglog import pair_svg
from service.report.words import CHECK_WORDS, Notes, number, plain

HERE = Path(__file__).parent
ENV = Environment(loader=FileSystemLoader(HERE), autoescape=select_autoescape(["html"]), trim_blocks=True)
ENV.filters["n"] = number
ENV.filters["plain"] = plain
TEST_TEMPERATURE_C = 20.0  # the largest measured Zs is printed for conductors at this temperature (common practice)


def version() -> str:
    try:
        return importlib.metadata.version("faultpath")
    except importlib.metadata.PackageNotFoundError:  # run from a checkout that was never installed
        return "unreleased"


def _cable(circuit: Circuit) -> str:
    c = circuit.conductors
    if c is None:
        return f"R1+R2 {number(circuit.r1_plus_r2_ohm)} ohm given"
    parallel = f"{c.parallel_cables} x " if c.parallel_cables > 1 else ""
    ring = " ring" if c.ring else ""
    material = "" if c.material == "copper" else f" {c.material}"
    return f"{parallel}{number(c.line_csa_mm2)}/{number(c.cpc_csa_mm2)}{material}, {number(c.length_m)} m{ring}"


def _supplies(circuit: Circuit) -> str:
    if circuit.feeds_board:
        return f"board {circuit.feeds_board}"
    said = circuit.equipment or circuit.load or circuit.role
    where = f", {circuit.location}" if circuit.location and circuit.location != "general" else ""
    return f"{said}{where}".replace("-", " ")


def _device(circuit: Circuit, result: CircuitResult) -> tuple[str, str]:
    d = circuit.device
    capacity = f", {number(d.breaking_capacity_ka)} kA" if d.breaking_capacity_ka else ""
    rcd = d.rcd
    residual = (
        "-"
        if rcd is None
        else f"{number(rcd.residual_current_ma)} mA {rcd.type or 'type ?'}" + (" S" if rcd.delay == "S" else "")
    )
    return f"{result.device['label']}{capacity}", residual


def _selectivity(result: CircuitResult) -> str:
    s = result.selectivity
    if s is None:
        return "-"
    words = {"partial": f"partial, to {number(s['up_to_a'])} A" if s["up_to_a"] else "partial"}.get(s["verdict"])
    check = result.check("selectivity")
    counted = check is not None and check.check in result.verdict_scope["covered"]
    return (words or s["verdict"]) + (f" ({check.verdict})" if counted else "")


def _figures(check: Any) -> str:
    """A check's value against its limit, in its unit ('5.99 of 5 %'), or nothing where either is not known."""
    if check.value is None or check.limit is None:
        return ""
    return f"{number(check.value)} of {number(check.limit)} {check.unit}".strip()


def _row(item: Any, circuit: Any, problems: Sequence[str], notes: Notes) -> dict[str, Any]:
    """One line of a board's schedule, and what to look at: the checks not passed and the circuit's own cautions,
    each a note said once in the report."""
    if not isinstance(item, CircuitResult):
        message = item.message if isinstance(item, CircuitFailure) else "; ".join(problems)
        return {"id": getattr(item, "id", None), "problem": message or "not checked"}
    device, rcd = _device(circuit, item)
    look = [
        (
            CHECK_WORDS.get(c.check, c.check),
            c.verdict,
            c.check in item.verdict_scope["left_out"],
            notes.ref(c.note) if c.note else None,
            f"{number(c.value)} of {number(c.limit)} {c.unit}".strip()
            if c.value is not None and c.limit is not None
            else "",
        )
        for c in item.checks
        if c.verdict != Verdict.PASS
    ]
    cautions = [notes.ref(text) for text in item.cautions if text not in GENERAL_CAUTIONS]
    run = circuit.installation
    return {
        "id": item.id,
        "result": item,
        "supplies": _supplies(circuit),
        "method": f"{run.installation_method} {run.cable}" if run else "-",
        "cable": _cable(circuit),
        "device": device,
        "rcd": rcd,
        "measured_zs": largest_zs_at(item, circuit, TEST_TEMPERATURE_C),  # as the test sheet gives it
        "selectivity": _selectivity(item),
        "look": look,
        "cautions": cautions,
    }


class Pictures:
    """Each distinct pair of devices drawn once for the whole report (the curves are the same wherever the pair
    recurs; each board's fault levels are in its table)."""

    def __init__(self, tick: Callable[[], None]):
        self.drawn: dict[tuple, str] = {}
        self.tick = tick

    def of(self, board: BoardResult, circuits: Sequence[Any], upstream: Any) -> list[dict[str, Any]]:
        """The board's pairs: a picture where this report first meets the pair, a reference where it met it before."""
        if upstream is None:
            return []
        pairs: dict[tuple, dict[str, Any]] = {}
        for item, circuit in zip(board.circuits, circuits, strict=True):
            if not isinstance(item, CircuitResult) or item.selectivity is None:
                continue
            s = item.selectivity
            key = (circuit.device.curve_key, upstream.curve_key, s["verdict"], s["up_to_a"])
            pair = pairs.setdefault(key, {"device": circuit.device, "selectivity": s, "ids": []})
            pair["ids"].append(item.id or "(no id)")
        return [self._picture(key, pair, upstream) for key, pair in pairs.items()]

    def _picture(self, key: tuple, pair: dict[str, Any], upstream: Any) -> dict[str, Any]:
        if key in self.drawn:
            return {**pair, "svg": None, "seen": self.drawn[key]}
        self.tick()
        down, up = resolve(pair["device"]), resolve(upstream)
        title = f"{down.label} under {up.label}: {pair['selectivity']['verdict']}"
        self.drawn[key] = title
        return {**pair, "svg": Markup(pair_svg(down, up, pair["selectivity"]["up_to_a"], title)), "seen": None}


def _cover(inst: Installation, result: InstallationResult, job: Mapping[str, Any] | None) -> dict[str, Any]:
    """What the cover says: the job, the supply at the origin with its fault levels, and the verdict."""
    origin = next(board for board in result.boards if board.fed_from is None)
    main = next(board.device for board in inst.boards if board.fed_from is None)
    return {
        "job": dict(job or {}),
        "origin": origin,
        "main": resolve(main).label if main is not None else None,
        "version": version(),
        "not_checked": result.summary.get("invalid", 0),
    }


def report_html(
    inst: Installation,
    result: InstallationResult,
    problems: Mapping[tuple[int, int], Sequence[str]] | None = None,
    generated: dt.datetime | None = None,
    tick: Callable[[], None] = lambda: None,
    job: Mapping[str, Any] | None = None,
    bill: Mapping[str, Any] | None = None,
    traded: Sequence[str] = (),
) -> str:
    """The report as one HTML document; ``problems`` holds the messages of circuits the caller could not read;
    ``tick`` is called before each board and each picture (the caller's deadline may stop the work there); ``job``
    the request's job (name, address, reference, designer, date, revision) for the cover; ``bill`` and ``traded``
    a design's bill of quantities and what it traded (installations/design), printed before the notes."""
    positions = {board.id: b for b, board in enumerate(inst.boards)}
    pictures, notes = Pictures(tick), Notes()
    sections = []
    for board in result.boards:
        b = positions[board.id]
        circuits = inst.boards[b].circuits
        rows = [
            _row(item, circuit, (problems or {}).get((b, c), ()), notes)
            for c, (item, circuit) in enumerate(zip(board.circuits, circuits, strict=True))
        ]
        tick()
        upstream = _upstream_of(inst, result, board)
        drawn = [] if board.not_checked else pictures.of(board, circuits, upstream)
        sections.append(
            {"board": board, "rows": rows, "pictures": drawn, "cautions": [notes.ref(t) for t in board.cautions]}
        )
    when = (generated or dt.datetime.now(dt.UTC)).strftime("%Y-%m-%d %H:%M UTC")
    return ENV.get_template("report.html").render(
        inst=inst,
        result=result,
        cover=_cover(inst, result, job),
        sections=sections,
        notes=notes.listed(),
        generated=when,
        words=CHECK_WORDS,
        test_temperature=TEST_TEMPERATURE_C,
        bill=bill,
        traded=list(traded),
    )


def _upstream_of(inst: Installation, result: InstallationResult, board: BoardResult) -> Any:
    """The device feeding the board: the feed's, or the origin board's own."""
    if board.fed_from is None:
        return next(b.device for b in inst.boards if b.id == board.id)
    parent = next(b for b in inst.boards if b.id == board.fed_from)
    feed = next((c for c in parent.circuits if c.feeds_board == board.id), None)
    return None if feed is None or isinstance(feed, Unread) else feed.device


def test_sheet_html(sheet: Mapping[str, Any], result: InstallationResult) -> str:
    """The site test sheet to print: per board, each circuit's limits and a cell for each reading."""
    boards: dict[str, dict[str, Any]] = {}
    for item in sheet["circuits"]:
        if "expected" not in item:
            continue
        ze = item["expected"]["design_ze_ohm"]
        board = boards.setdefault(item["board"], {"id": item["board"], "items": [], "ze": ze})
        board["items"].append(item)
    first = next((item["expected"] for item in sheet["circuits"] if "expected" in item), {})
    return ENV.get_template("test_sheet.html").render(
        result=result,
        boards=list(boards.values()),
        temperature=first.get("test_temperature_c", TEST_TEMPERATURE_C),
        tolerance=RING_TOLERANCE_OHM,
    )
