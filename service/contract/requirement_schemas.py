"""The request's parts for the rules beyond the calculations: the edition, the premises, an EV charge point."""

from __future__ import annotations

import dataclasses

from marshmallow import ValidationError, fields, post_load, validate

from service.contract.fields import ContractSchema, Flag, Number, WholeNumber, choice
from service.electrical.devices import defaults as device_defaults
from service.electrical.devices.catalogue import standards, types
from service.electrical.errors import ElectricalError
from service.electrical.inputs import DeviceDefaults, EvCharge, built
from service.electrical.rules import requirements


class EvSchema(ContractSchema):
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


class CircuitFactsSchema(ContractSchema):
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


class LetThroughPointSchema(ContractSchema):
    prospective_current_a = Number(minimum=1, maximum=1e6, required=True)
    i2t_a2s = Number(minimum=1, maximum=1e10, required=True, metadata={"description": "let-through energy, A2s"})


def let_through_curve_field() -> fields.List:
    return fields.List(
        fields.Nested(LetThroughPointSchema),
        validate=validate.Length(min=2, max=50),
        metadata={"description": "the maker's let-through I2t against prospective current, read on log-log axes "
                  "between points; below the first point its energy, above the last point nothing"},
    )  # fmt: skip


def curve_of(points) -> tuple[tuple[float, float], ...]:
    return tuple((p["prospective_current_a"], p["i2t_a2s"]) for p in points)


class DeviceDefaultsSchema(ContractSchema):
    standard = choice(standards(), required=True)
    type = choice(types(), metadata={"description": "omit: every type of the standard"})
    breaking_capacity_ka = Number(minimum=0.1, maximum=200)
    energy_limiting_class = WholeNumber(minimum=1, maximum=3)
    let_through_curve = let_through_curve_field()

    @post_load
    def make(self, data, **kwargs):
        if "let_through_curve" in data:
            data["let_through_curve"] = curve_of(data["let_through_curve"])
        return built(DeviceDefaults, data)


def device_defaults_field() -> fields.List:
    return fields.List(
        fields.Nested(DeviceDefaultsSchema),
        validate=validate.Length(min=1, max=50),
        metadata={"description": "the maker's data said once: every device of that standard and type takes the "
                  "fields it does not state itself"},
    )  # fmt: skip


class JobSchema(ContractSchema):
    """What a request says once for the whole job, beside its supply: the edition, the premises, the maker's data.
    A base of every request that carries a supply; its edition and premises go onto the supply (the core reads them
    there) and its devices are completed from the defaults."""

    edition = edition_field()
    premises = premises_field()
    device_defaults = device_defaults_field()

    @post_load
    def onto_supply(self, data, **kwargs):
        data = with_edition(data) if "supply" in data else data
        given = data.get("device_defaults")
        if given:
            try:
                device_defaults.check_defaults(given)
            except ElectricalError as err:
                raise ValidationError(err.message, "device_defaults") from None
            self.complete_devices(data, given)
        return data

    def complete_devices(self, data: dict, given: list) -> None:
        """The request's devices completed from its ``device_defaults``: a single circuit, a batch's circuits, an
        installation's boards and their circuits, the device family sizing chooses from. A request that holds its
        circuits otherwise (test-results/verify) says how by overriding this."""
        if "circuit" in data:
            data["circuit"] = device_defaults.with_defaults_of(data["circuit"], given)
        if "device" in data:
            data["device"] = device_defaults.with_defaults(data["device"], given)
        if isinstance(data.get("circuits"), list):
            data["circuits"] = device_defaults.apply(data["circuits"], given)
        for board in data.get("boards", []):
            board["circuits"] = device_defaults.apply(board["circuits"], given)
            if board.get("device") is not None:
                board["device"] = device_defaults.with_defaults(board["device"], given)


HEAD = tuple(JobSchema._declared_fields)  # edition, premises, device_defaults: what a request says once at its head
