"""Measured test results against the design limits (BS 7671 Appendix 3 approach, Table 64, BS EN 61008-1 Table 1).

Invented demo scenario: Larkspur Bakery's shop ring and oven radial.
"""

import dataclasses

import pytest

from service.electrical.circuit_arrays import CircuitFailure
from service.electrical.inputs import Circuit, Conductors, DeviceSpec, Rcd
from service.electrical.testing.verification import Measured, verify
from tests.electrical.pipeline import BAKERY

OVEN = Circuit(
    id="oven",
    role="final",
    load="fixed-equipment",
    device=DeviceSpec(rating_a=32, standard="BS EN 60898", type="B", breaking_capacity_ka=6),
    conductors=Conductors("copper", "thermoplastic-70", 6, 2.5, 18),
)
RING = Circuit(
    id="ring",
    role="final",
    load="socket-outlets",
    device=DeviceSpec(rating_a=32, standard="BS EN 61009", type="B", breaking_capacity_ka=6, rcd=Rcd(30, type="A")),
    conductors=Conductors("copper", "thermoplastic-70", 2.5, 1.5, 64, ring=True),
)


def judged(result):
    return {j.test: j for j in result.judgements}


def test_zs_measured_cold_against_the_scaled_limit():
    # max Zs B32 = 0.95 x 230 / 160 = 1.3656 ohm at 70 degC; measured at 15 degC: x (1 + 0.004 (15 - 20)) / 1.20
    # = 1.3656 x 0.98 / 1.2 = 1.1152 ohm; 1.2 ohm measured fails; the 0.8 rule (common practice) 1.0925 beside it
    (out,) = verify(BAKERY, [(OVEN, Measured(temperature_c=15, zs_ohm=1.2))])
    zs = judged(out)["zs"]
    assert zs.limit == pytest.approx(1.365625 * 0.98 / 1.2, abs=1e-4)
    assert zs.rule_of_thumb_limit == pytest.approx(1.365625 * 0.8, abs=1e-4)
    assert zs.verdict == "fail" and out.verdict == "fail"


def test_r1_plus_r2_corrected_to_operating_temperature():
    # 0.30 ohm at 20 degC -> 0.36 ohm at 70 degC; + Ze 0.28 = 0.64 ohm <= 1.3656 ohm
    (out,) = verify(BAKERY, [(OVEN, Measured(r1_plus_r2_ohm=0.30))])
    r = judged(out)["r1-plus-r2"]
    assert r.corrected_value == pytest.approx(0.36, abs=1e-4) and r.verdict == "pass"


def test_rcd_times_insulation_and_polarity():
    # BS EN 61008-1 / 61009-1 Table 1: general 300 ms at IΔn, 40 ms at 5 IΔn; Table 64 (from memory) 1 megohm at 500 V
    m = Measured(
        rcd_time_ms_at_idn=22,
        rcd_time_ms_at_5idn=12,
        insulation_resistance_megohm=200,
        insulation_test_voltage_v=500,
        polarity_confirmed=True,
    )
    (out,) = verify(BAKERY, [(RING, m)])
    j = judged(out)
    assert j["rcd-time-idn"].limit == 300 and j["rcd-time-5idn"].limit == 40
    assert j["insulation-resistance"].verdict == "pass" and j["polarity"].verdict == "pass" and out.verdict == "pass"
    assert any("Table 64" in c for c in out.cautions)


def test_the_rcd_the_rules_call_for_is_judged_from_the_same_rules():
    # BS 7671 411.3.3: socket-outlets up to 32 A need a 30 mA RCD; 531.3.3: of a type that suits the load
    m = Measured(polarity_confirmed=True)
    (fitted,) = verify(BAKERY, [(RING, m)])
    assert judged(fitted)["additional-protection"].verdict == "pass" and judged(fitted)["rcd-type"].verdict == "pass"
    plain = dataclasses.replace(RING, device=DeviceSpec(rating_a=32, standard="BS EN 60898", type="B"))
    (bare,) = verify(BAKERY, [(plain, m)])
    assert judged(bare)["additional-protection"].verdict == "fail" and bare.verdict == "fail"
    untyped = dataclasses.replace(RING, device=dataclasses.replace(RING.device, rcd=Rcd(30)))
    (open_,) = verify(BAKERY, [(untyped, m)])
    assert judged(open_)["rcd-type"].verdict == "not-verified" and "device.rcd.type" in judged(open_)["rcd-type"].note


def test_an_rcd_time_on_a_circuit_without_an_rcd_names_the_measurement():
    (out,) = verify(BAKERY, [(OVEN, Measured(rcd_time_ms_at_idn=20))])
    assert isinstance(out, CircuitFailure) and out.path == ("measured", "rcd_time_ms_at_idn")
    (out,) = verify(BAKERY, [(OVEN, Measured())])
    assert isinstance(out, CircuitFailure) and out.path == ("measured",)


