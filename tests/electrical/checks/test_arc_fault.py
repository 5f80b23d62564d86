"""The arc-fault-detection check. Source: BS 7671:2018+A2:2022 421.1.7 (AFDDs to BS EN 62606 required for single-
phase AC final circuits supplying socket-outlets up to 32 A in higher-risk residential buildings, HMOs, purpose-
built student accommodation and care homes; recommended elsewhere), as in tests/data/requirements-rules.md."""

import dataclasses

from service.electrical.inputs import DeviceSpec
from service.electrical.results.verdicts import VERDICTS
from tests.electrical.pipeline import B32, BAKERY, TWIN_2_5, circuit, run, step

HMO = dataclasses.replace(BAKERY, premises="multiple-occupation")
HOME = dataclasses.replace(BAKERY, premises="dwelling")
WITH_AFDD = dataclasses.replace(B32, afdd=True)
WITHOUT = dataclasses.replace(B32, afdd=False)


def words(supply, *circuits):
    c = step(run(supply, *circuits), "arc-fault-detection")
    return [VERDICTS[v] for v in c.verdict.tolist()], c


def test_required_in_an_hmo():
    got, c = words(HMO, *(circuit(d, TWIN_2_5, load="socket-outlets") for d in (WITH_AFDD, WITHOUT, B32)))
    assert got == ["pass", "fail", "not-verified"] and "device.afdd" in c.note[2] and "421.1.7" in c.basis[0]


def test_only_recommended_in_a_house_a_caution_not_a_fail():
    got, c = words(HOME, circuit(WITHOUT, TWIN_2_5, load="socket-outlets"))
    assert got == ["pass"]
    ((mask, text),) = c.cautions
    assert mask.tolist() == [True] and "recommended" in text


def test_premises_not_stated_is_asked_for_and_fixed_equipment_is_not_judged():
    got, c = words(BAKERY, circuit(B32, TWIN_2_5, load="socket-outlets"), circuit(B32))
    assert got[0] == "not-verified" and "premises" in c.note[0]
    assert c.applies.tolist() == [True, False]


def test_sockets_above_32_a_and_three_phase_circuits_are_outside_the_rule():
    big = circuit(
        DeviceSpec(rating_a=63, standard="BS EN 60898", type="C", breaking_capacity_ka=6),
        load="socket-outlets",
        socket_outlet_rating_a=63,
    )
    _, c = words(HMO, big)
    assert c.applies.tolist() == [False]
