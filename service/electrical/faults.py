"""Earth fault loop impedance and fault currents (IEC 60909-0 voltage factors; BS 7671:2018 411.4.4, 411.5.4, 434.1)."""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING, Any

import numpy as np

from .arrays import as_float, groups, scalar_io
from .conductors import conductor_columns
from .datafiles import core_table
from .errors import ElectricalError, InvalidInput
from .model import Conductors, Supply

if TYPE_CHECKING:
    from .columns import CircuitColumns


def c_min() -> float:
    """Minimum voltage factor, IEC 60909-0 Table 1 (0.95 at low voltage)."""
    return float(core_table("voltage_factors")["c_min"])


def c_max_default() -> float:
    """cmax used when none is given: 1.10 (IEC 60909-0 Table 1, systems with a +10 % tolerance)."""
    return float(core_table("voltage_factors")["c_max_default"])


def c_max_options() -> list[float]:
    return [float(c) for c in core_table("voltage_factors")["c_max_options"]]


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


@scalar_io
def prospective_fault_current_ka(
    u0_v: Any, ze_ohm: Any, stated_ka: Any = None, c_max: float | None = None
) -> np.ndarray:
    """Largest prospective fault current at the origin, kA, for the breaking-capacity check.

    A stated value (from the distributor or a measurement) is used where given (NaN marks 'not
    stated' in an array); otherwise U0 x cmax / Ze with cmax 1.10 (or 1.05) from IEC 60909-0
    Table 1. BS 7671 434.1 asks for the larger of the line-neutral and line-earth values.
    """
    factor = c_max_default() if c_max is None else float(c_max)
    if factor not in c_max_options():
        raise InvalidInput("c_max", f"cmax is one of {c_max_options()} (IEC 60909-0 Table 1)")
    calculated = factor * as_float(u0_v) / as_float(ze_ohm) / 1000.0
    if stated_ka is None:
        return calculated
    stated = np.broadcast_to(as_float(stated_ka), calculated.shape)
    return np.where(np.isnan(stated), calculated, stated)


PFC_STATED = "stated in the request"
PFC_FROM_ZE = "U0 x cmax / Ze with cmax {c_max:g} (IEC 60909-0 Table 1)"
CAUTION_PFC_FROM_ZE = (
    "Prospective fault current calculated from Ze; the line-neutral (or three-phase) value may be higher: "
    "state the larger one."
)


@dataclass
class FaultLoop:
    """The earth fault loop of N circuits and the fault currents that follow from it.

    ``r1r2_ohm``: R1+R2 at the temperatures the rules assume (given, or from the conductors);
    ``zs_ohm`` = Ze + (R1+R2); ``earth_fault_a`` = U0 x Cmin / Zs; ``earth_fault_nominal_a`` = U0 / Zs;
    ``pfc_ka``: the largest prospective fault current at the origin, with its basis.
    """

    r1r2_ohm: np.ndarray
    zs_ohm: np.ndarray
    earth_fault_a: np.ndarray
    earth_fault_nominal_a: np.ndarray
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
        }


def fault_loop(cols: CircuitColumns) -> FaultLoop:
    """Zs, the earth fault currents and the prospective fault current for every circuit (411.4.4, 411.5.4, 434.1)."""
    c = cols.conductors
    r1r2 = np.where(np.isnan(cols.r1r2_given_ohm), c.r1 + c.r2, cols.r1r2_given_ohm)
    zs = cols.ze_ohm + r1r2
    i_nom = cols.u0_v / zs
    pfc = np.empty(cols.n)
    for key, idx in groups(cols.c_max).items():
        pfc[idx] = prospective_fault_current_ka(cols.u0_v[idx], cols.ze_ohm[idx], cols.pfc_stated_ka[idx], key)
    stated = ~np.isnan(cols.pfc_stated_ka)
    default = c_max_default()
    basis = [
        PFC_STATED if s else PFC_FROM_ZE.format(c_max=cm or default)
        for s, cm in zip(stated.tolist(), cols.c_max, strict=True)
    ]
    return FaultLoop(
        r1r2_ohm=r1r2,
        zs_ohm=zs,
        earth_fault_a=c_min() * i_nom,
        earth_fault_nominal_a=i_nom,
        pfc_ka=pfc,
        pfc_basis=basis,
        cautions=[(~stated, CAUTION_PFC_FROM_ZE)],
    )


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
        pfc = prospective_fault_current_ka(
            supply.u0_v, supply.ze_ohm, supply.prospective_fault_current_ka, supply.c_max
        )
    if u0_v is None or zs_ohm is None:
        raise InvalidInput("zs_ohm", "give u0_v and zs_ohm, or a supply and conductors")
    return FaultFigures(
        zs_ohm=float(zs_ohm),
        r1_plus_r2_ohm=r1r2,
        earth_fault_current_a=earth_fault_current_a(u0_v, zs_ohm),
        earth_fault_current_nominal_a=earth_fault_current_a(u0_v, zs_ohm, voltage_factor=1.0),
        prospective_fault_current_ka=pfc,
    )
