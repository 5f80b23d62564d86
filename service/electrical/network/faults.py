"""Earth fault loop impedance and fault currents (IEC 60909-0 voltage factors; BS 7671:2018 411.4.4, 411.5.4, 434.1)."""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING, Any

import numpy as np

from service.electrical.cables.conductors import conductor_columns
from service.electrical.column_tools import as_float, finite_or_none, scalar_io, select
from service.electrical.errors import ElectricalError, InvalidInput
from service.electrical.inputs import Conductors, Supply
from service.electrical.network.voltage_factors import c_max_default, c_min, check_c_max

if TYPE_CHECKING:
    from service.electrical.circuit_arrays import CircuitColumns


@scalar_io
def loop_impedance_ohm(ze_ohm: Any, r1_plus_r2_ohm: Any) -> np.ndarray:
    """Earth fault loop impedance Zs = Ze + (R1+R2), ohm (BS 7671 411.4.4 / 411.5.4).

    For a TT supply ``ze_ohm`` is the whole external part of the loop, including the
    installation's earth electrode resistance RA.
    """
    return as_float(ze_ohm) + as_float(r1_plus_r2_ohm)


@scalar_io
def earth_fault_current_a(u0_v: Any, zs_ohm: Any, voltage_factor: float | None = None) -> np.ndarray:
    """Earth fault current If = U0 x Cmin / Zs, A.

    Cmin = 0.95 (IEC 60909-0 Table 1), the factor BS 7671:2018 builds into its maximum Zs
    tables. Pass ``voltage_factor=1`` for the nominal U0 / Zs.
    """
    factor = c_min() if voltage_factor is None else float(voltage_factor)
    zs = as_float(zs_ohm)
    if np.any(zs <= 0):
        raise InvalidInput("zs_ohm", "the loop impedance must be greater than zero")
    return factor * as_float(u0_v) / zs


BASES = {
    "stated": "stated in the request",
    "line-neutral": "U0 x cmax / Zpn, cmax {c_max:g} (IEC 60909-0 Table 1), from the line-neutral loop given",
    "line-earth": "U0 x cmax / Ze, cmax {c_max:g} (IEC 60909-0 Table 1), the line-earth value",
    "unknown-tt": "not known: in TT, Ze holds the electrode, so the short-circuit current cannot follow from it",
    "zpn-given": "the line-neutral loop given",
    "zpn-from-pfc": "U0 / the stated prospective fault current",
    "zpn-from-ze": "Ze taken for the line-neutral loop (TN)",
    "board-faults": "carried down to board {board} from the origin: cmax, conductors at 20 degC, the feeds' impedances "
    "summed from the origin and added to the supply's at the least modulus its angle allows (never underestimated); "
    "the larger of line-neutral and line-earth (a single-pole device sees no three-phase fault; a three-phase circuit "
    "takes the three-phase value where it is larger)",
    "board-loop": "carried down to board {board}: the origin's loop plus each feed's R1+Rn, hot (never underestimated)",
}
CAUTIONS = {
    "pfc-from-ze": (
        "Prospective fault current calculated from Ze; the line-neutral (or three-phase) value may be higher: "
        "state the larger one."
    ),
    "zpn-from-pfc": (
        "The line-neutral loop was taken as U0 / the stated prospective fault current. If that is a declared "
        "maximum rather than a measurement, the real loop is higher and the smallest short-circuit current lower: "
        "state line_neutral_loop_ohm."
    ),
    "zpn-from-ze": (
        "The line-neutral loop at the origin was taken as Ze (TN: on the safe side where the neutral path is no "
        "worse than the earth path): state line_neutral_loop_ohm."
    ),
    "ik3-twice": (
        "The symmetrical three-phase fault current was taken as twice the line-neutral value (common practice for a "
        "typical supply): state supply.three_phase_fault_current_ka."
    ),
}


