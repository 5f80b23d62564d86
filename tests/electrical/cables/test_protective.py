"""k, the adiabatic minimum size and Table 54.7."""

import math

import numpy as np
import pytest

from service.electrical.cables import protective
from service.electrical.errors import InvalidInput, NoRule, UnknownDevice
from service.electrical.inputs import DeviceSpec
from service.electrical.results.verdicts import VERDICTS

# Every tabulated k in tests/data/conductors.md (BS 7671:2018 Tables 43.1 and 54.2-54.6, A):
# (material, arrangement, insulation or bare condition, csa, k)
TABULATED_K = [
    ("copper", "in-cable", "thermoplastic-70", 2.5, 115),
    ("copper", "in-cable", "thermoplastic-70", 400, 103),
    ("aluminium", "in-cable", "thermoplastic-70", 16, 76),
    ("aluminium", "in-cable", "thermoplastic-70", 400, 68),
    ("copper", "in-cable", "thermoplastic-90", 2.5, 100),
    ("copper", "in-cable", "thermoplastic-90", 400, 86),
    ("aluminium", "in-cable", "thermoplastic-90", 16, 66),
    ("aluminium", "in-cable", "thermoplastic-90", 400, 57),
    ("copper", "in-cable", "thermosetting-60", 2.5, 141),
    ("aluminium", "in-cable", "thermosetting-60", 16, 93),
    ("copper", "in-cable", "thermosetting-90", 2.5, 143),
    ("aluminium", "in-cable", "thermosetting-90", 16, 94),
    ("copper", "separate", "thermoplastic-70", 2.5, 143),
    ("copper", "separate", "thermoplastic-70", 400, 133),
    ("aluminium", "separate", "thermoplastic-70", 16, 95),
    ("aluminium", "separate", "thermoplastic-70", 400, 88),
    ("steel", "separate", "thermoplastic-70", 16, 52),
    ("copper", "separate", "thermosetting-90", 2.5, 176),
    ("aluminium", "separate", "thermosetting-90", 16, 116),
    ("steel", "separate", "thermosetting-90", 16, 64),
    ("aluminium", "armour", "thermoplastic-70", 16, 93),
    ("aluminium", "armour", "thermosetting-90", 16, 85),
    ("steel", "armour", "thermoplastic-70", 16, 51),
    ("steel", "armour", "thermosetting-90", 16, 46),
    ("lead", "sheath", "thermoplastic-70", 16, 26),
    ("lead", "sheath", "thermosetting-90", 16, 23),
    ("steel", "conduit", "thermoplastic-70", 16, 47),
    ("steel", "conduit", "thermoplastic-90", 16, 44),
    ("steel", "conduit", "thermosetting-90", 16, 58),
    ("copper", "bare", "visible-restricted", 16, 228),
    ("copper", "bare", "normal", 16, 159),
    ("copper", "bare", "fire-risk", 16, 138),
    ("aluminium", "bare", "visible-restricted", 16, 125),
    ("aluminium", "bare", "normal", 16, 105),
    ("aluminium", "bare", "fire-risk", 16, 91),
    ("steel", "bare", "visible-restricted", 16, 82),
    ("steel", "bare", "normal", 16, 58),
    ("steel", "bare", "fire-risk", 16, 50),
]


@pytest.mark.parametrize("material, arrangement, ins, csa, k", TABULATED_K)
def test_k_tabulated_exactly_and_formula_within_0_6(material, arrangement, ins, csa, k):
    insulation, condition = (None, ins) if arrangement == "bare" else (ins, None)
    case = protective.k_case(material, arrangement, insulation, csa, condition)
    assert case["k"] == k  # BS 7671:2018 Tables 43.1, 54.2-54.6 (tests/data/conductors.md)
    assert case["k_tabulated"] == k
    assert abs(case["k_formula"] - k) <= 0.6  # IEC 60364-5-54 Annex A reproduces the tables within 0.6


def test_formula_constants():
    # IEC 60364-5-54 Annex A Table A.54.1: sqrt(Qc(beta+20)/rho20) = 226 Cu, 148 Al, 41 lead, 78 steel
    for material, expected in (("copper", 226), ("aluminium", 148), ("lead", 41), ("steel", 78)):
        m = protective._table()["materials"][material]
        assert math.sqrt(m["qc_j_per_c_mm3"] * (m["beta_c"] + 20) / m["rho20_ohm_mm"]) == pytest.approx(
            expected, abs=0.5
        )


