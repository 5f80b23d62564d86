"""The site test sheet: per circuit, what a tester must find on site, from the same whole check that
:func:`service.electrical.testing.verification.verify` judges the filled sheet by, so that the two always
agree.

- The largest Zs and R1+R2 to measure at the test temperature: the design's limits scaled by the ratio of
  resistances (1 + 0.004 (theta_t - 20)) / (1 + 0.004 (theta_op - 20)) (BS 7671 Appendix 3 approach); in TN the
  Zs to expect (Ze + R1+R2 at that temperature), and 1.5 times it, above which the cpc is suspect (common practice).
- A ring's expected end-to-end r1, rn and r2 at the test temperature (643.2.1), and the 0.05 ohm tolerance.
- The RCD to test: IΔn, type and the operating times of BS EN 61008-1 / 61009-1 Table 1.
- The insulation test voltage and minimum resistance (Table 64, from memory).
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

from service.electrical.cables.conductors import temperature_multiplier
from service.electrical.circuit_arrays import CircuitFailure
from service.electrical.devices.limits import measured_limit_ohm
from service.electrical.inputs import Circuit, Supply
from service.electrical.pipeline import check_circuits
from service.electrical.results import precision
from service.electrical.results.circuit_result import CircuitResult
from service.electrical.results.shapes import figure
from service.electrical.testing.judges import (
    CONTINUITY_FACTOR,
    insulation_row,
    largest_zs_at,
    operating_c,
    rcd_times_ms,
)
from service.electrical.testing.ring import TOLERANCE_OHM, end_to_end_ohm


@dataclass
class SiteLimits:
    """What a tester must find on site for one circuit, at the test temperature."""

    test_temperature_c: float = figure("the conductor temperature the limits are worked for", nullable=False)
    design_ze_ohm: float = figure(
        "the Ze the design assumed at the circuit's board: a higher reading fails", nullable=False
    )
    expected_zs_ohm: float | None = figure("TN: Ze + the design's R1+R2 at the test temperature, the reading to expect")
    max_zs_ohm: float | None = figure("the largest Zs the design allows, at the test temperature")
    continuity_max_zs_ohm: float | None = figure(
        "TN: 1.5 times the reading to expect; a higher one points to an open or high-resistance cpc (common practice)"
    )
    expected_r1_plus_r2_ohm: float | None = figure("the design's R1+R2 at the test temperature")
    max_r1_plus_r2_ohm: float | None = figure("the largest R1+R2 to measure: Ze + R1+R2 within the maximum Zs")
    ring_r1_ohm: float | None = figure("a ring: the line conductor end to end")
    ring_rn_ohm: float | None = figure("a ring: the neutral end to end")
    ring_r2_ohm: float | None = figure("a ring: the cpc end to end")
    ring_tolerance_ohm: float | None = figure("a ring: how far r1 and rn, and r2 and r1 x the size ratio, may differ")
    rcd_residual_current_ma: float | None = figure("the RCD to test: IΔn")
    rcd_type: str | None = figure("the RCD's type, as stated")
    rcd_max_time_ms_at_idn: float | None = figure("the longest operating time at IΔn")
    rcd_min_time_ms_at_idn: float | None = figure("a time-delayed (S) RCD: the shortest operating time at IΔn")
    rcd_max_time_ms_at_5idn: float | None = figure("the longest operating time at 5 x IΔn")
    insulation_test_voltage_v: float = figure("d.c. test voltage (Table 64, from memory)", nullable=False)
    insulation_min_megohm: float = figure("the least insulation resistance (Table 64, from memory)", nullable=False)
    breaking_capacity_ka: float | None = figure("the largest prospective fault current to measure at the device")


def _limits(design: CircuitResult, supply: Supply, circuit: Circuit, temperature_c: float, voltage: str) -> SiteLimits:
    conductors = circuit.conductors
    op_c = operating_c(circuit)
    ratio = float(temperature_multiplier(temperature_c) / temperature_multiplier(op_c))
    max_zs = design.check("max-zs").limit
    zs = largest_zs_at(design, circuit, temperature_c)
    r1r2 = design.r1_plus_r2_ohm
    expected_zs = None if supply.earthing == "TT" or r1r2 is None else supply.ze_ohm + r1r2 * ratio
    room, _ = measured_limit_ohm(max_zs - supply.ze_ohm, op_c, temperature_c) if max_zs else (None, None)
    ring = end_to_end_ohm(conductors, temperature_c) if conductors is not None and conductors.ring else (None,) * 3
    rcd, row = circuit.device.rcd, insulation_row(voltage)
    times = (rcd_times_ms(rcd.delay, 0), rcd_times_ms(rcd.delay, 2)) if rcd is not None else None
    breaking = design.check("breaking-capacity")
    figures = {
        "design_ze_ohm": supply.ze_ohm,
        "expected_zs_ohm": expected_zs,
        # the continuity judge's ceiling (testing.judges.judge_zs_continuity)
        "continuity_max_zs_ohm": None if expected_zs is None else CONTINUITY_FACTOR * expected_zs,
        "max_zs_ohm": zs,
        "expected_r1_plus_r2_ohm": None if r1r2 is None else r1r2 * ratio,
        "max_r1_plus_r2_ohm": None if room is None else float(room),
        "ring_r1_ohm": ring[0],
        "ring_rn_ohm": ring[1],
        "ring_r2_ohm": ring[2],
        "rcd_max_time_ms_at_idn": times and times[0][0],
        "rcd_min_time_ms_at_idn": times and times[0][1],
        "rcd_max_time_ms_at_5idn": times and times[1][0],
        "breaking_capacity_ka": None if breaking is None else breaking.limit,
    }
    return SiteLimits(
        test_temperature_c=temperature_c,
        ring_tolerance_ohm=TOLERANCE_OHM if ring[0] is not None else None,
        rcd_residual_current_ma=None if rcd is None else rcd.residual_current_ma,
        rcd_type=None if rcd is None else rcd.type,
        insulation_test_voltage_v=row["test_voltage_v"],
        insulation_min_megohm=row["minimum_megohm"],
        **precision.rounded_record(figures),
    )


def site_limits(
    supply: Supply | Sequence[Supply],
    circuits: Sequence[Circuit],
    temperature_c: float = 20.0,
    circuit_voltage: str = "up-to-500v",
) -> list[SiteLimits | CircuitFailure]:
    """Each circuit's limits on site at ``temperature_c`` (a failure where the circuit cannot be checked)."""
    supplies = [supply] * len(circuits) if isinstance(supply, Supply) else list(supply)
    designs = check_circuits(supplies, list(circuits), exact=True)
    return [
        design if isinstance(design, CircuitFailure) else _limits(design, on, circuit, temperature_c, circuit_voltage)
        for design, on, circuit in zip(designs, supplies, circuits, strict=True)
    ]
