"""The bill of quantities: cable lengths by family and size (cables in parallel each, plus the allowance), devices
counted by standard, type, rating and RCD, priced where prices are given (invented demo figures)."""

import pytest

from service.electrical.cables.quantities import bill_of_quantities, run_cost
from service.electrical.inputs import Board, CableRun, Circuit, Conductors, DeviceSpec, Installation, Rcd, Supply

RUN = CableRun("flat-twin-earth-70c", "C")
SUPPLY = Supply(earthing="TN-C-S", u0_v=230, ze_ohm=0.35)


def circuit(ident, length, rating=20, parallel=1, rcd=None):
    device = DeviceSpec(rating_a=rating, standard="BS EN 60898", type="B", rcd=rcd)
    conductors = Conductors("copper", "thermoplastic-70", 2.5, 1.5, length, parallel_cables=parallel)
    return Circuit(device=device, conductors=conductors, id=ident, installation=RUN)


def test_lengths_counts_and_prices():
    board = Board("DB", (circuit("a", 20), circuit("b", 30, parallel=2), circuit("c", 10, rcd=Rcd(30, type="A"))))
    bill = bill_of_quantities(
        Installation(SUPPLY, (board,)),
        allowance_percent=10,
        prices={"cables": {("flat-twin-earth-70c", 2.5): 1.5}, "devices": {("BS EN 60898", "B", 20): 5.0}},
    )
    (cable,) = bill["cables"]
    assert cable["length_m"] == pytest.approx((20 + 2 * 30 + 10) * 1.1) and cable["cost"] == pytest.approx(99 * 1.5)
    plain, with_rcd = bill["devices"]
    # a device is priced by its standard, type and rating (the RCD it carries is said on its line)
    assert (plain["count"], plain["cost"]) == (2, 10.0) and (with_rcd["rcd"], with_rcd["count"]) == ("30 mA type A", 1)
    assert bill["unpriced_lines"] == 0 and bill["total_cost"] == pytest.approx(99 * 1.5 + 15.0)
    assert bill_of_quantities(Installation(SUPPLY, (board,)))["total_cost"] is None


def test_a_run_costs_its_price_and_an_unpriced_size_is_kept_dearer_than_any_priced_one():
    cost = run_cost({"cables": {("flat-twin-earth-70c", 2.5): 1.5}, "devices": {}})
    run = circuit("b", 30, parallel=2)
    assert cost(run, 2.5, 1.5) == pytest.approx(1.5 * 30 * 2)
    assert cost(run, 4.0, 1.5) > 1e6  # not in the price list: the design keeps to the sizes it can price
