"""How the circuit's devices answer its earth fault: which time applies, when each device operates.

The overcurrent device is read off its characteristic at the earth fault current (one read per group
of circuits sharing a device); an RCD, where fitted, off its break times. Where the overcurrent
device cannot meet the time and the RCD can, the RCD disconnects (411.4.5 TN, 411.5.3 TT).
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any

import numpy as np

from service.electrical.cables import protective
from service.electrical.circuit_arrays import CircuitColumns
from service.electrical.column_tools import finite_or_none, nan_to
from service.electrical.devices import catalogue, let_through, residual
from service.electrical.devices.catalogue import resolve
from service.electrical.devices.characteristic import BEYOND_DATA, ESTIMATED, bound_names
from service.electrical.devices.limits import max_zs_for_current_ohm
from service.electrical.errors import ElectricalError
from service.electrical.inputs import DeviceSpec
from service.electrical.network.faults import FaultLoop
from service.electrical.results import verdicts
from service.electrical.rules import disconnection

CAUTIONS = {
    "estimated": (
        "A figure rests on an estimated part of the device's curve; a maker's curve (curve_points) removes the "
        "estimate."
    ),
    "class-assumed": (
        "The breaker's energy-limiting class was not given: class 3 was taken, as nearly every breaker on the UK "
        "market is marked (common practice). Confirm the marking (device.energy_limiting_class)."
    ),
    "dc-data": (
        "d.c. circuit: the device's data here are for a.c.; the checks that rest on them need the maker's d.c. "
        "curve (curve_points), and a general-purpose RCD does not respond to smooth d.c."
    ),
}


@dataclass
class FaultEnergy:
    """The overcurrent device at one fault current per circuit: its time and bound, and the energy I^2 t
    (A^2 s) it lets through, with how that was found (:func:`service.electrical.cables.protective.fault_energy_a2s`)."""

    current_a: np.ndarray
    time_s: np.ndarray
    bound: np.ndarray
    energy_a2s: np.ndarray
    method: np.ndarray
    data_basis: np.ndarray  # where the energy is the standard's limit: which (class, gG table)
    class_assumed: np.ndarray  # the energy rests on the default class, not a marking given


def fault_energies(cols: CircuitColumns, currents: Sequence[np.ndarray]) -> list[FaultEnergy]:
    """Read each circuit's overcurrent device at each of ``currents`` (A; NaN where a current is not known):
    one :class:`FaultEnergy` per current array, all read in one pass (the arrays side by side)."""
    n, k = cols.n, len(currents)
    current_a = np.concatenate(currents)
    known = np.isfinite(current_a)
    current = np.where(known, current_a, 1.0)
    t, b = np.empty(n * k), np.empty(n * k, np.int8)
    data, basis = np.full(n * k, np.nan), np.full(n * k, None, dtype=object)
    shifts = n * np.arange(k)[:, None]
    given = np.tile(cols.let_through_a2s, k)
    for (_, energy_class, curve), idx in cols.energy_groups.items():
        dev = cols.devices[idx[0]]
        at = (idx[None, :] + shifts).ravel()
        t[at], b[at] = dev.characteristic.time_codes(current[at])
        data[at], basis[at] = catalogue.let_through(dev, current[at], energy_class)
        if curve is not None:  # the maker's curve where it reaches the current, else the single figure if any
            from_curve = let_through.curve_a2s(curve, current[at])
            given[at] = np.where(np.isnan(from_curve), given[at], from_curve)
    energy, method = protective.fault_energy_a2s(current, t, given, data)
    energy = np.where(known, energy, np.nan)
    method = np.where(known, method, None).astype(object)
    from_data = method == "let-through-data"
    default_class = ~cols.is_fuse & np.array([c is None for c in cols.energy_class], dtype=bool)
    assumed = from_data & np.tile(default_class, k)
    basis = np.where(from_data, basis, None).astype(object)
    columns = (np.where(known, current_a, np.nan), np.where(known, t, np.nan), b, energy, method, basis, assumed)
    return [FaultEnergy(*(col[j * n : (j + 1) * n] for col in columns)) for j in range(k)]


@dataclass
class DeviceResponse:
    """The devices' answer to each circuit's faults (times s, currents A, impedances ohm, bounds as codes)."""

    required_oc_s: np.ndarray  # the maximum time for the overcurrent device (TN times in a bonded TT installation)
    required_oc_basis: np.ndarray
    required_rcd_s: np.ndarray
    required_rcd_basis: np.ndarray
    oc_time_s: np.ndarray
    oc_bound: np.ndarray
    oc_verdict: np.ndarray
    region: np.ndarray
    operating_current_a: np.ndarray  # Ia for the overcurrent device's required time
    operating_bound: np.ndarray
    max_zs_oc_ohm: np.ndarray  # U0 x Cmin / Ia
    rcd_time_s: np.ndarray
    rcd_bound: np.ndarray
    rcd_verdict: np.ndarray
    rcd_limit_ohm: np.ndarray  # 50 V / IΔn, NaN without an RCD
    rcd_loop_ohm: np.ndarray  # what the 50 V rule judges: RA in TT (Zs where RA is not given), Zs in TN
    rcd_credited: np.ndarray  # an RCD that can disconnect this fault (fitted, and not on d.c.)
    by_rcd: np.ndarray  # the RCD disconnects where the overcurrent device cannot
    time_s: np.ndarray
    bound: np.ndarray
    required_s: np.ndarray
    required_basis: np.ndarray
    zs_ohm: np.ndarray
    no_dc_data: np.ndarray  # d.c. with a device whose data are for a.c.
    cpc_far: FaultEnergy  # the overcurrent device at the smallest earth fault (far end)
    cpc_near: FaultEnergy  # at the largest earth fault (origin)
    live_far: FaultEnergy  # at the smallest line-neutral fault (far end)
    live_near: FaultEnergy  # at the largest line-neutral fault (origin)
    cautions: list[tuple[np.ndarray, str]]

    def figures(self) -> dict[str, Any]:
        """The response's figures under the names of the circuit result."""
        with np.errstate(divide="ignore", invalid="ignore"):
            margin = (self.max_zs_oc_ohm - self.zs_ohm) / self.max_zs_oc_ohm * 100.0
        by = np.where(self.by_rcd, "rcd", "overcurrent-device").astype(object)
        return {
            "disconnection_time_s": self.time_s,
            "disconnection_time_bound": bound_names(self.bound),
            "disconnection_region": np.where(self.by_rcd, "residual", self.region),
            "disconnected_by": np.where(self.bound == BEYOND_DATA, None, by),
            "max_disconnection_time_s": self.required_s,
            "max_disconnection_basis": self.required_basis,
            "operating_current_a": self.operating_current_a,
            "operating_current_bound": bound_names(self.operating_bound),
            "max_zs_ohm": self.max_zs_oc_ohm,
            "zs_margin_percent": margin,
            "rcd_max_zs_ohm": self.rcd_limit_ohm,
        }


