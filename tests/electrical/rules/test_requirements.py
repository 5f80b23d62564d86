"""The rules as data, per edition. Sources: the editions' names and dates (BS 7671:2018+A4:2026 published 15 April
2026, A2:2022 withdrawn 15 October 2026: several public summaries agree), and tests/data/requirements-rules.md."""

import pytest

from service.electrical.errors import InvalidInput
from service.electrical.inputs import Circuit, DeviceSpec, EvCharge
from service.electrical.rules import requirements
from tests.electrical.pipeline import B32, TWIN_2_5


def test_the_edition_in_force_is_the_default_and_both_are_known():
    assert requirements.default_edition() == "BS 7671:2018+A4:2026"
    assert requirements.editions() == ["BS 7671:2018+A4:2026", "BS 7671:2018+A2:2022"]
    with pytest.raises(InvalidInput):
        requirements.rule("BS 7671:2008", "sockets")


def test_a4_rules_say_they_are_carried_forward_from_a2():
    for name in ("sockets", "dwelling-lighting", "bathroom", "afdd", "rcd-type", "surge"):
        row = requirements.rule("BS 7671:2018+A4:2026", name)
        assert "carried forward from BS 7671:2018+A2:2022" in row["basis"] and row["confidence"]
    assert "withdrawn" in requirements.edition_caution("BS 7671:2018+A2:2022")


def test_the_editions_differ_where_public_summaries_report_it():
    a2, a4 = ("BS 7671:2018+A2:2022", "BS 7671:2018+A4:2026")
    assert (
        requirements.rule(a2, "afdd")["higher_risk_definition"]
        != requirements.rule(a4, "afdd")["higher_risk_definition"]
    )
    assert set(requirements.rule(a4, "rcd-type")["type_ac_accepted_for"]) < set(
        requirements.rule(a2, "rcd-type")["type_ac_accepted_for"]
    )


def test_nonsense_combinations_are_refused_naming_the_field():
    ev_on_sockets = Circuit(B32, TWIN_2_5, load="socket-outlets", ev=EvCharge(True))
    assert requirements.circuit_problem(ev_on_sockets, None).path == ("circuit", "ev")
    socket_rating_on_fixed = Circuit(B32, TWIN_2_5, load="fixed-equipment", socket_outlet_rating_a=13)
    assert requirements.circuit_problem(socket_rating_on_fixed, None).path == ("circuit", "socket_outlet_rating_a")
    assert requirements.circuit_problem(Circuit(B32, TWIN_2_5, location="moon"), None).path == ("circuit", "location")
    assert requirements.circuit_problem(Circuit(B32, TWIN_2_5), "BS 7671:1992").path == ("supply", "edition")


def test_the_device_the_rules_call_for():
    from service.electrical.results.circuit_result import Check

    failing = [Check("additional-protection", "fail", None, 30, "mA", "411.3.3", "required")]
    device, said = requirements.required_device(B32, failing, None, None)
    assert device.rcd.residual_current_ma == 30 and device.rcd.type == "A" and device.rcd.delay == "general"
    assert "30 mA RCD of type A" in said[0]
    device, _ = requirements.required_device(B32, failing, "ev-charge-point", EvCharge(dc_fault_detection=False))
    assert device.rcd.type == "B"  # 722.531.3.101: without d.c. detection in the charger, type B
    afdd = [Check("arc-fault-detection", "fail", None, None, "", "421.1.7", "required")]
    assert requirements.required_device(DeviceSpec(rating_a=32, standard="BS EN 60898", type="B"), afdd, None, None)[
        0
    ].afdd
    assert requirements.required_device(B32, [], None, None) == (B32, [])
