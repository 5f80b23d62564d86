"""The protective-conductor check (BS 7671:2018 543.1.3 adiabatic, 543.1.4 Table 54.7)."""

import math

import pytest

from service.electrical.model import Conductors, DeviceSpec
from service.electrical.verdicts import VERDICTS
from tests.electrical.pipeline import BAKERY, circuit, run, step


def test_below_0_1_s_the_energy_is_i2_x_0_1_s_with_a_caution():
    # oven: If 431.32 A, breaker within 0.1 s: S = sqrt(431.32^2 x 0.1) / 115 = 1.186 mm2 <= 2.5 mm2
    checked = run(BAKERY, circuit())
    c = step(checked, "protective-conductor")
    assert VERDICTS[c.verdict[0]] == "pass" and c.limit[0] == pytest.approx(1.186, abs=1e-3)
    assert c.detail[0] == "protective_conductor" and c.detail[1]["energy_basis"][0] == "conservative-0.1s"
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