def _overcurrent(cols: CircuitColumns, i_f: np.ndarray, req_oc: np.ndarray):
    """The overcurrent device at the earth fault current: time, bound, region, and Ia for the required time."""
    n = cols.n
    oc_t, oc_b, ia, ia_b = np.empty(n), np.empty(n, np.int8), np.empty(n), np.empty(n, np.int8)
    region = np.empty(n, dtype=object)
    for idx in cols.device_groups.values():
        dev = cols.devices[idx[0]]
        oc_t[idx], oc_b[idx] = dev.characteristic.time_codes(i_f[idx])
        region[idx] = np.array(dev.region_names(), dtype=object)[dev.region_codes(i_f[idx])]
        ia[idx], ia_b[idx] = dev.characteristic.current_codes(nan_to(req_oc[idx], np.inf))
    return oc_t, oc_b, region, ia, ia_b


def _residual(cols: CircuitColumns, i_f: np.ndarray):
    rcd_t, rcd_b = np.full(cols.n, np.inf), np.full(cols.n, BEYOND_DATA, np.int8)
    for (ma, delay), idx in cols.rcd_groups.items():
        rcd_t[idx], rcd_b[idx] = residual.rcd_characteristic(ma, delay).time_codes(i_f[idx])
    return rcd_t, rcd_b


