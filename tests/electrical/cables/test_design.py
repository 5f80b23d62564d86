"""Designing an installation in the core (service.electrical.cables.design); the API's tests are in
tests/api/test_design.py. Invented demo: a shop's board fed from its main board."""

from service.electrical.cables.design import design_installation
from service.electrical.cables.design_search import Unknown
from service.electrical.inputs import Board, CableRun, Circuit, Conductors, DeviceSpec, Installation, Supply

SUPPLY = Supply(earthing="TN-C-S", u0_v=230, ze_ohm=0.35, prospective_fault_current_ka=3)
TWIN = CableRun("flat-twin-earth-70c", "C")


def test_each_left_out_size_is_the_smallest_the_check_passes():
    # a 3 kW heater (13 A) 30 m away: 1.5 mm2 carries it (Table 4D5 19.5 A clipped, from memory) and drops
    # 29 mV/A/m x 13 A x 30 m = 11.3 V, 4.9 % of 230 V: within 5 %; the design keeps 1.5 mm2 and a 16 A breaker
    heater = Circuit(
        device=DeviceSpec(rating_a=1, standard="BS EN 60898", type="B", breaking_capacity_ka=6),
        conductors=Conductors("copper", "thermoplastic-70", 1, 1, 30),
        id="heater",
        design_current_a=13,
        load="fixed-equipment",
        installation=TWIN,
    )
    main = Board("MAIN", (heater,), device=DeviceSpec(rating_a=100, standard="BS 88-3"))
    design = design_installation(Installation(SUPPLY, (main,)), {(0, 0): Unknown(True, True, True)})
    slot = design.slots[(0, 0)]
    assert design.feasible and slot.rating == 16 and slot.size == (1.5, 1.0)
    heater_result = design.result.boards[0].circuits[0]
    assert heater_result.verdict != "fail"
