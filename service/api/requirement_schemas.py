"""The request's parts for the rules beyond the calculations: the edition, the premises, an EV charge point."""

from __future__ import annotations

import dataclasses

from marshmallow import Schema, fields, post_load

from ..electrical import requirements
from ..electrical.model import EvCharge, built
from .fields import Flag, Number, choice


class EvSchema(Schema):
    dc_fault_detection = Flag(
        metadata={"description": "d.c. fault detection (6 mA, an RDC-DD) in the charge point (722.531.3.101)"}
    )
    earthing_measure = choice(
        requirements.choices("ev_earthing_measures"),
        metadata={"description": "on a PME supply outdoors: open-pen-device, earth-electrode or none (722.411.4.1)"},
    )

    @post_load
    def make(self, data, **kwargs):
        return built(EvCharge, data)


class CircuitFactsSchema(Schema):
    """What a circuit supplies and where (a base of the circuit schemas)."""

    equipment = choice(
        requirements.choices("equipment"),
        metadata={"description": "final circuits: what it supplies (lighting, a shower, an EV charge point ...)"},
    )
    socket_outlet_rating_a = Number(
        minimum=1,
        maximum=125,
        metadata={"description": "socket-outlet circuits: the largest socket-outlet's rating (not given: up to 32 A)"},
    )
    location = choice(
        requirements.choices("locations"),
        metadata={"description": "where a final circuit's equipment is: general, bathroom, outdoors, or a special "
                  "location (whose rules are not modelled: not-verified)"},
    )  # fmt: skip
    ev = fields.Nested(EvSchema, metadata={"description": "an EV charge point (equipment ev-charge-point) only"})


def edition_field() -> fields.String:
    return choice(
        requirements.editions(),
        load_default=requirements.default_edition(),
        metadata={"description": "the edition of BS 7671 the rules are applied under (default: the one in force); "
                  "the answer names it"},
    )  # fmt: skip


def premises_field() -> fields.String:
    return choice(
        requirements.choices("premises"),
        metadata={"description": "the kind of premises (411.3.4, 421.1.7); not stated: the checks that depend on it "
                  "ask for it"},
    )  # fmt: skip


def with_edition(data: dict) -> dict:
    """The request's edition and premises carried onto its supply (the core reads them there)."""
    changes = {"edition": data["edition"]}
    if "premises" in data:
        changes["premises"] = data["premises"]
    data["supply"] = dataclasses.replace(data["supply"], **changes)
    return data
