"""Whole-circuit checks for an invented demo scenario, each with its hand calculation written out.

Scenario (invented for the demo): "Larkspur Bakery", a small bakery on a TN-C-S supply, 230 V,
Ze 0.28 ohm, prospective fault current 2.1 kA stated by the distributor; a garden kiosk on its own
TT electrode. Resistances: IEC 60228 at 20 degC, multiplied by 1.20 for 70 degC thermoplastic.
"""

import math

import pytest

from service.electrical.circuit import check_circuit, check_circuits
from service.electrical.errors import UnknownDevice
from service.electrical.model import Circuit, Conductors, DeviceSpec, Rcd, Supply

BAKERY = Supply(earthing="TN-C-S", u0_v=230, ze_ohm=0.28, prospective_fault_current_ka=2.1)


def by_name(result):
    return {c.check: c for c in result.checks}


def test_oven_radial_b32_passes():
    # 6/2.5 mm2 flat twin and earth, 18 m, B32 6 kA, fixed oven only (Table 41.1: 0.4 s, TN, 230 V)
    # R1+R2 = (3.08 + 7.41) mohm/m x 1.20 x 18 m = 0.226584 ohm; Zs = 0.28 + 0.226584 = 0.506584 ohm
    # If = 0.95 x 230 / 0.506584 = 431.32 A >= 5 x 32 = 160 A, so t <= 0.1 s (instantaneous)
    # max Zs = 0.95 x 230 / 160 = 1.3656 ohm; cpc: sqrt(431.32^2 x 0.1) / 115 = 1.186 mm2 <= 2.5 mm2
    r = check_circuit(
        BAKERY,
        Circuit(
            id="oven",
            role="final",
            load="fixed-equipment",
            device=DeviceSpec(rating_a=32, standard="BS EN 60898", type="B", breaking_capacity_ka=6),
            conductors=Conductors("copper", "thermoplastic-70", 6, 2.5, 18),
        ),
    )
    assert r.r1_plus_r2_ohm == pytest.approx(0.226584)
    assert r.zs_ohm == pytest.approx(0.506584)
    assert r.earth_fault_current_a == pytest.approx(431.32, abs=0.01)
    assert (r.disconnection_time_s, r.disconnection_time_bound, r.disconnection_region) == (
        0.1,
        "at-most",
        "instantaneous",
    )
    assert r.max_disconnection_time_s == 0.4
    assert r.max_zs_ohm == pytest.approx(1.3656, abs=1e-4)
    assert r.protective_conductor["min_csa_mm2"] == pytest.approx(1.186, abs=0.001)
    assert r.protective_conductor["energy_basis"] == "conservative-0.1s"
    assert r.verdict == "pass"
    assert [c.check for c in r.checks] == ["disconnection-time", "max-zs", "protective-conductor", "breaking-capacity"]


def test_shop_ring_rcbo_passes():
    # ring final circuit, 2.5/1.5 mm2, 64 m of cable round the ring, RCBO B32 30 mA
    # r1 = 7.41 x 64 / 1000 = 0.47424, r2 = 12.1 x 64 / 1000 = 0.7744 ohm at 20 degC
    # R1+R2 = (0.47424 + 0.7744) x 1.20 / 4 = 0.374592 ohm; Zs = 0.654592 ohm; If = 333.79 A >= 160 A
    # RCD 50 V rule: Zs x 0.03 = 0.0196 V << 50 V (limit 1666.7 ohm, BS 7671 Table 41.5)
    r = check_circuit(
        BAKERY,
        Circuit(
            id="shop-ring",
            role="final",
            load="socket-outlets",
            device=DeviceSpec(rating_a=32, standard="BS EN 61009", type="B", breaking_capacity_ka=6, rcd=Rcd(30)),
            conductors=Conductors("copper", "thermoplastic-70", 2.5, 1.5, 64, ring=True),
        ),
    )
    assert r.r1_plus_r2_ohm == pytest.approx(0.374592)
    assert r.earth_fault_current_a == pytest.approx(218.5 / 0.654592)
    checks = by_name(r)
    assert checks["rcd"].limit == pytest.approx(1666.67, abs=0.01) and checks["rcd"].verdict == "pass"
    assert r.verdict == "pass"
    assert not any("411.3.3" in c for c in r.cautions)  # 30 mA additional protection is fitted


