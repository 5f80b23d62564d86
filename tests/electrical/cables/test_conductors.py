"""Conductor resistance, temperature multipliers, R1+R2, rings and parallel cables."""

import numpy as np
import pytest

from service.electrical.cables import conductors as cond
from service.electrical.errors import InvalidInput, UnknownConductor
from service.electrical.inputs import Conductors
from tests.reference import rows


# R1+R2 per metre at 20 degC (mohm/m). Published rows quoted in tests/data/conductors.md
# (confidence A): 2.5/1.5, 16/6, 25/25. The others are derived (D) as the sum of the two IEC 60228
# Table 2 values, which is how every published row is formed.
@pytest.mark.parametrize(
    "line, cpc, expected",
    [
        (2.5, 1.5, 19.51),  # published (conductors.md, A)
        (1.5, 1.0, 30.20),  # derived from IEC 60228 (D)
        (4, 1.5, 16.71),  # derived from IEC 60228 (D)
        (6, 2.5, 10.49),  # derived from IEC 60228 (D)
        (10, 4, 6.44),  # derived from IEC 60228 (D)
        (16, 6, 4.23),  # published (conductors.md, A)
        (25, 25, 1.454),  # published (conductors.md, A)
    ],
)
def test_r1_plus_r2_per_metre_matches_published_rows(line, cpc, expected):
    r = cond.resistance_mohm_per_m("copper", [line, cpc])
    assert r.sum() == pytest.approx(expected, abs=0.005)


def test_iec60228_table_values():
    # IEC 60228:2004 Table 2 (class 2 copper) and aluminium; tests/data/conductors.md (A)
    assert cond.resistance_mohm_per_m("copper", 2.5) == 7.41
    assert cond.resistance_mohm_per_m("aluminium", 16) == 1.91
    assert cond.resistance_mohm_per_m("copper", 240, 1) == 0.0775  # class 1 solid differs from 185 mm2 up
    assert cond.resistance_mohm_per_m("copper", 240, 2) == 0.0754


def test_every_iec60228_row_of_the_reference():
    # IEC 60228:2004 Tables 1 and 2 (tests/data/iec60228-resistance.csv, A)
    count = 0
    for row in rows("iec60228-resistance.csv"):
        for column, material, cls in (
            ("copper_class2", "copper", 2),
            ("copper_class1", "copper", 1),
            ("aluminium", "aluminium", 2),
        ):
            if row.get(column):
                assert cond.resistance_mohm_per_m(material, float(row["csa_mm2"]), cls) == float(row[column]), row
                count += 1
    assert count > 20


@pytest.mark.parametrize("temp, multiplier", [(70, 1.20), (90, 1.28), (30, 1.04), (20, 1.0)])
def test_temperature_multipliers(temp, multiplier):
    # BS 7671 Appendix 3 multipliers 1.20 (70 degC) and the same form at 90 and 30 degC
    # (tests/data/conductors.md: 1.20 S, 1.28 and 1.04 D)
    assert cond.temperature_multiplier(temp) == pytest.approx(multiplier)


def test_operating_temperatures():
    t = cond.operating_temperature_c(["thermoplastic-70", "thermosetting-90", "thermosetting-60"])
    assert t.tolist() == [70, 90, 60]
    assert cond.operating_temperature_c("thermoplastic-70") == 70  # a scalar in, a scalar out


def test_ring_loop_value_is_a_quarter_of_the_end_to_end_sum():
    # common practice: a ring's R1+R2 at the mid-point is (r1 + r2) / 4, r1 and r2 end to end;
    # 2.5/1.5 mm2 round a 60 m ring at 70 degC: (7.41 + 12.1) x 1.20 x 60 / 1000 / 4 = 0.35118 ohm
    cols = cond.conductor_columns(
        [
            Conductors("copper", "thermoplastic-70", 2.5, 1.5, 60, ring=True),
            Conductors("copper", "thermoplastic-70", 2.5, 1.5, 60),
            None,
        ]
    )
    loop = cols.r1 + cols.r2
    assert loop[0] == pytest.approx(19.51 * 1.2 * 60 / 1000 / 4)
    assert loop[1] == pytest.approx(4 * loop[0])
    assert cols.r2[0] == pytest.approx(12.1 * 1.2 * 60 / 1000 / 4)
    assert cols.present.tolist() == [True, True, False] and np.isnan(loop[2])


def test_loop_resistance_per_metre():
    # 4/1.5 mm2 at 70 degC: (4.61 + 12.1) x 1.20 / 1000 ohm per metre (IEC 60228, BS 7671 Appendix 3 multiplier)
    per_m, r2, line_neutral = cond.loop_resistance_per_m(Conductors("copper", "thermoplastic-70", 4, 1.5, 35))
    assert per_m == pytest.approx(16.71 * 1.2 / 1000) and r2 == pytest.approx(12.1 * 1.2 / 1000)
    assert line_neutral == pytest.approx(2 * 4.61 * 1.2 / 1000)  # the neutral is the line conductor's size


def test_a_reduced_neutral_raises_the_line_neutral_loop():
    # 16 mm2 line with a 10 mm2 neutral: Rn = 1.83 x 1.2 x 10 / 1000 (IEC 60228)
    cols = cond.conductor_columns([Conductors("copper", "thermoplastic-70", 16, 6, 10, neutral_csa_mm2=10)])
    assert cols.rn[0] == pytest.approx(1.83 * 1.2 * 10 / 1000) and cols.r1[0] == pytest.approx(1.15 * 1.2 * 10 / 1000)


def test_constants_name_the_field_at_fault():
    with pytest.raises(InvalidInput) as err:
        cond.conductor_constants(Conductors("copper", "thermoplastic-70", 16, 16, 10, cpc_arrangement="armour"))
    assert err.value.path == ("cpc_resistance_mohm_per_m",)
    with pytest.raises(UnknownConductor) as err:
        cond.conductor_constants(Conductors("copper", "thermoplastic-70", 3, 1.5, 10))
    assert err.value.path == ("line_csa_mm2",)


def test_parallel_cables_divide_the_resistance():
    one = cond.conductor_resistance_ohm(0.387, 50, 90, 1)
    two = cond.conductor_resistance_ohm(0.387, 50, 90, 2)
    assert two == pytest.approx(one / 2)
    with pytest.raises(InvalidInput):
        cond.conductor_resistance_ohm(0.387, 50, 90, 1.5)
    with pytest.raises(InvalidInput):
        cond.check_parallel_cables(0)


def test_unknown_size_class_or_material_is_a_typed_error():
    with pytest.raises(UnknownConductor) as err:
        cond.resistance_mohm_per_m("copper", 3)
    assert err.value.path == ("csa_mm2",)
    with pytest.raises(UnknownConductor):
        cond.resistance_mohm_per_m("aluminium", 4)  # no aluminium below 10 mm2 in IEC 60228
    with pytest.raises(UnknownConductor):
        cond.resistance_mohm_per_m("silver", 4)
    with pytest.raises(UnknownConductor):
        cond.resistance_mohm_per_m("copper", 4, 5)
    with pytest.raises(UnknownConductor):
        cond.operating_temperature_c("paper")


def test_vector_and_scalar_agree():
    sizes = [1.5, 2.5, 4, 6, 10]
    vec = cond.resistance_mohm_per_m("copper", sizes)
    assert np.array_equal(vec, [cond.resistance_mohm_per_m("copper", s) for s in sizes])