def test_formula_only_case_has_no_tabulated_value():
    case = protective.k_case("copper", "separate", "thermosetting-60", 4)
    assert case["k_tabulated"] is None and case["k"] == case["k_formula"]


def test_unknown_cases_are_typed_errors():
    with pytest.raises(NoRule):
        protective.k_case("steel", "in-cable", "thermoplastic-70", 4)
    with pytest.raises(InvalidInput):
        protective.k_case("copper", "bare", None, 4)
    with pytest.raises(InvalidInput):
        protective.k_case("copper", "floating", "thermoplastic-70", 4)


def test_adiabatic_minimum_size():
    # BS 7671:2018 543.1.3: S = sqrt(I^2 t) / k
    energy, method = protective.fault_energy_a2s(1000, 0.4)
    assert method == "adiabatic"
    assert protective.min_csa_mm2(energy, 115) == pytest.approx(math.sqrt(1000**2 * 0.4) / 115)


def test_below_0_1_s_uses_let_through_or_a_stated_conservative_value():
    e, m = protective.fault_energy_a2s([1000, 1000], [0.1, 0.02], [np.nan, 5000])
    assert m.tolist() == ["conservative-0.1s", "let-through"]
    assert e.tolist() == [1000**2 * 0.1, 5000]
    e, m = protective.fault_energy_a2s(100, 7.0)
    assert np.isnan(e) and m == "outside-adiabatic-range"


def test_next_standard_size():
    assert protective.next_standard_size_mm2([0.9, 1.0, 1.01, 2.6, 630, 700]).tolist()[:5] == [
        1.0,
        1.0,
        1.5,
        4.0,
        630.0,
    ]
    assert np.isnan(protective.next_standard_size_mm2(700))


def test_table_54_7_selection():
    # BS 7671:2018 Table 54.7 (tests/data/conductors.md, A)
    assert protective.selection_csa_mm2([2.5, 16, 25, 35, 50, 95, 185]).tolist() == [2.5, 16, 16, 16, 25, 50, 95]
    # different material: times k1/k2 (copper line 115, steel cpc 47 -> 2.5 x 115 / 47 = 6.1 -> 10)
    assert protective.selection_csa_mm2(2.5, 115, 47) == 10


def test_cpc_verdicts_by_calculation_or_selection():
    # 543.1.3 (S >= Smin) or 543.1.4 (Table 54.7); outside 0.1-5 s without selection: not-verified
    verdict, by_calc, by_sel = protective.cpc_verdicts(
        [1.5, 1.0, 2.5, 1.0], [1.2, 1.2, np.nan, np.nan], [2.5, 2.5, 2.5, 2.5]
    )
    assert [VERDICTS[v] for v in verdict] == ["pass", "fail", "pass", "not-verified"]
    assert by_calc.tolist() == [True, False, False, False] and by_sel.tolist() == [False, False, True, False]


def test_size_for_a_fault_reads_the_device_and_names_the_question_fields():
    # BS 88-3 32 A at 239.6 A: 0.4 s (BS 7671:2008+A1 Table 41.2 via tests/data/fuse-operating-currents.csv)
    # S = sqrt(239.6^2 x 0.4) / 115 = 1.318 mm2 -> 1.5 mm2
    answer = protective.size_for_fault(
        239.6,
        "copper",
        "in-cable",
        "thermoplastic-70",
        device=DeviceSpec(rating_a=32, standard="BS 88-3"),
        cpc_csa_mm2=1.5,
    )
    assert answer.time_s == 0.4 and answer.min_csa_mm2 == pytest.approx(math.sqrt(239.6**2 * 0.4) / 115)
    assert answer.csa_mm2 == 1.5 and answer.verdict == "pass"
    with pytest.raises(NoRule) as err:
        protective.size_for_fault(100, "steel", "in-cable", "thermoplastic-70", time_s=1)
    assert err.value.path == ("material",)
    with pytest.raises(UnknownDevice) as err:
        protective.size_for_fault(
            100, "copper", "in-cable", "thermoplastic-70", device=DeviceSpec(rating_a=17, standard="BS 88-2")
        )
    assert err.value.path == ("device", "rating_a")