def test_a_tn_loop_far_above_the_conductors_fails_as_a_probable_open_cpc():
    # TN ring on an RCBO: a 900 ohm reading is within the RCD's 50 V / 30 mA = 1667 ohm (Table 41.5), but the
    # design's loop at 20 degC is 0.28 + 0.374592 / 1.2 = 0.5922 ohm: 1.5 times that (common practice) is the
    # most a sound metallic loop gives; 900 ohm means a broken or high-resistance cpc. Above 200 ohm the reading
    # may not be stable either (note to BS 7671:2018 Table 41.5).
    (out,) = verify(BAKERY, [(RING, Measured(zs_ohm=900))])
    j = judged(out)
    assert j["zs-continuity"].verdict == "fail"
    assert j["zs-continuity"].limit == pytest.approx(1.5 * (0.28 + 0.374592 / 1.2), abs=1e-3)
    assert "200 ohm" in j["zs"].note and out.verdict == "fail"
    (sound,) = verify(BAKERY, [(RING, Measured(zs_ohm=0.62))])
    assert judged(sound)["zs-continuity"].verdict == "pass"


def test_measured_ze_and_fault_level():
    # the design assumed Ze 0.28 ohm: 0.31 measured fails (411.4.4), 0.25 passes
    (high,) = verify(BAKERY, [(OVEN, Measured(ze_ohm=0.31))])
    (low,) = verify(BAKERY, [(OVEN, Measured(ze_ohm=0.25))])
    assert judged(high)["ze"].verdict == "fail" and judged(low)["ze"].verdict == "pass"
    # 434.5.1: 6 kA measured on a 6 kA breaker passes, 7.2 kA fails
    (ok,) = verify(BAKERY, [(OVEN, Measured(prospective_fault_current_ka=6.0))])
    (over,) = verify(BAKERY, [(OVEN, Measured(prospective_fault_current_ka=7.2))])
    assert judged(ok)["fault-level"].verdict == "pass" and judged(over)["fault-level"].limit == 6


def test_ring_continuity_readings():
    # 64 m ring of 2.5/1.5 mm2 at 20 degC: r1 = rn = 7.41 x 0.064 = 0.474 ohm, r2 = 12.1 x 0.064 = 0.774 ohm;
    # r1 x 2.5 / 1.5 = 0.790 (within 0.05: common practice); (0.474 + 0.774) / 4 = 0.312 ohm at the sockets
    good = Measured(ring_r1_ohm=0.474, ring_rn_ohm=0.48, ring_r2_ohm=0.774, r1_plus_r2_ohm=0.32)
    (out,) = verify(BAKERY, [(RING, good)])
    j = judged(out)
    assert [j[t].verdict for t in ("ring-r1-rn", "ring-r2", "ring-r1-plus-r2")] == ["pass"] * 3
    # each rule judged on its difference against the 0.05 ohm it allows: |0.774 - 0.790|, |0.32 - 0.312|
    assert j["ring-r2"].measured == pytest.approx(0.016) and j["ring-r2"].limit == 0.05
    assert j["ring-r1-plus-r2"].measured == pytest.approx(0.008) and "0.312" in j["ring-r1-plus-r2"].note
    # a broken neutral leg reads high end to end
    (broken,) = verify(BAKERY, [(RING, Measured(ring_r1_ohm=0.474, ring_rn_ohm=0.61))])
    assert judged(broken)["ring-r1-rn"].verdict == "fail"
    (radial,) = verify(BAKERY, [(OVEN, Measured(ring_r1_ohm=0.2))])
    assert isinstance(radial, CircuitFailure) and radial.path == ("measured", "ring_r1_ohm")


def test_rcd_at_half_its_residual_current_must_not_trip():
    (held,) = verify(BAKERY, [(RING, Measured(rcd_tripped_at_half_idn=False))])
    (tripped,) = verify(BAKERY, [(RING, Measured(rcd_tripped_at_half_idn=True))])
    assert judged(held)["rcd-half-idn"].verdict == "pass" and judged(tripped)["rcd-half-idn"].verdict == "fail"


def test_a_ring_in_parallel_cables_is_refused():
    both = Circuit(
        id="odd", role="final", load="socket-outlets", device=RING.device,
        conductors=Conductors("copper", "thermoplastic-70", 2.5, 1.5, 64, ring=True, parallel_cables=2),
    )  # fmt: skip
    (out,) = verify(BAKERY, [(both, Measured(zs_ohm=0.5))])
    assert isinstance(out, CircuitFailure) and out.path == ("circuit", "conductors", "parallel_cables")
