"""Which maximum disconnection time applies to a circuit, and the clause it rests on.

BS 7671:2018 Table 41.1 (= IEC 60364-4-41 Table 41.1) with 411.3.2.2-411.3.2.4 and 411.8.3;
data in data/disconnection_times.json.
"""

from __future__ import annotations

from typing import Any

import numpy as np

from service.electrical.column_tools import as_float, as_objects, map_column, scalar_io, select
from service.electrical.datafiles import core_table
from service.electrical.devices.characteristic import AT_MOST, BEYOND_DATA
from service.electrical.errors import InvalidInput
from service.electrical.results import verdicts

EARTHING = ("TN-S", "TN-C-S", "TT")
ROLES = ("final", "distribution")
LOADS = ("socket-outlets", "fixed-equipment")
CURRENT_KINDS = ("ac", "dc")


def system_of(earthing: str) -> str:
    """'TN' for TN-S and TN-C-S, 'TT' for TT."""
    if earthing not in EARTHING:
        raise InvalidInput("earthing", f"earthing is one of {list(EARTHING)}, not {earthing!r}")
    return "TT" if earthing == "TT" else "TN"


@scalar_io
def max_disconnection_time_s(
    earthing: Any,
    u0_v: Any,
    role: Any,
    load: Any,
    rating_a: Any,
    current_kind: Any = "ac",
    tn_times_in_tt: Any = False,
    reduced_low_voltage: Any = False,
) -> tuple[np.ndarray, np.ndarray]:
    """Maximum disconnection time (s) for each circuit and the clause it rests on.

    - Final circuits rated <= 63 A with socket-outlets, or <= 32 A supplying only fixed equipment:
      BS 7671:2018 Table 41.1 by system and U0 (411.3.2.2).
    - In TT, where an overcurrent device disconnects and protective bonding is complete
      (``tn_times_in_tt``), those circuits may use the TN times (411.3.2.2, note to Table 41.1).
    - Other circuits: 5 s in TN (411.3.2.3), 1 s in TT (411.3.2.4).
    - Reduced low voltage circuits: 5 s (411.8.3).

    Returns ``(time_s, clause)``; ``time_s`` is NaN where Table 41.1 sets no time (d.c. up to 120 V).
    """
    table = core_table("disconnection_times")
    u0 = as_float(u0_v)
    n = len(u0)
    cols = {
        name: as_objects(value, n)
        for name, value in (
            ("earthing", earthing),
            ("role", role),
            ("load", load),
            ("current_kind", current_kind),
            ("tn_times_in_tt", tn_times_in_tt),
            ("reduced_low_voltage", reduced_low_voltage),
        )
    }
    rating = np.broadcast_to(as_float(rating_a), u0.shape)
    bands = table["u0_bands_v"]
    scope = table["scope_411_3_2_2"]
    clauses = table["clauses"]
    keys = list(
        zip(
            cols["earthing"],
            u0.tolist(),
            cols["role"],
            cols["load"],
            rating.tolist(),
            cols["current_kind"],
            (bool(v) for v in cols["tn_times_in_tt"]),
            (bool(v) for v in cols["reduced_low_voltage"]),
            strict=True,
        )
    )
    answers = map_column(keys, n, lambda key: _one(table, bands, scope, clauses, *key), dtype=object)
    times = np.fromiter((a[0] for a in answers), dtype=float, count=n)
    basis = as_objects([a[1] for a in answers], n)
    return times, basis


def _one(table, bands, scope, clauses, earthing, u0, role, load, rating, kind, tn_in_tt, rlv):
    system = system_of(earthing)
    if role not in ROLES:
        raise InvalidInput("role", f"role is one of {list(ROLES)}, not {role!r}")
    if kind not in CURRENT_KINDS:
        raise InvalidInput("current_kind", f"current_kind is one of {list(CURRENT_KINDS)}, not {kind!r}")
    if rlv:
        return float(table["reduced_low_voltage_s"]), clauses["reduced_low_voltage"]
    if u0 <= bands[0]["above_v"]:
        raise InvalidInput(
            "u0_v", f"Table 41.1 covers U0 above {bands[0]['above_v']} V; below it the circuit is extra-low voltage"
        )
    if role == "final":
        if load not in LOADS:
            raise InvalidInput("load", f"a final circuit's load is one of {list(LOADS)}, not {load!r}")
        in_table = rating <= scope[f"{load}_max_rating_a"]
    else:
        in_table = False
    if in_table:
        band = next(k for k, b in enumerate(bands) if b["up_to_v"] is None or u0 <= b["up_to_v"])
        use = "TN" if (system == "TT" and tn_in_tt) else system
        value = table["table_41_1_s"][use][kind][band]
        clause = clauses["tt_with_tn_times"] if use != system else f"{clauses['table']}, {system} system"
        return (np.nan if value is None else float(value)), clause
    return float(table["other_circuits_s"][system]), clauses[f"other_{system}"]


def time_verdicts(time_s: np.ndarray, bound: np.ndarray, limit_s: np.ndarray) -> np.ndarray:
    """Verdict codes of operating times against the maximum times (411.3.2).

    pass where the time is within the limit; where 'at most' data miss it, the time cannot be shown
    either way (not-verified); below the data (no disconnection shown) fail; no limit set: not-verified.
    """
    with np.errstate(invalid="ignore"):
        ok = time_s <= limit_s * (1 + 1e-9)
    verdict = select(
        [~np.isfinite(limit_s), bound == BEYOND_DATA, ok, bound == AT_MOST],
        [verdicts.NOT_VERIFIED, verdicts.FAIL, verdicts.PASS, verdicts.NOT_VERIFIED],
        verdicts.FAIL,
    )
    return verdict.astype(np.int8)