@dataclass
class FaultLoop:
    """The fault loops of N circuits and the fault currents that follow from them (A, ohm, kA).

    ``r1r2_ohm``: R1+R2 at the temperatures the rules assume (given, or from the conductors);
    ``zs_ohm`` = Ze + (R1+R2); ``earth_fault_a`` = U0 x Cmin / Zs (the smallest, at the far end);
    ``earth_fault_nominal_a`` = U0 / Zs; ``earth_fault_max_a`` = U0 x cmax / Ze (the largest, at the origin);
    ``zpn_ohm``: the line-neutral loop at the origin (NaN where it cannot be known);
    ``line_neutral_min_a`` = U0 x Cmin / (Zpn + R1 + Rn), conductors hot, at the far end (never overestimated);
    ``line_neutral_max_a``: the largest line-neutral current at the origin (never underestimated);
    ``pfc_ka``: the larger of line-neutral and line-earth at the origin (434.1), with its basis; for a
    three-phase circuit the symmetrical three-phase value ``three_phase_a`` where it is larger.
    """

    r1r2_ohm: np.ndarray
    zs_ohm: np.ndarray
    earth_fault_a: np.ndarray
    earth_fault_nominal_a: np.ndarray
    earth_fault_max_a: np.ndarray
    zpn_ohm: np.ndarray
    zpn_basis: np.ndarray
    line_neutral_min_a: np.ndarray
    line_neutral_max_a: np.ndarray
    three_phase_a: np.ndarray
    pfc_ka: np.ndarray
    pfc_basis: list[str]
    cautions: list[tuple[np.ndarray, str]]

    def figures(self) -> dict[str, Any]:
        """The loop's figures under the names of the circuit result."""
        return {
            "r1_plus_r2_ohm": self.r1r2_ohm,
            "zs_ohm": self.zs_ohm,
            "earth_fault_current_a": self.earth_fault_a,
            "earth_fault_current_nominal_a": self.earth_fault_nominal_a,
            "prospective_fault_current_ka": self.pfc_ka,
            "prospective_fault_current_basis": self.pfc_basis,
            "line_neutral_loop_ohm": self.zpn_ohm,
            "min_short_circuit_current_a": self.line_neutral_min_a,
            "three_phase_fault_current_ka": self.three_phase_a / 1000.0,
        }


def _c_max(cols: CircuitColumns) -> np.ndarray:
    default = c_max_default()
    for value in set(cols.c_max):
        if value is not None:
            check_c_max(value)
    return np.array([default if c is None else c for c in cols.c_max], dtype=float)


def line_neutral_origin(
    line_neutral_loop_ohm: np.ndarray, pfc_stated_ka: np.ndarray, u0_v: np.ndarray, ze_ohm: np.ndarray, tt: np.ndarray
) -> tuple[np.ndarray, np.ndarray]:
    """Zpn at the origin for the smallest fault: given, else U0 / stated PFC, else Ze in TN; NaN in TT otherwise.

    Returns the loop (ohm) and the key of its basis in ``BASES`` (None where it is not known).
    """
    given = ~np.isnan(line_neutral_loop_ohm)
    stated = ~np.isnan(pfc_stated_ka)
    with np.errstate(divide="ignore", invalid="ignore"):
        from_pfc = u0_v / (pfc_stated_ka * 1000.0)
    zpn = select([given, stated, ~tt], [line_neutral_loop_ohm, from_pfc, ze_ohm], np.nan)
    key = select([given, stated, ~tt], ["zpn-given", "zpn-from-pfc", "zpn-from-ze"], None)
    return zpn, key.astype(object)


def _bases(keys: np.ndarray, boards: np.ndarray, c_max: np.ndarray) -> list[str | None]:
    """The basis text of each key; at a board of an installation, given values are the ones carried down to it."""
    carried = {"stated": "board-faults", "zpn-given": "board-loop"}
    return [
        None if key is None else BASES[carried.get(key, key) if board is not None else key].format(c_max=c, board=board)
        for key, board, c in zip(keys.tolist(), boards.tolist(), c_max.tolist(), strict=True)
    ]


