"""The contract's response schemas are made from the core's result dataclasses (service.contract.shapes)."""

import dataclasses

from service.contract.result_schemas import CircuitResultSchema, SelectivityResultSchema
from service.contract.shapes import schema_of
from service.electrical.checks.overload import OverloadResult
from service.electrical.results.shapes import figure


def test_a_new_figure_is_one_declaration():
    # what a new field of a check's result takes: one line in its dataclass, and the contract's schema has it
    @dataclasses.dataclass
    class Widened(OverloadResult):
        ambient_c: float | None = figure("the ambient temperature the factors were read at", default=None)

    schema = schema_of(Widened)()
    assert schema.fields["ambient_c"].metadata["description"].startswith("the ambient")
    assert schema.fields["ambient_c"].allow_none and schema.fields["design_current_a"].required


def test_the_declarations_become_the_fields_of_the_contract():
    fields = CircuitResultSchema().fields
    assert not fields["zs_ohm"].allow_none and fields["r1_plus_r2_ohm"].allow_none
    assert fields["zs_ohm"].metadata["description"] == "Ze + R1+R2"
    assert SelectivityResultSchema().fields["with_"].data_key == "with"  # a name Python cannot spell
    assert fields["checks"].inner.nested.__name__ == "CheckResultSchema"
