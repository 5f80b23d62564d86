"""How a cable is run (the request's installation object) and the cable families GET /v1/cables lists."""

from __future__ import annotations

from marshmallow import post_load

from service.contract.fields import ContractSchema, Flag, Number, WholeNumber, choice
from service.electrical.cables import capacity
from service.electrical.inputs import CableRun, built
from service.electrical.rules import requirements

ALL_METHODS = sorted({m for cable in capacity.CABLES for m in capacity.methods(cable)})


class InstallationSchema(ContractSchema):
    cable = choice(
        capacity.CABLES,
        required=True,
        metadata={"description": "the cable family (its capacity table): GET /v1/cables"},
    )
    installation_method = choice(ALL_METHODS, required=True, metadata={"description": "a method of that table"})
    ambient_c = Number(minimum=-10, maximum=60, load_default=30.0)
    grouping = choice(capacity.GROUPINGS, load_default="bunched")
    grouped_circuits = WholeNumber(minimum=1, maximum=60, load_default=1)
    thermal_insulation_mm = Number(
        minimum=0,
        maximum=2000,
        load_default=0.0,
        metadata={"description": "length totally surrounded by insulation (Table 52.2)"},
    )
    ground_c = Number(minimum=0, maximum=40, metadata={"description": "method D: ground temperature (default 20)"})
    soil_resistivity_k_m_per_w = Number(
        minimum=0.5, maximum=3, metadata={"description": "method D: soil thermal resistivity"}
    )
    in_duct = Flag(load_default=False)
    reactance_mohm_per_m = Number(
        minimum=0,
        maximum=1,
        metadata={"description": "the cable's reactance per conductor, mohm/m: for a drop computed from resistance, "
                  "and, on a sub-main, in every fault figure below it"},
    )  # fmt: skip
    buried_spacing = choice(
        capacity.BURIED_SPACINGS, metadata={"description": "buried groupings: the clearance (Tables 4C2, 4C3)"}
    )
    capacity_a = Number(
        minimum=0.1, maximum=10000, metadata={"description": "It from the maker or the book, in place of the tables"}
    )
    voltage_drop_mv_per_a_m = Number(
        minimum=0.01, maximum=200, metadata={"description": "the cable's mV/A/m from the maker or the book"}
    )
    terminals_c = Number(
        minimum=60, maximum=250, metadata={"description": "the equipment's terminal rating, for cables above 70 degC"}
    )

    concealed_in_wall = choice(
        requirements.choices("concealed_in_wall"),
        metadata={"description": "concealed in a wall or partition: no, under-50-mm or 50-mm-or-deeper from the "
                  "surface (522.6.202); not stated: the additional-protection check asks for it unless a 30 mA RCD is "
                  "fitted"},
    )  # fmt: skip
    wall_has_metal_parts = Flag(
        metadata={"description": "the wall or partition's construction includes metallic parts other than fixings "
                  "(522.6.203)"}
    )  # fmt: skip
    earthed_metallic_covering = Flag(
        metadata={"description": "an earthed metallic covering: armour, earthed metal conduit or trunking, or "
                  "mechanical protection against nails and screws (522.6.202)"}
    )  # fmt: skip

    @post_load
    def make(self, data, **kwargs):
        return built(CableRun, data)