def test_outbuilding_submain_bs88_63a_passes_on_an_estimated_time():
    # distribution circuit to the flour store: 16/6 mm2 thermoplastic-70, 40 m, BS 88-2 gG 63 A (5 s, 411.3.2.3)
    # R1+R2 = (1.15 + 3.08) x 1.20 x 40 / 1000 = 0.20304 ohm; Zs = 0.48304 ohm; If = 218.5 / 0.48304 = 452.34 A
    # 63 A has no published 0.4 s point: the curve runs from (280.5 A, 5 s) to the IEC 60269-1 gate (820 A, 0.1 s)
    # t = 5 x (452.34 / 280.5)^(ln(0.1/5) / ln(820/280.5)) = 0.8756 s (estimated) <= 5 s
    # max Zs = 0.95 x 230 / 280.5 = 0.77897 ohm; cpc: sqrt(452.34^2 x 0.8756) / 115 = 3.68 mm2 <= 6 mm2
    r = check_circuit(
        BAKERY,
        Circuit(
            id="flour-store",
            role="distribution",
            device=DeviceSpec(rating_a=63, standard="BS 88-2", type="gG"),
            conductors=Conductors("copper", "thermoplastic-70", 16, 6, 40),
        ),
    )
    i_f = 218.5 / 0.48304
    slope = math.log(0.1 / 5) / math.log(820 / 280.5)
    t = 5 * (i_f / 280.5) ** slope
    assert r.earth_fault_current_a == pytest.approx(i_f)
    assert r.disconnection_time_s == pytest.approx(t) and t == pytest.approx(0.8756, abs=1e-3)
    assert r.disconnection_time_bound == "estimated"
    assert r.max_disconnection_time_s == 5 and "411.3.2.3" in r.max_disconnection_basis
    assert r.max_zs_ohm == pytest.approx(0.77897, abs=1e-5)
    assert r.protective_conductor["min_csa_mm2"] == pytest.approx(math.sqrt(i_f**2 * t) / 115)
    assert r.verdict == "pass"
    assert any("estimated" in c for c in r.cautions)
    assert any("from memory" in c for c in r.cautions)  # breaking capacity taken from the standard minimum


def test_long_garden_lighting_run_fails():
    # C20 on 2.5/1.5 mm2, 60 m, fixed equipment: R1+R2 = 19.51 x 1.20 x 60 / 1000 = 1.40472 ohm
    # Zs = 1.68472 ohm; If = 129.70 A < 10 x 20 = 200 A, so only the 2.55 In (51 A) time holds: <= 60 s > 0.4 s
    # max Zs = 0.95 x 230 / 200 = 1.0925 ohm < 1.68472 ohm: fail
    r = check_circuit(
        BAKERY,
        Circuit(
            id="garden-lights",
            role="final",
            load="fixed-equipment",
            device=DeviceSpec(rating_a=20, standard="BS EN 60898", type="C", breaking_capacity_ka=6),
            conductors=Conductors("copper", "thermoplastic-70", 2.5, 1.5, 60),
        ),
    )
    checks = by_name(r)
    assert r.zs_ohm == pytest.approx(1.68472)
    assert checks["disconnection-time"].verdict == "fail" and checks["disconnection-time"].value == 60
    assert checks["max-zs"].verdict == "fail" and checks["max-zs"].limit == pytest.approx(1.0925)
    assert r.verdict == "fail"


