"""The breaking-capacity check (BS 7671:2018 434.5.1)."""

from service.electrical.model import DeviceSpec
from service.electrical.verdicts import VERDICTS
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


def test_a_breaker_without_its_capacity_is_not_verified():
    c = step(run(BAKERY, circuit(DeviceSpec(rating_a=32, standard="BS EN 60898", type="B"))), "breaking-capacity")
    assert VERDICTS[c.verdict[0]] == "not-verified" and "breaking_capacity_ka" in c.note[0]
