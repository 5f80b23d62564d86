"""The ev-earthing check. Source: BS 7671:2018+A2:2022 722.411.4.1 (a PME earthing facility is not used for a
charge point outdoors unless a listed measure applies: an earth electrode of its own, or a device that disconnects
on a broken PEN; from memory), as in tests/data/requirements-rules.md."""

import dataclasses

from service.electrical.inputs import EvCharge
from service.electrical.results.verdicts import VERDICTS
from tests.electrical.pipeline import B32, BAKERY, KIOSK, circuit, run, step

PME = dataclasses.replace(BAKERY, premises="dwelling")


def charger(measure, location="outdoors"):
    return circuit(B32, equipment="ev-charge-point", location=location, ev=EvCharge(earthing_measure=measure))


def words(supply, *circuits):
    c = step(run(supply, *circuits), "ev-earthing")
    return [VERDICTS[v] for v in c.verdict.tolist()], c


def test_outdoors_on_pme_needs_a_measure_against_a_broken_pen():
    got, c = words(PME, charger("none"), charger("open-pen-device"), charger("earth-electrode"), charger(None))
    assert got == ["fail", "pass", "pass", "not-verified"] and "722.411.4.1" in c.basis[0]


def test_tt_and_indoors_are_outside_the_rule_and_an_unstated_location_is_asked_for():
    assert words(KIOSK, charger("none"))[0] == ["pass"]
    assert words(PME, charger("none", "general"))[0] == ["pass"]
    got, c = words(PME, charger("none", None))
    assert got == ["not-verified"] and "location" in c.note[0]


def test_only_charge_points_are_judged():
    _, c = words(PME, circuit(B32), charger("none"))
    assert c.applies.tolist() == [False, True]