def prospective_fault_current_ka(u0_v: Any, ze_ohm: Any, tt: Any, stated_ka: Any, zpn_ohm: Any, c_max: Any):
    """The largest prospective fault current at the origin, kA: the larger of line-neutral and line-earth (434.1).

    Candidates: the stated value; U0 x cmax / Zpn where the line-neutral loop is given; U0 x cmax / Ze
    (line-earth) except in TT, where Ze holds the electrode and says nothing of the short circuit. NaN where
    none is known. Returns ``(kA, basis key, known)``, ``known`` the (3, N) mask of which candidates were there.
    """
    u0, ze = as_float(u0_v), as_float(ze_ohm)
    shape = u0.shape
    c = np.broadcast_to(as_float(c_max), shape)
    with np.errstate(divide="ignore", invalid="ignore"):
        from_zpn = c * u0 / np.broadcast_to(as_float(zpn_ohm), shape)  # NaN where no loop is given
        line_earth = np.where(np.broadcast_to(np.asarray(tt, dtype=bool), shape), np.nan, c * u0 / ze)
    candidates = np.vstack([np.broadcast_to(as_float(stated_ka), shape) * 1000.0, from_zpn, line_earth])
    known = ~np.isnan(candidates)
    filled = np.where(known, candidates, -np.inf)
    largest = np.where(known.any(axis=0), filled.max(axis=0), np.nan)
    names = np.array(["stated", "line-neutral", "line-earth"], dtype=object)[filled.argmax(axis=0)]
    names = np.where(known.any(axis=0), names, "unknown-tt")
    return largest / 1000.0, names.astype(object), known


def three_phase_a(
    three_phase_ka: np.ndarray, supply_phases: np.ndarray, line_neutral_max_a: np.ndarray
) -> tuple[np.ndarray, np.ndarray]:
    """Ik3 at the circuit's origin, A: stated, else (a three-phase supply) twice the line-neutral value (common
    practice), else NaN; and where the rule of thumb was used."""
    stated = three_phase_ka * 1000.0
    twice = (supply_phases == 3) & np.isnan(stated) & np.isfinite(line_neutral_max_a)
    return np.where(twice, 2.0 * line_neutral_max_a, stated), twice


def fault_loop(cols: CircuitColumns) -> FaultLoop:
    """Zs, the earth fault currents, the line-neutral loop and currents, and the prospective fault current.

    BS 7671:2018 411.4.4 / 411.5.4 (Zs), 434.1 (the larger of line-neutral and line-earth; for a three-phase
    circuit the three-phase value), 434.5.2 (the smallest short-circuit current at the far end: line-neutral,
    on the safe side for a three-phase circuit too); IEC 60909-0 voltage factors: Cmin for the smallest
    currents, cmax for the largest.
    """
    c = cols.conductors
    c_max = _c_max(cols)
    r1r2 = np.where(np.isnan(cols.r1r2_given_ohm), c.r1 + c.r2, cols.r1r2_given_ohm)
    zs = cols.ze_ohm + r1r2
    i_nom = cols.u0_v / zs
    ef_max = np.where(
        np.isnan(cols.earth_fault_max_ka), c_max * cols.u0_v / cols.ze_ohm, cols.earth_fault_max_ka * 1000
    )
    zpn, zpn_key = line_neutral_origin(cols.line_neutral_loop_ohm, cols.pfc_stated_ka, cols.u0_v, cols.ze_ohm, cols.tt)
    pfc, pfc_key, known = prospective_fault_current_ka(
        cols.u0_v, cols.ze_ohm, cols.tt, cols.pfc_stated_ka, cols.line_neutral_loop_ohm, c_max
    )
    ik3, twice = three_phase_a(cols.three_phase_ka, cols.supply_phases, pfc * 1000.0)
    three = (cols.phases == 3) & np.isfinite(ik3)
    pfc = np.where(three, np.fmax(pfc, ik3 / 1000.0), pfc)
    only_ze = ~known[0] & ~known[1] & known[2]
    return FaultLoop(
        r1r2_ohm=r1r2,
        zs_ohm=zs,
        earth_fault_a=c_min() * i_nom,
        earth_fault_nominal_a=i_nom,
        earth_fault_max_a=ef_max,
        zpn_ohm=zpn,
        zpn_basis=np.array(_bases(zpn_key, cols.board, c_max), dtype=object),
        line_neutral_min_a=c_min() * cols.u0_v / (zpn + c.r1 + c.rn),
        line_neutral_max_a=pfc * 1000.0,
        three_phase_a=ik3,
        pfc_ka=pfc,
        pfc_basis=_bases(pfc_key, cols.board, c_max),
        cautions=[
            (only_ze, CAUTIONS["pfc-from-ze"]),
            (np.isnan(cols.line_neutral_loop_ohm) & ~np.isnan(cols.pfc_stated_ka), CAUTIONS["zpn-from-pfc"]),
            (np.isnan(cols.line_neutral_loop_ohm) & np.isnan(cols.pfc_stated_ka) & ~cols.tt, CAUTIONS["zpn-from-ze"]),
            (twice & (cols.phases == 3), CAUTIONS["ik3-twice"]),
        ],
    )


