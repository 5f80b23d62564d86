"""Invented schedules of circuits for the benchmarks (demo data: a housing block's board schedules)."""

from __future__ import annotations

import random

SUPPLY = {"earthing": "TN-C-S", "u0_v": 230, "ze_ohm": 0.35, "prospective_fault_current_ka": 3.2}

_DEVICES = [
    {"standard": "BS EN 60898", "type": "B", "rating_a": 6, "breaking_capacity_ka": 6},
    {"standard": "BS EN 60898", "type": "B", "rating_a": 16, "breaking_capacity_ka": 6},
    {"standard": "BS EN 60898", "type": "B", "rating_a": 32, "breaking_capacity_ka": 6},
    {"standard": "BS EN 60898", "type": "C", "rating_a": 20, "breaking_capacity_ka": 10},
    {
        "standard": "BS EN 61009",
        "type": "B",
        "rating_a": 32,
        "breaking_capacity_ka": 6,
        "rcd": {"residual_current_ma": 30},
    },
    {"standard": "BS 88-3", "type": "gG", "rating_a": 32},
    {"standard": "BS 88-2", "type": "gG", "rating_a": 63},
]
_CABLES = [(1.5, 1.0), (2.5, 1.5), (4, 1.5), (6, 2.5), (10, 4), (16, 6)]


def circuits(n: int, seed: int = 7) -> list[dict]:
    """``n`` circuits for one supply, the same for the same seed."""
    rng = random.Random(seed)
    out = []
    for i in range(n):
        device = dict(rng.choice(_DEVICES))
        line, cpc = rng.choice(_CABLES)
        ring = device["rating_a"] == 32 and rng.random() < 0.3
        role = "distribution" if device["rating_a"] == 63 else "final"
        item = {
            "id": f"flat-{i // 12:04d}/way-{i % 12 + 1}",
            "role": role,
            "device": device,
            "conductors": {
                "material": "copper",
                "insulation": "thermoplastic-70",
                "line_csa_mm2": line,
                "cpc_csa_mm2": cpc,
                "length_m": round(rng.uniform(3, 45), 1),
                "ring": ring,
            },
        }
        if role == "final":
            item["load"] = rng.choice(["socket-outlets", "fixed-equipment"])
        out.append(item)
    return out


def batch(n: int, seed: int = 7) -> dict:
    return {"supply": SUPPLY, "circuits": circuits(n, seed)}
