"""The protective-conductor check (BS 7671:2018 543.1.3 adiabatic, 543.1.4 Table 54.7)."""

import math

import pytest

from service.electrical.inputs import Conductors, DeviceSpec, Rcd, Supply
from service.electrical.results.verdicts import VERDICTS
from tests.electrical.pipeline import BAKERY, circuit, run, step


def test_below_0_1_s_a_class_3_breaker_lets_through_its_classes_energy():
    # oven: If 431.32 A, the largest earth fault 1.1 x 230 / 0.28 = 903.6 A, both within 0.1 s and below 3 kA:
    # class 3 type B 16-32 A lets through at most 18 000 A2s (BS EN 60898-1 Annex ZA, tests/data, from memory)
    # S = sqrt(18 000) / 115 = 1.1667 mm2 <= 2.5 mm2
    c = step(run(BAKERY, circuit()), "protective-conductor")
    assert VERDICTS[c.verdict[0]] == "pass" and c.limit[0] == pytest.approx(math.sqrt(18_000) / 115)
    assert c.detail[0] == "protective_conductor" and c.detail[1]["energy_basis"][0] == "let-through-data"


def test_without_class_data_the_stand_in_is_i2_x_0_1_s_and_a_failure_on_it_is_not_verified():
    # a type D breaker has no class (Annex ZA covers B and C): I^2 x 0.1 s. A 1 mm2 cpc fails on that stand-in
    # alone 0.5 m from the board (If 733 A > 20 x 32 A): sqrt(903.6^2 x 0.1) / 115 = 2.48 mm2 > 1 mm2, which cannot
    # show the device itself fails
    d32 = DeviceSpec(rating_a=32, standard="BS EN 60898", type="D", breaking_capacity_ka=6)
    c = step(run(BAKERY, circuit(d32, Conductors("copper", "thermoplastic-70", 1.5, 1.0, 0.5))), "protective-conductor")
    assert c.detail[1]["energy_basis"][0] == "conservative-0.1s"
    assert VERDICTS[c.verdict[0]] == "not-verified" and "stand-in" in c.note[0]
    assert any(mask[0] and "0.1 s" in text for mask, text in c.cautions)


def test_the_makers_let_through_energy_replaces_the_stand_in():
    # a let-through I^2 t of 20 000 A^2 s (given): S = sqrt(20 000) / 115 = 1.23 mm2
    device = DeviceSpec(rating_a=32, standard="BS EN 60898", type="B", breaking_capacity_ka=6, let_through_a2s=20_000)
    c = step(run(BAKERY, circuit(device)), "protective-conductor")
    assert c.limit[0] == pytest.approx(math.sqrt(20_000) / 115) and "let-through" in c.note[0]


def test_without_conductors_it_is_not_verified():
    c = step(run(BAKERY, circuit(conductors=None, r1_plus_r2_ohm=0.2)), "protective-conductor")
    assert VERDICTS[c.verdict[0]] == "not-verified" and "not described" in c.note[0]


def test_a_fuse_at_a_published_time():
    # BS 88-3 32 A operates within 0.4 s at 239.6 A (BS 7671:2008+A1 Table 41.2, tests/data/fuse-operating-currents.csv)
    # 6/2.5 mm2 at 70 degC: (3.08 + 7.41) x 1.2 / 1000 ohm/m; If = 239.6 A where Zs = 218.5 / 239.6, so
    # L = (218.5 / 239.6 - 0.28) / 0.012588 m; S = sqrt(239.6^2 x 0.4) / 115 = 1.318 mm2
    length = (218.5 / 239.6 - 0.28) / (10.49 * 1.2 / 1000)
    run_ = circuit(
        DeviceSpec(rating_a=32, standard="BS 88-3"), Conductors("copper", "thermoplastic-70", 6, 2.5, length)
    )
    c = step(run(BAKERY, run_), "protective-conductor")
    assert c.detail[1]["energy_basis"][0] == "adiabatic"
    assert c.limit[0] == pytest.approx(math.sqrt(239.6**2 * 0.4) / 115, rel=1e-6)


def test_table_54_7_stands_only_where_the_line_conductor_is_protected():
    # 1/1 mm2 on a 63 A BS 88-2 fuse, 5 m (distribution, 5 s): Table 54.7 gives S = 1 mm2, but the line conductor
    # itself is not protected against a short circuit by a 63 A fuse (434.5.2), so the selection cannot stand.
    # By the adiabatic equation: If = 218.5 / (0.28 + 2 x 18.1 x 1.2 x 5 / 1000) = 439 A, about 0.95 s on the
    # estimated segment, sqrt(439^2 x 0.95) / 115 = 3.7 mm2 > 1 mm2 (543.1.3): fail
    fuse = DeviceSpec(rating_a=63, standard="BS 88-2")
    checked = run(BAKERY, circuit(fuse, Conductors("copper", "thermoplastic-70", 1.0, 1.0, 5), role="distribution"))
    assert VERDICTS[step(checked, "short-circuit").verdict[0]] == "fail"
    c = step(checked, "protective-conductor")
    assert VERDICTS[c.verdict[0]] == "fail" and c.limit[0] == pytest.approx(3.7, abs=0.1)
    assert c.detail[1]["selection_csa_mm2"][0] == 1.0


def test_2_5_1_5_twin_and_earth_on_a_b20_rcbo_near_the_board_passes():
    # Ze 0.2 ohm, 5 m: If = 218.5 / (0.2 + 19.51 x 1.2 x 5 / 1000) = 689 A, the largest earth fault 1.1 x 230 / 0.2
    # = 1265 A, both within 0.1 s and below 3 kA: class 3 (16-32 A, type B) 18 000 A2s, S = sqrt(18 000) / 115 =
    # 1.167 mm2 <= 1.5 mm2. With I^2 x 0.1 s it needed sqrt(1265^2 x 0.1) / 115 = 3.48 mm2.
    near = Supply("TN-C-S", 230, 0.2, 1.5)
    rcbo = DeviceSpec(rating_a=20, standard="BS EN 61009", type="B", breaking_capacity_ka=6, rcd=Rcd(30))
    c = step(
        run(near, circuit(rcbo, Conductors("copper", "thermoplastic-70", 2.5, 1.5, 5), load="socket-outlets")),
        "protective-conductor",
    )
    assert VERDICTS[c.verdict[0]] == "pass" and c.limit[0] == pytest.approx(math.sqrt(18_000) / 115)
