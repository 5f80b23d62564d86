"""The bill of quantities of an installation: its cables by family and sizes with their total length (plus an
allowance for the routes' ends and waste), its devices by standard, type, rating and RCD, counted; priced where
prices are given (a line with no price is listed, and said unpriced)."""

from __future__ import annotations

from collections.abc import Mapping
from typing import Any

from service.electrical.cables.design_search import material_mm2_m
from service.electrical.inputs import Circuit, DeviceSpec, Installation


def _rcd(device: DeviceSpec) -> str | None:
    rcd = device.rcd
    if rcd is None:
        return None
    kind = f" type {rcd.type}" if rcd.type else ""
    return f"{rcd.residual_current_ma:g} mA{kind}" + (" S" if rcd.delay == "S" else "")


def _device_key(device: DeviceSpec) -> tuple:
    return (device.standard, device.type, device.rating_a, _rcd(device), bool(device.afdd))


def bill_of_quantities(
    inst: Installation, allowance_percent: float = 0.0, prices: Mapping[str, Any] | None = None
) -> dict[str, Any]:
    """Cables (length = route x cables in parallel, a ring's whole length, x (1 + allowance)) and devices (each
    circuit's, and the origin's main device), with costs where ``prices`` has ``cables`` {(cable, line_csa_mm2):
    per_m} and ``devices`` {(standard, type, rating_a): each}."""
    cables: dict[tuple, float] = {}
    devices: dict[tuple, int] = {}
    for board in inst.boards:
        if board.device is not None:
            devices[_device_key(board.device)] = devices.get(_device_key(board.device), 0) + 1
        for circuit in board.circuits:
            if not isinstance(circuit, Circuit):
                continue
            devices[_device_key(circuit.device)] = devices.get(_device_key(circuit.device), 0) + 1
            c, run = circuit.conductors, circuit.installation
            if c is None:
                continue
            key = (run.cable if run else None, c.material, c.line_csa_mm2, c.cpc_csa_mm2)
            cables[key] = cables.get(key, 0.0) + c.length_m * c.parallel_cables
    factor = 1 + allowance_percent / 100.0
    cable_prices = (prices or {}).get("cables", {})
    device_prices = (prices or {}).get("devices", {})
    cable_lines = [
        _cable_line(key, metres * factor, cable_prices) for key, metres in sorted(cables.items(), key=_order)
    ]
    device_lines = [_device_line(key, n, device_prices) for key, n in sorted(devices.items(), key=_order)]
    priced = [line["cost"] for line in cable_lines + device_lines if line["cost"] is not None]
    unpriced = sum(line["cost"] is None for line in cable_lines + device_lines)
    return {
        "allowance_percent": allowance_percent,
        "cables": cable_lines,
        "devices": device_lines,
        "total_cost": round(sum(priced), 2) if prices else None,
        "unpriced_lines": unpriced if prices else None,
    }


def _order(item: tuple) -> tuple:
    return tuple((0, "") if v is None else (1, v) if isinstance(v, str) else (2, v) for v in item[0])


def _cable_line(key: tuple, metres: float, prices: Mapping) -> dict[str, Any]:
    cable, material, line, cpc = key
    per_m = prices.get((cable, line))
    return {
        "cable": cable,
        "material": material,
        "line_csa_mm2": line,
        "cpc_csa_mm2": cpc,
        "length_m": round(metres, 1),
        "per_m": per_m,
        "cost": None if per_m is None else round(per_m * metres, 2),
    }


def _device_line(key: tuple, count: int, prices: Mapping) -> dict[str, Any]:
    standard, kind, rating, rcd, afdd = key
    each = prices.get((standard, kind, rating))
    if each is None:
        each = prices.get((standard, None, rating))
    return {
        "standard": standard,
        "type": kind,
        "rating_a": rating,
        "rcd": rcd,
        "afdd": afdd,
        "count": count,
        "each": each,
        "cost": None if each is None else round(each * count, 2),
    }


def run_cost(prices: Mapping[str, Any]) -> Any:
    """A run's cost from the prices (per metre of the cable at its size, times the route and the cables in
    parallel); a size with no price costs its material, so that a priced size is never passed over for it."""

    def cost(circuit: Any, line: float, cpc: float) -> float:
        run, c = circuit.installation, circuit.conductors
        per_m = prices["cables"].get((run.cable if run else None, line))
        return material_mm2_m(circuit, line, cpc) * 1e6 if per_m is None else per_m * c.length_m * c.parallel_cables

    return cost
