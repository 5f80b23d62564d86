"""The report's words: what each check is called in a schedule, the request's field names said as a designer says
them, numbers without float noise, and the notes a report says once and refers to by number."""

from __future__ import annotations

import re
from typing import Any

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

# a request's field, as a note names it, in a designer's words
FIELD_WORDS = {
    "let_through_a2s": "the device's let-through energy (maker's data)",
    "let_through_curve": "the maker's let-through curve",
    "design_current_a": "the design current Ib",
    "line_neutral_loop_ohm": "the line-neutral loop impedance at the origin",
    "prospective_fault_current_ka": "the prospective fault current",
    "breaking_capacity_ka": "the device's breaking capacity",
    "conditional_short_circuit_ka": "the board's conditional short-circuit rating",
    "socket_outlet_rating_a": "the socket-outlets' rating",
    "energy_limiting_class": "the breaker's energy-limiting class",
    "concealed_in_wall": "how deep the cable is concealed in the wall",
    "wall_has_metal_parts": "whether the wall has metal parts",
    "earthed_metallic_covering": "whether the cable has an earthed metallic covering",
    "rated_current_a": "the supply's rated current",
    "x_over_r": "the supply's X/R at the origin",
    "terminals_c": "the terminals' temperature rating",
    "capacity_a": "the cable's current-carrying capacity",
    "voltage_drop_limit_percent": "the voltage drop limit",
    "residual_current_ma": "the RCD's IΔn",
    "dc_fault_detection": "whether the charge point detects d.c. fault current",
    "earthing_measure": "the charge point's measure against a broken PEN",
    "selectivity_limit_a": "the maker's selectivity limit",
}
UNIT_WORDS = {"a2s": "A2s", "ka": "kA", "ma": "mA", "ohm": "ohm", "mm2": "mm2", "percent": "%", "a": "A", "v": "V",
              "s": "s", "m": "m", "c": "degC"}  # fmt: skip
FIELD = re.compile(r"\b(?:[a-z]+\.)*([a-z][a-z0-9]*(?:_[a-z0-9]+)+)\b")


def _field(match: re.Match) -> str:
    name = match.group(1)
    if name in FIELD_WORDS:
        return FIELD_WORDS[name]
    stem, _, unit = name.rpartition("_")
    if unit in UNIT_WORDS and stem:
        return f"{stem.replace('_', ' ')} ({UNIT_WORDS[unit]})"
    return name.replace("_", " ")


def plain(text: str | None) -> str:
    """A note with the request's field names said in words (``device.let_through_a2s`` -> the device's let-through
    energy)."""
    return FIELD.sub(_field, text or "")


def number(value: Any) -> str:
    """A figure as a schedule prints it: four significant figures, thousands grouped, '-' where there is none."""
    if value is None:
        return "-"
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        return str(value)
    if abs(value) >= 1000:
        return f"{value:,.0f}"
    return f"{value:.4g}" if isinstance(value, float) else str(value)


class Notes:
    """The notes of a report, each said once and referred to by its number wherever it applies."""

    def __init__(self) -> None:
        self.numbers: dict[str, int] = {}

    def ref(self, text: str) -> int:
        said = plain(text).strip()
        said = said[:1].upper() + said[1:] + ("" if said.endswith((".", ")")) else ".")
        return self.numbers.setdefault(said, len(self.numbers) + 1)

    def listed(self) -> list[tuple[int, str]]:
        return [(n, text) for text, n in self.numbers.items()]