def device_response(cols: CircuitColumns, loop: FaultLoop) -> DeviceResponse:
    """Times, Ia and max Zs of the overcurrent device, the RCD's times and limit, which one disconnects, and
    the overcurrent device's energies at the smallest and largest earth and line-neutral faults."""
    args = (cols.earthing, cols.u0_v, cols.role, cols.load, cols.rating_a, cols.current_kind)
    req_oc, basis_oc = disconnection.max_disconnection_time_s(*args, cols.tt & cols.bonded, cols.reduced_low_voltage)
    req_rcd, basis_rcd = disconnection.max_disconnection_time_s(*args, False, cols.reduced_low_voltage)
    i_f = loop.earth_fault_a
    oc_t, oc_b, region, ia, ia_b = _overcurrent(cols, i_f, req_oc)
    rcd_t, rcd_b = _residual(cols, i_f)
    no_dc_data = (cols.current_kind == "dc") & cols.standard_device
    credited = cols.has_rcd & (cols.current_kind != "dc")
    ra = np.where(np.isnan(cols.electrode_ohm), loop.zs_ohm, cols.electrode_ohm + nan_to(cols.conductors.r2, 0.0))
    v_oc = disconnection.time_verdicts(oc_t, oc_b, req_oc)
    v_rcd = np.where(credited, disconnection.time_verdicts(rcd_t, rcd_b, req_rcd), verdicts.NOT_VERIFIED)
    by_rcd = credited & (v_oc != verdicts.PASS) & (v_rcd == verdicts.PASS)
    bound = np.where(by_rcd, rcd_b, oc_b)
    faults = (i_f, loop.earth_fault_max_a, loop.line_neutral_min_a, loop.line_neutral_max_a)
    energies = dict(zip(("cpc_far", "cpc_near", "live_far", "live_near"), fault_energies(cols, faults), strict=True))
    estimated = (bound == ESTIMATED) | (ia_b == ESTIMATED) | (energies["live_far"].bound == ESTIMATED)
    assumed = np.any([e.class_assumed for e in energies.values()], axis=0)
    return DeviceResponse(
        required_oc_s=req_oc,
        required_oc_basis=basis_oc,
        required_rcd_s=req_rcd,
        required_rcd_basis=basis_rcd,
        oc_time_s=oc_t,
        oc_bound=oc_b,
        oc_verdict=v_oc,
        region=region,
        operating_current_a=ia,
        operating_bound=ia_b,
        max_zs_oc_ohm=max_zs_for_current_ohm(cols.u0_v, ia),
        rcd_time_s=rcd_t,
        rcd_bound=rcd_b,
        rcd_verdict=v_rcd.astype(np.int8),
        rcd_limit_ohm=np.where(cols.has_rcd, residual.rcd_max_loop_ohm(cols.residual_ma), np.nan),
        rcd_loop_ohm=np.where(cols.tt, ra, loop.zs_ohm),
        rcd_credited=credited,
        by_rcd=by_rcd,
        time_s=np.where(by_rcd, rcd_t, oc_t),
        bound=bound,
        required_s=np.where(by_rcd, req_rcd, req_oc),
        required_basis=np.where(by_rcd, basis_rcd, basis_oc),
        zs_ohm=loop.zs_ohm,
        no_dc_data=no_dc_data,
        **energies,
        cautions=[
            (estimated, CAUTIONS["estimated"]),
            (assumed, CAUTIONS["class-assumed"]),
            (no_dc_data, CAUTIONS["dc-data"]),
        ],
    )


@dataclass
class OperatingTime:
    """The answer to 'how fast does this device operate at this current?' (s), with the RCD's time where fitted."""

    time_s: float | None
    bound: str
    region: str
    rcd_time_s: float | None
    rcd_bound: str | None
    device: dict[str, Any]


def operating_time(spec: DeviceSpec, current_a: float) -> OperatingTime:
    """Maximum operating time of a device at a current, its bound and region; the RCD's break time beside it.

    Errors carry a path below the device (``rating_a``, ``rcd.delay`` ...).
    """
    try:
        dev = resolve(spec)
        rcd = None if spec.rcd is None else residual.rcd_characteristic(spec.rcd.residual_current_ma, spec.rcd.delay)
    except ElectricalError as err:
        raise err.within("device") from None
    t, bound = dev.time_at(current_a)
    rcd_t, rcd_bound = (None, None) if rcd is None else rcd.time_at(current_a)
    return OperatingTime(
        time_s=finite_or_none(t),
        bound=str(bound),
        region=str(dev.region_at(current_a)),
        rcd_time_s=None if rcd_t is None else finite_or_none(rcd_t),
        rcd_bound=None if rcd_bound is None else str(rcd_bound),
        device=dev.summary(),
    )
