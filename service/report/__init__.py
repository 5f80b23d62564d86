"""The printable report of an installation: per board its values and a schedule of its circuits, the
coordination pictures, the cautions. One HTML file with its print styles and pictures inline (no CDN)."""

from __future__ import annotations

import datetime as dt
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
from service.electrical.testing.ring import TOLERANCE_OHM as RING_TOLERANCE_OHM
from service.picture import coordination_svg

HERE = Path(__file__).parent
ENV = Environment(loader=FileSystemLoader(HERE), autoescape=select_autoescape(["html"]), trim_blocks=True)


def _cable(circuit: Circuit) -> str:
    c = circuit.conductors
    if c is None:
        return f"R1+R2 {circuit.r1_plus_r2_ohm:g} ohm (given)"
    parallel = f"{c.parallel_cables} x " if c.parallel_cables > 1 else ""
    ring = ", ring" if c.ring else ""
    return f"{parallel}{c.line_csa_mm2:g}/{c.cpc_csa_mm2:g} mm2 {c.material}, {c.length_m:g} m{ring}"


# what each check is, in the words of a designer's schedule
CHECK_WORDS = {
    "disconnection-time": "Earth fault disconnection time",
    "max-zs": "Earth fault loop impedance (Zs)",
    "short-circuit": "Short circuit of the live conductors",
    "protective-conductor": "Protective conductor size",
    "breaking-capacity": "Breaking capacity",
    "overload": "Overload protection",
    "voltage-drop": "Voltage drop",
    "rcd": "RCD fault protection (Zs x IΔn <= 50 V)",
    "additional-protection": "30 mA RCD (additional protection)",
    "rcd-type": "RCD type",
    "arc-fault-detection": "Arc fault detection (AFDD)",
    "ev-earthing": "EV charge point earthing (broken PEN)",
    "selectivity": "Selectivity with the device above",
    "demand": "Demand against what feeds the board",
    "rcd-selectivity": "RCDs in series",
    "surge-protection": "Surge protection",
}


def _own_cautions(item: CircuitResult) -> list[str]:
    """The circuit's own cautions (the general ones are said once, at the top)."""
    return [text for text in item.cautions if text not in GENERAL_CAUTIONS]


def _row(item: Any, circuit: Any, problems: Sequence[str]) -> dict[str, Any]:
    """One line of a board's schedule."""
    if isinstance(item, CircuitResult):
        return {
            "cautions": _own_cautions(item),
            "id": item.id,
            "device": item.device["label"],
            "cable": _cable(circuit),
            "result": item,
            "issues": [
                c for c in item.checks if c.verdict != Verdict.PASS and c.check in item.verdict_scope["covered"]
            ],
            "reported": [
                c for c in item.checks if c.verdict != Verdict.PASS and c.check in item.verdict_scope["left_out"]
            ],
            "selectivity": item.selectivity,
        }
    message = item.message if isinstance(item, CircuitFailure) else "; ".join(problems)
    return {"id": getattr(item, "id", None), "problem": message or "not checked"}


MAX_PICTURES = 24  # distinct device pairs drawn in one report; the rest are named, not drawn (the time budget)


class Pictures:
    """The report's coordination pictures: each distinct pair of devices drawn once for the whole report (the curves
    are the same wherever the pair recurs; each board's fault levels are in its table), at most ``MAX_PICTURES``."""

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
            key = (
                circuit.device.curve_key,
                upstream.curve_key,
                item.selectivity["verdict"],
                item.selectivity["up_to_a"],
            )
            pair = pairs.setdefault(key, {"device": circuit.device, "selectivity": item.selectivity, "ids": []})
            pair["ids"].append(item.id or "(no id)")
        return [self._picture(key, pair, upstream) for key, pair in pairs.items()]

    def _picture(self, key: tuple, pair: dict[str, Any], upstream: Any) -> dict[str, Any]:
        if key in self.drawn:
            return {**pair, "svg": None, "seen": self.drawn[key]}
        if len(self.drawn) >= MAX_PICTURES:
            return {**pair, "svg": None, "seen": None}
        self.tick()
        down, up = resolve(pair["device"]), resolve(upstream)
        title = f"{down.label} under {up.label}: {pair['selectivity']['verdict']}"
        svg = coordination_svg(down, up, {}, pair["selectivity"]["up_to_a"], title).decode()
        self.drawn[key] = title
        return {**pair, "svg": Markup(svg[svg.index("<svg") :]), "seen": None}


def report_html(
    inst: Installation,
    result: InstallationResult,
    problems: Mapping[tuple[int, int], Sequence[str]] | None = None,
    generated: dt.datetime | None = None,
    tick: Callable[[], None] = lambda: None,
) -> str:
    """The report as one HTML document; ``problems`` holds the messages of circuits the caller could not read;
    ``tick`` is called before each board and each picture (the caller's deadline may stop the work there)."""
    positions = {board.id: b for b, board in enumerate(inst.boards)}
    pictures = Pictures(tick)
    sections = []
    for board in result.boards:
        b = positions[board.id]
        circuits = inst.boards[b].circuits
        rows = [
            _row(item, circuit, (problems or {}).get((b, c), ()))
            for c, (item, circuit) in enumerate(zip(board.circuits, circuits, strict=True))
        ]
        tick()
        upstream = _upstream_of(inst, result, board)
        drawn = [] if board.not_checked else pictures.of(board, circuits, upstream)
        sections.append({"board": board, "rows": rows, "pictures": drawn})
    when = (generated or dt.datetime.now(dt.UTC)).strftime("%Y-%m-%d %H:%M UTC")
    return ENV.get_template("report.html").render(
        inst=inst, result=result, sections=sections, generated=when, words=CHECK_WORDS, max_pictures=MAX_PICTURES
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
        board = boards.setdefault(
            item["board"], {"id": item["board"], "items": [], "ze": item["expected"]["design_ze_ohm"]}
        )
        board["items"].append(item)
    first = next((item["expected"] for item in sheet["circuits"] if "expected" in item), {})
    return ENV.get_template("test_sheet.html").render(
        result=result,
        boards=list(boards.values()),
        temperature=first.get("test_temperature_c", 20),
        tolerance=RING_TOLERANCE_OHM,
    )
