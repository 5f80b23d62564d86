"""The breaking-capacity check (BS 7671:2018 434.5.1)."""

import numpy as np

from service.electrical.inputs import DeviceSpec, Supply
from service.electrical.results.verdicts import VERDICTS
from tests.electrical.pipeline import BAKERY, circuit, run, step


def test_rated_capacity_against_the_prospective_fault_current():
    # 2.1 kA stated at the origin: 6 kA passes, 1.5 kA fails
    low = DeviceSpec(rating_a=32, standard="BS EN 60898", type="B", breaking_capacity_ka=1.5)
    c = step(run(BAKERY, circuit(), circuit(low)), "breaking-capacity")
    assert [VERDICTS[v] for v in c.verdict] == ["pass", "fail"] and c.value.tolist() == [2.1, 2.1]


def test_a_fuse_takes_its_familys_minimum_with_a_caution():
    # BS 88-2 minimum 50 kA (fuse_families.json, from memory)
    c = step(run(BAKERY, circuit(DeviceSpec(rating_a=32, standard="BS 88-2"))), "breaking-capacity")
    assert VERDICTS[c.verdict[0]] == "pass" and c.limit[0] == 50 and "minimum rated breaking capacity" in c.note[0]
    assert c.cautions[0][0][0]


def test_a_breaker_without_its_capacity_takes_the_smallest_standard_value():
    # BS EN 60898-1: Icn at least 1.5 kA (from memory). Below 2.1 kA that cannot show the breaker is enough.
    c = step(run(BAKERY, circuit(DeviceSpec(rating_a=32, standard="BS EN 60898", type="B"))), "breaking-capacity")
    assert VERDICTS[c.verdict[0]] == "not-verified" and "breaking_capacity_ka" in c.note[0] and c.limit[0] == 1.5


def test_a_consumer_units_conditional_rating_carries_a_6_ka_breaker():
    # BS 7671:2018 536.4.203, BS EN 61439-3 Annex ZB: 16 kA behind a BS 88-3 cut-out fuse (from memory)
    high = Supply("TN-C-S", 230, 0.05, prospective_fault_current_ka=16)
    plain, in_unit = circuit(), circuit(conditional_short_circuit_ka=16)
    c = step(run(high, plain, in_unit), "breaking-capacity")
    assert [VERDICTS[v] for v in c.verdict] == ["fail", "pass"] and "61439-3" in c.basis[1]


def test_tt_never_derives_the_fault_level_from_ze():
    # Ze holds the electrode in TT: 21 ohm would give 0.012 kA; a 1 kA BS 3036 fuse cannot be shown adequate
    kiosk = Supply("TT", 230, 21, electrode_ohm=20)
    c = step(run(kiosk, circuit(DeviceSpec(rating_a=30, standard="BS 3036"))), "breaking-capacity")
    assert VERDICTS[c.verdict[0]] == "not-verified" and np.isnan(c.value[0]) and "in TT" in c.note[0]
