"""A result's shape is declared once (service.electrical.results.shapes): every figure the pipeline gives has its
declaration, every declaration its figure, and the lean and CSV columns come from the declarations."""

import dataclasses

from service.electrical.inputs import CableRun
from service.electrical.pipeline import check_circuits
from service.electrical.results.circuit_result import CircuitResult
from service.electrical.results.shapes import csv_figures, lean_figures
from tests.electrical.pipeline import BAKERY, KIOSK, RCBO_B16, TWIN_2_5, circuit


def _declared(shape) -> set[str]:
    return {f.metadata.get("key") or f.name for f in dataclasses.fields(shape)}


def test_every_detail_the_checks_give_is_its_declared_shape_and_no_more():
    # invented demo circuits: a bakery's fixed load with its cable run stated, and a garden kiosk on TT
    run = CableRun("flat-twin-earth-70c", "C")
    results = check_circuits(
        [BAKERY, KIOSK], [circuit(design_current_a=20, installation=run), circuit(device=RCBO_B16, conductors=TWIN_2_5)]
    )
    for result in results:
        assert set(vars(result)) == {f.name for f in dataclasses.fields(CircuitResult)}
        for f in dataclasses.fields(CircuitResult):
            shape, value = f.metadata.get("shape"), getattr(result, f.name)
            if shape is not None and value is not None:
                assert set(value) == _declared(shape), f.name


def test_the_lean_and_csv_columns_are_made_from_the_declarations():
    assert lean_figures(CircuitResult, "text") == ("prospective_fault_current_basis", "max_disconnection_basis")
    assert "zs_ohm" in lean_figures(CircuitResult, "cell") and "device" not in lean_figures(CircuitResult, "cell")
    columns = csv_figures(CircuitResult)
    assert columns[0] == ("r1_plus_r2_ohm", ("r1_plus_r2_ohm",))
    assert ("min_cpc_csa_mm2", ("protective_conductor", "min_csa_mm2")) in columns
