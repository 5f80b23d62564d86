"""The additional-protection check: a 30 mA RCD where the rules call for one.

Sources: BS 7671:2018+A2:2022 411.3.3 (socket-outlets up to 32 A), 411.3.4 (luminaires in dwellings), 415.1.1
(IΔn <= 30 mA, general type), 522.6.202/203 (cables concealed in walls), 701.411.3.3 (bathrooms), 722.531.2.101
(EV charge points, from memory), as summarised in tests/data/requirements-rules.md; carried forward to A4:2026.
"""

import dataclasses

from service.electrical.inputs import CableRun, DeviceSpec, EvCharge, Rcd
from service.electrical.results.verdicts import VERDICTS
from tests.electrical.pipeline import B32, BAKERY, TWIN_2_5, circuit, run, step

SHOP = dataclasses.replace(BAKERY, premises="other")
HOME = dataclasses.replace(BAKERY, premises="dwelling")
SURFACE = CableRun("flat-twin-earth-70c", "C", concealed_in_wall="no")
PLAIN_B32 = B32
RCBO_30 = DeviceSpec(rating_a=32, standard="BS EN 61009", type="B", breaking_capacity_ka=6, rcd=Rcd(30, type="A"))


def verdicts_of(supply, *circuits):
    c = step(run(supply, *circuits), "additional-protection")
    return [VERDICTS[v] for v in c.verdict.tolist()], c


def test_a_socket_ring_on_a_plain_breaker_fails_and_with_a_30_ma_rcbo_passes():
    # 411.3.3: socket-outlets up to 32 A need a 30 mA RCD
    plain = circuit(PLAIN_B32, TWIN_2_5, load="socket-outlets", installation=SURFACE, location="general")
    fitted = circuit(RCBO_30, TWIN_2_5, load="socket-outlets", installation=SURFACE, location="general")
    words, c = verdicts_of(SHOP, plain, fitted)
    assert words == ["fail", "pass"]
    assert c.note[0] == "required, and no RCD is fitted" and "411.3.3" in c.basis[0]
    assert c.limit.tolist() == [30, 30] and c.value[1] == 30


def test_a_100_ma_or_a_time_delayed_rcd_does_not_count():
    # 415.1.1: additional protection is an RCD of IΔn <= 30 mA operating within 40 ms at 5 IΔn (not type S)
    rcd_100 = dataclasses.replace(RCBO_30, rcd=Rcd(100, type="A"))
    rcd_s = dataclasses.replace(RCBO_30, rcd=Rcd(300, delay="S", type="A"))
    delayed_30 = dataclasses.replace(RCBO_30, rcd=Rcd(30, delay="S", type="A"))
    kw = {"load": "socket-outlets", "installation": SURFACE, "location": "general"}
    words, c = verdicts_of(SHOP, *(circuit(d, TWIN_2_5, **kw) for d in (rcd_100, rcd_s, delayed_30)))
    assert words == ["fail", "fail", "fail"]
    assert "above 30 mA" in c.note[0] and "time-delayed" in c.note[1] and "time-delayed" in c.note[2]


def test_a_shower_and_every_circuit_of_a_bathroom_need_one():
    # 701.411.3.3: every circuit of a location containing a bath or shower
    shower = circuit(PLAIN_B32, equipment="shower", installation=SURFACE)
    towel_rail = circuit(PLAIN_B32, equipment="heating", location="bathroom", installation=SURFACE)
    words, c = verdicts_of(SHOP, shower, towel_rail)
    assert words == ["fail", "fail"] and all("701.411.3.3" in b for b in c.basis.tolist())


def test_lighting_in_a_dwelling_needs_one_and_elsewhere_does_not():
    # 411.3.4: in dwellings, AC final circuits supplying luminaires
    lights = circuit(PLAIN_B32, equipment="lighting", location="general", installation=SURFACE)
    assert verdicts_of(HOME, lights)[0] == ["fail"]
    assert verdicts_of(SHOP, lights)[0] == ["pass"]
    # the circuit's use (lighting, for the voltage drop) says it supplies luminaires too
    by_use = circuit(PLAIN_B32, use="lighting", location="general", installation=SURFACE)
    assert verdicts_of(HOME, by_use)[0] == ["fail"]


def test_a_cable_concealed_under_50_mm_without_an_earthed_covering_needs_one():
    # 522.6.202: less than 50 mm deep and no earthed metallic covering; 522.6.203: a wall with metal parts
    shallow = CableRun("flat-twin-earth-70c", "C", concealed_in_wall="under-50-mm", earthed_metallic_covering=False)
    armoured = dataclasses.replace(shallow, earthed_metallic_covering=True)
    metal = CableRun("flat-twin-earth-70c", "C", concealed_in_wall="50-mm-or-deeper", wall_has_metal_parts=True)
    kw = {"equipment": "cooker", "location": "general"}
    words, c = verdicts_of(SHOP, *(circuit(PLAIN_B32, installation=i, **kw) for i in (shallow, armoured, metal)))
    assert words == ["fail", "pass", "fail"]
    assert "522.6.202" in c.basis[0] and "522.6.203" in c.basis[2]


def test_a_fact_not_stated_is_named_and_never_a_silent_pass():
    # nothing new stated: the depth in the wall, the location, the equipment and the premises decide (common practice
    # that a missing fact is asked for, not guessed)
    bare = circuit(PLAIN_B32)
    words, c = verdicts_of(BAKERY, bare)
    assert words == ["not-verified"]
    for field in ("installation.concealed_in_wall", "location", "equipment, or premises"):
        assert field in c.note[0]
    # a 30 mA RCD settles it whatever was left unsaid
    assert verdicts_of(BAKERY, circuit(RCBO_30))[0] == ["pass"]


def test_an_ev_charge_point_needs_its_own_30_ma_rcd():
    # 722.531.2.101 (from memory)
    ev = circuit(PLAIN_B32, equipment="ev-charge-point", location="outdoors", installation=SURFACE, ev=EvCharge())
    words, c = verdicts_of(SHOP, ev)
    assert words == ["fail"] and "722.531.2.101" in c.basis[0]


def test_a_special_location_whose_rules_are_not_modelled_is_not_verified_even_with_an_rcd():
    # requirements-rules.md: a named location whose rules are not modelled is never a silent pass
    pool = circuit(RCBO_30, equipment="heating", location="swimming-pool", installation=SURFACE)
    words, c = verdicts_of(SHOP, pool)
    assert words == ["not-verified"] and "not modelled" in c.note[0]


def test_the_basis_names_the_edition_asked_for():
    a2 = dataclasses.replace(SHOP, edition="BS 7671:2018+A2:2022")
    plain = circuit(PLAIN_B32, TWIN_2_5, load="socket-outlets", installation=SURFACE, location="general")
    _, c = verdicts_of([SHOP, a2], plain, plain)
    assert c.basis[0].startswith("BS 7671:2018+A4:2026 411.3.3") and "carried forward" in c.basis[0]
    assert c.basis[1].startswith("BS 7671:2018+A2:2022 411.3.3") and "carried forward" not in c.basis[1]
