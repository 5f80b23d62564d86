"""Sizing the arrangements designers use: 70 degC singles in trunking, an armoured sub-main with its armour as
the cpc, a buried cable with its real grouping, a ring final, cables in parallel.

Invented demo scenario: a three-phase print works (Ze 0.25 ohm, 4 kA). Hand calculations beside each check;
tables as named (cells from memory are marked M in their data files).
"""

import pytest

from service.electrical.cables.sizing import Demand, size_circuit
from service.electrical.errors import InvalidInput
from service.electrical.inputs import CableRun, DeviceSpec, Rcd, Supply

WORKS = Supply("TN-C-S", 230, 0.25, prospective_fault_current_ka=4.0, phases=3)
B = DeviceSpec(rating_a=1, standard="BS EN 60898", type="B", breaking_capacity_ka=10)
GG = DeviceSpec(rating_a=1, standard="BS 88-2", type="gG")


def rows(result):
    return [(t.line_csa_mm2, t.ruled_out_by) for t in result.tried]


def test_70c_singles_in_trunking():
    # Ib 40 A on B40, two circuits in trunking (Table 4C1 0.80): 6 mm2 Table 4D1A method B 41 A x 0.8 = 32.8 A < 40
    r = size_circuit(WORKS, Demand(length_m=20, design_current_a=40, load="fixed-equipment"),
                     CableRun("single-core-70c", "B", grouped_circuits=2), B)  # fmt: skip
    assert r.tried[4].line_csa_mm2 == 6 and r.tried[4].limit == pytest.approx(32.8)
    # 10 mm2: below 0.1 s a B40 (no energy class above 32 A) is taken at I^2 x 0.1 s = 1.6e6 A2s > 115^2 x 10^2
    assert rows(r)[-1] == (10, "short-circuit")
    # 16 mm2: 76 A x 0.8 = 60.8 A; R1+R2 = 2 x 1.15 x 1.2 x 20 / 1000 = 0.0552 ohm (Table 54.7: a 16 mm2 cpc)
    s = r.selected
    assert (s["line_csa_mm2"], s["cpc_csa_mm2"]) == (16, 16) and s["capacity"].iz_a == pytest.approx(60.8)
    assert s["check"].r1_plus_r2_ohm == pytest.approx(0.0552, abs=1e-4)


def test_an_armoured_sub_main_with_its_armour_as_the_cpc():
    # 85 A three-phase on gG 100 A, 60 m clipped: 16 mm2 4E4A 3/4-core 94 A < 100 A; 35 mm2 4-core: armour 78 mm2
    # (data/armour_resistance.json, M), 0.138 / 78 x 1.1 = 1.946 mohm/m at 20 degC
    demand = Demand(length_m=60, design_current_a=85, phases=3, role="distribution", cpc="armour", cores=4)
    r = size_circuit(WORKS, demand, CableRun("multicore-armoured-90c", "C"), GG)
    s = r.selected
    assert r.device["rating_a"] == 100 and (s["line_csa_mm2"], s["cpc_csa_mm2"], s["cpc"]) == (35, 78, "armour")
    # R1 = 0.524 x 1.28 x 0.06 = 0.04024; R2 (armour at 80 degC, Table 54.4) = 1.946 x 1.24 x 0.06 = 0.1448
    assert s["check"].r1_plus_r2_ohm == pytest.approx(0.524 * 1.28 * 0.06 + 0.138 / 78 * 1.1 * 1.24 * 60, abs=1e-3)
    assert rows(r)[-1] == (25, "disconnection-time") and any("armour as the cpc" in c for c in r.cautions)
    with pytest.raises(InvalidInput) as err:
        size_circuit(WORKS, Demand(length_m=60, design_current_a=85, phases=3, role="distribution", cpc="armour"),
                     CableRun("multicore-armoured-90c", "C"), GG)  # fmt: skip
    assert err.value.path == ("cores",)


def test_a_buried_cable_with_its_real_grouping():
    # three circuits touching in the ground, Table 4C2 0.65 (from memory; Table 4C1 would give 0.70):
    # 16 mm2 4E4A D 3/4-core 75 A x 0.65 = 48.75 A < In 50 A; 25 mm2 96 A x 0.65 = 62.4 A
    run = CableRun(
        "multicore-armoured-90c", "D", grouping="buried-direct", grouped_circuits=3, buried_spacing="touching"
    )
    r = size_circuit(WORKS, Demand(length_m=40, design_current_a=50, phases=3, role="distribution"), run, GG)
    assert rows(r)[-1] == (16, "capacity") and r.tried[-1].limit == pytest.approx(48.8)
    assert r.selected["line_csa_mm2"] == 25 and r.selected["capacity"].iz_a == pytest.approx(62.4)
    assert "4C2" in r.selected["capacity"].factors["grouping"]["basis"]


def test_a_ring_final():
    # 26 A of sockets on a 60 m ring, RCBO: the ring rule takes a 32 A device (433.1.204); 2.5/1.5 mm2 clipped
    # Iz 27 A >= 20 A; R1+R2 = (7.41 + 12.1) x 1.2 x 60 / 4 / 1000 = 0.3512 ohm (the loop at the mid-point)
    ring = Demand(length_m=60, design_current_a=26, load="socket-outlets", ring=True)
    rcbo = DeviceSpec(rating_a=1, standard="BS EN 61009", type="B", breaking_capacity_ka=6, rcd=Rcd(30))
    r = size_circuit(WORKS, ring, CableRun("flat-twin-earth-70c", "C"), rcbo)
    s = r.selected
    assert r.device["rating_a"] == 32 and s["ring"] and s["line_csa_mm2"] == 2.5
    assert s["check"].r1_plus_r2_ohm == pytest.approx(0.3512, abs=1e-4)
    assert s["check"].check("overload").basis.startswith("BS 7671:2018 433.1.204")
    # 18 mV/A/m x 26 A x 60 / 4 m = 7.02 V = 3.05 %
    assert s["voltage_drop"]["percent"] == pytest.approx(7.02 / 230 * 100, abs=0.01)


def test_cables_in_parallel_and_a_ring_is_not():
    # 180 A on gG 200 A, two single-core 90 degC cables per phase in free air: 25 mm2 2 x 141 A = 282 A
    low = Supply("TN-S", 230, 0.05, prospective_fault_current_ka=10.0, phases=3, line_neutral_loop_ohm=0.04)
    r = size_circuit(low, Demand(length_m=30, design_current_a=180, phases=3, role="distribution", parallel_cables=2),
                     CableRun("single-core-90c", "F"), GG)  # fmt: skip
    assert r.selected["parallel_cables"] == 2 and r.selected["capacity"].iz_a == 2 * r.selected["capacity"].it_a
    assert any("share the load equally" in c for c in r.cautions)
    with pytest.raises(InvalidInput) as err:
        both = Demand(length_m=30, design_current_a=26, load="socket-outlets", ring=True, parallel_cables=2)
        size_circuit(WORKS, both, CableRun("flat-twin-earth-70c", "C"), B)
    assert err.value.path == ("ring",)


def test_an_adjustable_breaker_is_not_sized_by_rating():
    with pytest.raises(InvalidInput) as err:
        mccb = DeviceSpec(rating_a=1, standard="BS EN 60947-2")
        demand = Demand(length_m=30, design_current_a=300, phases=3, role="distribution")
        size_circuit(WORKS, demand, CableRun("multicore-armoured-90c", "C"), mccb)
    assert err.value.path == ("device", "standard")
