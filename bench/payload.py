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
    return list(iter_circuits(n, seed))


def iter_circuits(n: int, seed: int = 7):
    """The same circuits one at a time (for files larger than memory should hold)."""
    rng = random.Random(seed)
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
        yield item


def write_schedule(path, n: int, seed: int = 7) -> None:
    """A JSON schedule of ``n`` circuits written to ``path`` a circuit at a time."""
    import json

    with open(path, "w", encoding="utf-8") as out:
        out.write('{"supply": ' + json.dumps(SUPPLY) + ', "circuits": [')
        for i, item in enumerate(iter_circuits(n, seed)):
            out.write(("," if i else "") + json.dumps(item))
        out.write("]}")


def batch(n: int, seed: int = 7) -> dict:
    return {"supply": SUPPLY, "circuits": circuits(n, seed)}


THREE_PHASE = {"earthing": "TN-C-S", "u0_v": 230, "phases": 3, "ze_ohm": 0.15, "line_neutral_loop_ohm": 0.08}


def _feed(target: str, rating_a: float, csa_mm2: float, length_m: float) -> dict:
    return {
        "id": f"{target} feed",
        "role": "distribution",
        "phases": 3,
        "feeds_board": target,
        "device": {"standard": "BS 88-2", "type": "gG", "rating_a": rating_a},
        "conductors": {
            "material": "copper",
            "insulation": "thermosetting-90",
            "line_csa_mm2": csa_mm2,
            "cpc_csa_mm2": csa_mm2,
            "length_m": length_m,
        },
        "installation": {"cable": "multicore-armoured-90c", "installation_method": "C"},
    }


def installation(n_circuits: int = 2000, groups: int = 7, per_group: int = 6, seed: int = 7) -> dict:
    """An invented estate: a main board feeding ``groups`` distribution boards, each feeding ``per_group``
    sub-boards (1 + 7 + 42 = 50 boards by default), the final circuits shared over the boards below the main."""
    boards = [{"id": "MAIN", "fed_from": None, "circuits": [_feed(f"DB-{g}", 160, 70, 30) for g in range(groups)]}]
    for g in range(groups):
        subs = [f"DB-{g}.{s}" for s in range(per_group)]
        boards.append({"id": f"DB-{g}", "fed_from": "MAIN", "circuits": [_feed(s, 63, 16, 20) for s in subs]})
        boards += [{"id": s, "fed_from": f"DB-{g}", "circuits": []} for s in subs]
    below = boards[1:]
    feeds = sum(len(b["circuits"]) for b in boards)
    for i, item in enumerate(circuits(n_circuits - feeds, seed)):
        item = {
            **item,
            "design_current_a": round(0.6 * item["device"]["rating_a"], 1),
            "phase": ("L1", "L2", "L3")[i % 3],
        }
        below[i % len(below)]["circuits"].append(item)
    return {"id": "bench estate", "supply": THREE_PHASE, "boards": boards}


def flat(installation_body: dict) -> dict:
    """The same circuits as one flat batch on the origin's supply (no places in a tree)."""
    items = [
        {k: v for k, v in c.items() if k not in ("feeds_board", "diversity", "selectivity_required")}
        for board in installation_body["boards"]
        for c in board["circuits"]
    ]
    return {"supply": installation_body["supply"], "circuits": items}