def test_tt_kiosk_relies_on_its_rcd():
    # garden kiosk on a TT electrode: Ze 21 ohm including RA 20 ohm; RCBO B16 30 mA, 2.5/1.5 mm2, 25 m sockets
    # R1+R2 = 19.51 x 1.20 x 25 / 1000 = 0.5853 ohm; R2 = 12.1 x 1.20 x 25 / 1000 = 0.363 ohm
    # Zs = 21.5853 ohm; If = 218.5 / 21.5853 = 10.12 A: below 1.45 x 16 A, the breaker shows no disconnection
    # RCD: 10.12 A >= 5 x 30 mA, so <= 40 ms <= 0.2 s (Table 41.1, TT, 230 V)
    # RA = 20 + 0.363 = 20.363 ohm; RA x IΔn = 0.61 V <= 50 V (411.5.3)
    kiosk = Supply(earthing="TT", u0_v=230, ze_ohm=21, electrode_ohm=20)
    r = check_circuit(
        kiosk,
        Circuit(
            id="kiosk",
            role="final",
            load="socket-outlets",
            device=DeviceSpec(rating_a=16, standard="BS EN 61009", type="B", breaking_capacity_ka=6, rcd=Rcd(30)),
            conductors=Conductors("copper", "thermoplastic-70", 2.5, 1.5, 25),
        ),
    )
    checks = by_name(r)
    assert r.earth_fault_current_a == pytest.approx(218.5 / 21.5853)
    assert r.disconnected_by == "rcd" and r.disconnection_time_s == 0.04
    assert checks["disconnection-time"].limit == 0.2 and checks["disconnection-time"].verdict == "pass"
    assert checks["rcd"].value == pytest.approx(20.363) and checks["rcd"].verdict == "pass"
    assert checks["max-zs"].verdict == "pass" and "411.5.3" in checks["max-zs"].basis
    assert r.prospective_fault_current_ka == pytest.approx(230 * 1.10 / 21 / 1000)
    assert r.verdict == "pass"
    # max_zs_ohm keeps its meaning: the breaker's own limit, 0.95 x 230 / (5 x 16 A) = 2.7313 ohm
    # (Table 41.1, TT 0.2 s);
    # the RCD's limit has its own field, 50 V / 30 mA = 1666.7 ohm (BS 7671:2018 Table 41.5)
    assert r.max_zs_ohm == pytest.approx(218.5 / 80) and r.zs_margin_percent < 0
    assert r.rcd_max_zs_ohm == pytest.approx(1666.67, abs=0.01) and checks["max-zs"].limit == pytest.approx(
        1666.67, abs=0.01
    )


def test_a_larger_cpc_lowers_zs_and_the_result_uses_the_cpc_chosen():
    # same oven run with a 6 mm2 cpc: R1+R2 = (3.08 + 3.08) x 1.20 x 18 / 1000 = 0.133056 ohm
    def run(cpc):
        return check_circuit(
            BAKERY,
            Circuit(
                device=DeviceSpec(rating_a=32, standard="BS EN 60898", type="B", breaking_capacity_ka=6),
                conductors=Conductors("copper", "thermoplastic-70", 6, cpc, 18),
                role="final",
                load="fixed-equipment",
            ),
        )

    small, large = run(2.5), run(6)
    assert large.r1_plus_r2_ohm == pytest.approx(0.133056)
    assert large.zs_ohm < small.zs_ohm and large.earth_fault_current_a > small.earth_fault_current_a
    assert large.protective_conductor["csa_mm2"] == 6


def test_breaker_without_breaking_capacity_is_not_verified():
    r = check_circuit(
        BAKERY,
        Circuit(
            device=DeviceSpec(rating_a=16, standard="BS EN 60898", type="B"),
            conductors=Conductors("copper", "thermoplastic-70", 2.5, 1.5, 10),
            role="final",
            load="fixed-equipment",
        ),
    )
    assert by_name(r)["breaking-capacity"].verdict == "not-verified"
    assert r.verdict == "not-verified"


def test_tt_at_400_v_with_a_breaker_cannot_be_shown():
    # Table 41.1, TT, 230 < U0 <= 400 V: 0.07 s; a breaker's data show 'at most 0.1 s': not-verified
    supply = Supply(earthing="TT", u0_v=400, ze_ohm=0.5, prospective_fault_current_ka=3)
    r = check_circuit(
        supply,
        Circuit(
            device=DeviceSpec(rating_a=16, standard="BS EN 60898", type="B", breaking_capacity_ka=6),
            conductors=Conductors("copper", "thermoplastic-70", 2.5, 1.5, 10),
            role="final",
            load="fixed-equipment",
        ),
    )
    assert by_name(r)["disconnection-time"].verdict == "not-verified"
    assert by_name(r)["max-zs"].verdict == "not-verified"
    assert r.verdict == "not-verified"


def test_one_bad_circuit_keeps_its_error_type_and_path():
    good = Circuit(
        id="ok",
        role="final",
        load="fixed-equipment",
        device=DeviceSpec(rating_a=32, standard="BS EN 60898", type="B", breaking_capacity_ka=6),
        conductors=Conductors("copper", "thermoplastic-70", 6, 2.5, 18),
    )
    bad = Circuit(
        id="no-such-fuse",
        role="final",
        load="fixed-equipment",
        device=DeviceSpec(rating_a=17, standard="BS 88-2"),
        conductors=good.conductors,
    )
    out = check_circuits(BAKERY, [good, bad])
    assert out[0].verdict == "pass"
    assert out[1].path == ("circuit", "device", "rating_a") and out[1].error is UnknownDevice
    with pytest.raises(UnknownDevice) as err:
        check_circuit(BAKERY, bad)
    assert err.value.path == ("circuit", "device", "rating_a")
