"""The inputs of the core: frozen, hashable, with the defaults a request leaves out."""

from service.electrical.inputs import Circuit, Conductors, DeviceSpec, Rcd, Supply


def test_defaults_and_hashing():
    supply = Supply("TN-S", 230, 0.8)
    assert (supply.current_kind, supply.bonding_complete, supply.c_max) == ("ac", False, None)
    spec = DeviceSpec(rating_a=32, standard="BS EN 61009", type="B", rcd=Rcd(30))
    assert spec.rcd.delay == "general" and hash(spec) == hash(
        DeviceSpec(rating_a=32, standard="BS EN 61009", type="B", rcd=Rcd(30))
    )
    conductors = Conductors("copper", "thermoplastic-70", 2.5, 1.5, 20)
    assert (conductors.cpc_arrangement, conductors.parallel_cables, conductors.conductor_class) == ("in-cable", 1, 2)
    assert Circuit(device=spec).role == "final"


def test_the_curve_key_ignores_what_does_not_change_the_curve():
    a = DeviceSpec(rating_a=32, standard="BS EN 60898", type="B", breaking_capacity_ka=6)
    b = DeviceSpec(rating_a=32.0, standard="BS EN 60898", type="B", breaking_capacity_ka=10, let_through_a2s=20_000)
    assert a.curve_key == b.curve_key