def origin_fault_level_ka(supply: Supply) -> float | None:
    """:func:`prospective_fault_current_ka` of one supply (None where it cannot be known)."""
    c_max = c_max_default() if supply.c_max is None else supply.c_max
    check_c_max(c_max)
    nan = np.nan
    stated = nan if supply.prospective_fault_current_ka is None else supply.prospective_fault_current_ka
    zpn = nan if supply.line_neutral_loop_ohm is None else supply.line_neutral_loop_ohm
    ka, _, _ = prospective_fault_current_ka(supply.u0_v, supply.ze_ohm, supply.earthing == "TT", stated, zpn, c_max)
    return finite_or_none(ka[0])


FAULT_CURRENT_BASIS = (
    "Zs = Ze + (R1+R2); If = U0 x Cmin / Zs with Cmin 0.95 (IEC 60909-0 Table 1; BS 7671:2018 411.4.4)"
)


@dataclass
class FaultFigures:
    """The answer to 'what earth fault current flows?': Zs, R1+R2 (where worked out), If, U0 / Zs, the PFC."""

    zs_ohm: float
    r1_plus_r2_ohm: float | None
    earth_fault_current_a: float
    earth_fault_current_nominal_a: float
    prospective_fault_current_ka: float | None
    basis: str = FAULT_CURRENT_BASIS


def fault_current(
    u0_v: float | None = None,
    zs_ohm: float | None = None,
    supply: Supply | None = None,
    conductors: Conductors | None = None,
) -> FaultFigures:
    """If from U0 and Zs, or from a supply and conductors (Zs = Ze + R1+R2 at the temperatures the rules assume).

    Errors about the conductors carry a path below ``conductors``.
    """
    r1r2 = pfc = None
    if supply is not None and conductors is not None:
        try:
            cols = conductor_columns([conductors])
        except ElectricalError as err:
            raise err.within("conductors") from None
        r1r2 = float(cols.r1[0] + cols.r2[0])
        u0_v, zs_ohm = supply.u0_v, supply.ze_ohm + r1r2
        pfc = origin_fault_level_ka(supply)
    if u0_v is None or zs_ohm is None:
        raise InvalidInput("zs_ohm", "give u0_v and zs_ohm, or a supply and conductors")
    return FaultFigures(
        zs_ohm=float(zs_ohm),
        r1_plus_r2_ohm=r1r2,
        earth_fault_current_a=earth_fault_current_a(u0_v, zs_ohm),
        earth_fault_current_nominal_a=earth_fault_current_a(u0_v, zs_ohm, voltage_factor=1.0),
        prospective_fault_current_ka=pfc,
    )
