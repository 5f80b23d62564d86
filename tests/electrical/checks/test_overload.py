"""The overload check: Ib <= In <= Iz (BS 7671:2018 433.1.1), the ring rule (433.1.204), BS 3036 (433.1.202).

Capacities: BS 7671 Table 4D5 (tests/data/capacity/flat-twin-earth-70c-copper.csv); factors Appendix 4.
"""

import dataclasses

import numpy as np
import pytest

from service.electrical.inputs import CableRun, Conductors, DeviceSpec
from service.electrical.results.verdicts import VERDICTS
from tests.electrical.pipeline import BAKERY, circuit, run, step

CLIPPED = CableRun("flat-twin-earth-70c", "C")
TWIN_6 = Conductors("copper", "thermoplastic-70", 6, 2.5, 12)


def verdict_of(**kwargs):
    c = step(run(BAKERY, circuit(**kwargs)), "overload")
    return VERDICTS[c.verdict[0]], c


def test_6_mm2_clipped_on_a_b63_with_ib_55_a_fails():
    # Table 4D5: 6 mm2 clipped direct 47 A (from memory) < In 63 A: the cable is not protected against overload
    b63 = DeviceSpec(rating_a=63, standard="BS EN 60898", type="B", breaking_capacity_ka=6)
    verdict, c = verdict_of(device=b63, conductors=TWIN_6, design_current_a=55, installation=CLIPPED)
    assert verdict == "fail" and c.value[0] == 63 and c.limit[0] == 47 and "433.1.1" in c.basis[0]


def test_factors_reduce_iz():
    # 40 degC ambient (Table 4B1, 0.87 by the formula) and 3 circuits bunched (Table 4C1, 0.70): 47 x 0.87 x 0.70
    hot = CableRun("flat-twin-earth-70c", "C", ambient_c=40, grouped_circuits=3)
    b25 = DeviceSpec(rating_a=25, standard="BS EN 60898", type="B", breaking_capacity_ka=6)
    verdict, c = verdict_of(device=b25, conductors=TWIN_6, design_current_a=20, installation=hot)
    assert c.limit[0] == pytest.approx(47 * (40 / 40) ** 0.5 * 0.7 * ((70 - 40) / 40) ** 0.5, rel=1e-9)
    assert verdict == "pass"  # 25 <= 28.6 A


def test_the_spare_capacity_is_iz_less_ib():
    # Table 4D5: 6 mm2 clipped direct 47 A (from memory); Ib 20 A leaves 27 A; without Ib there is no spare to say
    b32 = DeviceSpec(rating_a=32, standard="BS EN 60898", type="B", breaking_capacity_ka=6)
    _, c = verdict_of(device=b32, conductors=TWIN_6, design_current_a=20, installation=CLIPPED)
    assert c.detail[1]["spare_capacity_a"][0] == pytest.approx(47 - 20)
    _, c = verdict_of(device=b32, conductors=TWIN_6, installation=CLIPPED)
    assert np.isnan(c.detail[1]["spare_capacity_a"][0])


def test_a_semi_enclosed_fuse_takes_0_725():
    # BS 3036 30 A on 4 mm2 clipped (37 A): Iz = 37 x 0.725 = 26.8 A < 30 A (433.1.202, from memory)
    rewirable = DeviceSpec(rating_a=30, standard="BS 3036")
    verdict, c = verdict_of(
        device=rewirable,
        conductors=Conductors("copper", "thermoplastic-70", 4, 1.5, 12),
        design_current_a=20,
        installation=CLIPPED,
    )
    assert verdict == "fail" and c.limit[0] == pytest.approx(37 * 0.725)
    assert c.detail[1]["factors"][0]["device"]["basis"].startswith("BS 7671 433.1.202")


def test_ib_over_in_fails_even_without_an_installation():
    verdict, c = verdict_of(design_current_a=40)
    assert verdict == "fail" and "exceeds" in c.note[0]


def test_without_the_design_current_or_installation_it_is_not_verified():
    assert verdict_of()[0] == "not-verified"
    assert verdict_of(design_current_a=20)[1].note[0].startswith("State how the cable is run")


def test_parallel_cables_share_the_load():
    # 523.7, equal sharing: two 16 mm2 cables clipped (85 A each, from memory) carry 170 A
    pair = Conductors("copper", "thermoplastic-70", 16, 6, 20, parallel_cables=2)
    fuse = DeviceSpec(rating_a=160, standard="BS 88-2")
    verdict, c = verdict_of(
        device=fuse, conductors=pair, design_current_a=150, installation=CLIPPED, role="distribution"
    )
    assert c.limit[0] == 170 and verdict == "pass"


SINGLES_16 = Conductors("copper", "thermosetting-90", 16, 16, 20)
B80 = DeviceSpec(rating_a=80, standard="BS EN 60898", type="C", breaking_capacity_ka=10)


def test_a_capacity_given_in_the_request_replaces_the_table_and_says_so():
    given = CableRun("single-core-90c", "B", capacity_a=70)
    verdict, c = verdict_of(device=B80, conductors=SINGLES_16, design_current_a=60, installation=given)
    assert verdict == "fail" and c.limit[0] == 70 and "given in the request" in c.detail[1]["capacity_basis"][0]


def test_terminals_rated_70c_take_the_70c_table():
    # Table 4E1A method B 16 mm2 100 A at 90 degC, but on 70 degC terminals Table 4D1A's 76 A (from memory) applies
    at_90 = CableRun("single-core-90c", "B")
    verdict, c = verdict_of(device=B80, conductors=SINGLES_16, design_current_a=60, installation=at_90)
    assert verdict == "pass" and c.limit[0] == 100
    assert any("terminals" in text and mask[0] for mask, text in c.cautions)
    at_70 = CableRun("single-core-90c", "B", terminals_c=70)
    verdict, c = verdict_of(device=B80, conductors=SINGLES_16, design_current_a=60, installation=at_70)
    assert verdict == "fail" and c.limit[0] == 76 and "70 degC for terminals" in c.detail[1]["capacity_basis"][0]


def test_a_table_of_another_material_is_not_used():
    aluminium = Conductors("aluminium", "thermosetting-90", 16, 16, 20)
    copper_table = CableRun("multicore-armoured-90c", "C")
    verdict, c = verdict_of(device=B80, conductors=aluminium, design_current_a=60, installation=copper_table)
    assert verdict == "not-verified" and "another conductor material" in c.note[0]
    # the aluminium family, three-phase: Table 4E4A's 94 A x 73/96 (IEC B.52.5) = 71 A (derived), below In 80 A
    al_table = CableRun("multicore-armoured-90c-aluminium", "C")
    three = dataclasses.replace(BAKERY, phases=3)
    one = circuit(device=B80, conductors=aluminium, design_current_a=60, installation=al_table, phases=3)
    c = step(run(three, one), "overload")
    assert VERDICTS[c.verdict[0]] == "fail" and c.limit[0] == 71
    assert c.detail[1]["capacity_confidence"][0] == "D" and any(mask[0] for mask, _ in c.cautions[:1])
