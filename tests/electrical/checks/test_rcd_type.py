"""The rcd-type check. Sources: BS 7671:2018+A2:2022 531.3.3 (type AC only for fixed equipment known to draw no
d.c. component; from memory), 722.531.3.101 (EV: type B, or type A/F with 6 mA d.c. detection; from memory), and
public summaries of A4:2026 (type A the minimum wherever d.c. components are foreseeable; one source), as in
tests/data/requirements-rules.md."""

import dataclasses

from service.electrical.inputs import DeviceSpec, EvCharge, Rcd
from service.electrical.results.verdicts import VERDICTS
from tests.electrical.pipeline import B32, BAKERY, TWIN_2_5, circuit, run, step

A4 = dataclasses.replace(BAKERY, premises="other")
A2 = dataclasses.replace(A4, edition="BS 7671:2018+A2:2022")


def rcbo(kind):
    return DeviceSpec(rating_a=32, standard="BS EN 61009", type="B", breaking_capacity_ka=6, rcd=Rcd(30, type=kind))


def words(supply, *circuits):
    c = step(run(supply, *circuits), "rcd-type")
    return [VERDICTS[v] for v in c.verdict.tolist()], c


def test_type_ac_on_sockets_fails_and_type_a_passes():
    got, c = words(
        A4, circuit(rcbo("AC"), TWIN_2_5, load="socket-outlets"), circuit(rcbo("A"), TWIN_2_5, load="socket-outlets")
    )
    assert got == ["fail", "pass"] and "531.3.3" in c.basis[0]


def test_an_rcd_of_unstated_type_is_not_verified_and_no_rcd_is_not_judged():
    got, c = words(A4, circuit(rcbo(None), TWIN_2_5, load="socket-outlets"), circuit(B32))
    assert got[0] == "not-verified" and "device.rcd.type" in c.note[0]
    assert c.applies.tolist() == [True, False]


def test_type_ac_on_a_shower_follows_the_edition():
    # A2:2022 read type AC as acceptable on fixed resistive loads (showers, cookers); public summaries of A4 narrow it
    shower = circuit(rcbo("AC"), equipment="shower")
    assert words(A2, shower)[0] == ["pass"]
    assert words(A4, shower)[0] == ["fail"]
    heater = circuit(rcbo("AC"), equipment="water-heater")
    assert words(A4, heater)[0] == ["pass"]


def test_an_ev_charge_point_needs_type_b_or_dc_detection():
    def ev(kind, dc):
        return circuit(rcbo(kind), equipment="ev-charge-point", ev=EvCharge(dc_fault_detection=dc))

    got, c = words(
        A4,
        ev("B", None),
        ev("A", True),
        ev("A", False),
        ev("A", None),
        ev("AC", True),
        circuit(B32, equipment="ev-charge-point"),
    )
    assert got == ["pass", "pass", "fail", "not-verified", "fail", "fail"]
    assert "722.531.3.101" in c.basis[0] and "ev.dc_fault_detection" in c.note[3]
