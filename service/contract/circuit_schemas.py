"""Request schemas shared by the resources (responses: result_schemas.py).

Every number has physically plausible bounds, so that no valid input can overflow a formula;
every choice is an enum; unknown fields are refused (marshmallow's default, RAISE).
Requests load into the core's dataclasses; responses dump the core's results.
"""

from __future__ import annotations

import dataclasses

from marshmallow import ValidationError, fields, post_load, validate, validates_schema

from service.contract import fastload
from service.contract.cable_schemas import InstallationSchema
from service.contract.fastload import Refused, fast_load
from service.contract.fields import ContractSchema, Flag, Number, Text, WholeNumber, choice
from service.contract.item_lists import PerItemList
from service.contract.requirement_schemas import CircuitFactsSchema, JobSchema, curve_of, let_through_curve_field
from service.electrical.cables import capacity, protective
from service.electrical.cables import conductors as cond
from service.electrical.checks import CHECKS
from service.electrical.circuit_arrays import PHASES
from service.electrical.devices import catalogue, residual
from service.electrical.devices.let_through import ENERGY_CLASSES
from service.electrical.inputs import Circuit, Conductors, DeviceSpec, Rcd, Supply, built, electrode_problem
from service.electrical.rules import disconnection, requirements

DEVICE_STANDARDS = catalogue.standards()
RATED_CURRENT = "the supply's rated current (the cut-out fuse or service rating): the origin's demand (311.1)"
X_OVER_R = (
    "the supply impedance's X/R at the origin; not given: the largest currents below it take the least any angle allows"
)
DEVICE_TYPES = catalogue.types()


# ---------------------------------------------------------------- requests


def phases_field(description: str) -> WholeNumber:
    """1 or 3 phases: a bounded whole number (a numeric enum would trouble client generators)."""
    return WholeNumber(minimum=1, maximum=3, load_default=1, metadata={"description": description})


def check_phases(data) -> None:
    if data.get("phases", 1) not in (1, 3):
        raise ValidationError("phases is 1 (single-phase) or 3 (three-phase)", "phases")
    if data.get("phases") == 3 and "phase" in data:
        raise ValidationError("a three-phase circuit is on every phase: omit phase", "phase")


class FastSchema(ContractSchema):
    """A request schema loaded by the compiled fast path first (service.contract.fastload), marshmallow
    itself only when the fast path refuses: the same result, and marshmallow's messages on errors.

    Used where it pays (measured: about 17 us against 167 us for a single check request): the single
    check; batch items and schedule rows go through :class:`PerItemList` and the CLI."""

    def load(self, data, *, many=None, partial=None, unknown=None):
        if not many and not partial and unknown is None:
            try:
                return fast_load(self, data)
            except Refused:
                pass
        return super().load(data, many=many, partial=partial, unknown=unknown)


class CurvePointSchema(ContractSchema):
    current_a = Number(minimum=0.001, maximum=1e6, required=True)
    time_s = Number(minimum=0.0001, maximum=1e5, required=True, metadata={"description": "maximum operating time"})


def energy_class_field() -> WholeNumber:
    """The energy-limiting class marked on a breaker (BS EN 60898-1 Annex ZA), for every device schema."""
    return WholeNumber(
        minimum=min(ENERGY_CLASSES),
        maximum=max(ENERGY_CLASSES),
        metadata={
            "description": "1, 2 or 3 as marked on a BS EN 60898 / 61009 breaker of type B or C up to 32 A "
            "(BS EN 60898-1 Annex ZA); default 3, said in the result"
        },
    )


class RcdSchema(ContractSchema):
    residual_current_ma = Number(minimum=1, maximum=3000, required=True, metadata={"description": "IΔn, mA"})
    delay = choice(residual.delays(), load_default="general", metadata={"description": "general, or S (time-delayed)"})
    type = choice(requirements.choices("rcd_types"), metadata={"description": "AC, A, F or B (531.3.3)"})

    @post_load
    def make(self, data, **kwargs):
        return built(Rcd, data)


class DeviceSchema(ContractSchema):
    standard = choice(
        DEVICE_STANDARDS, metadata={"description": "omit, and give curve_points, for a device of your own"}
    )
    type = choice(
        DEVICE_TYPES, metadata={"description": "B, C or D for circuit-breakers; gG (or omit) for BS 88 fuses"}
    )
    rating_a = Number(minimum=0.1, maximum=1000, required=True, metadata={"description": "In, A"})
    breaking_capacity_ka = Number(
        minimum=0.1, maximum=200, metadata={"description": "rated short-circuit capacity (Icn), kA"}
    )
    curve_points = fields.List(
        fields.Nested(CurvePointSchema),
        validate=validate.Length(min=2, max=100),
        metadata={"description": "maximum operating times, e.g. from the maker's curve"},
    )
    rcd = fields.Nested(RcdSchema, metadata={"description": "the residual part of an RCBO, or an RCD in the circuit"})
    let_through_a2s = Number(
        minimum=1, maximum=1e10, metadata={"description": "maker's let-through I^2 t, A^2 s, for times below 0.1 s"}
    )
    energy_limiting_class = energy_class_field()

    ir_a = Number(
        minimum=0.1,
        maximum=10000,
        metadata={
            "description": "adjustable breakers (BS EN 60947-2): the long-time setting Ir, A (default: the frame)"
        },
    )
    ii_a = Number(
        minimum=0.1, maximum=1e6, metadata={"description": "adjustable breakers: the instantaneous setting Ii, A"}
    )
    isd_a = Number(
        minimum=0.1, maximum=1e6, metadata={"description": "adjustable breakers: the short-time pickup Isd, A"}
    )
    tsd_s = Number(
        minimum=0.01, maximum=5, metadata={"description": "adjustable breakers: the short-time delay tsd, s"}
    )
    afdd = Flag(metadata={"description": "an arc fault detection device (BS EN 62606) at the circuit's origin"})
    let_through_curve = let_through_curve_field()

    @validates_schema
    def standard_or_points(self, data, **kwargs):
        if "standard" not in data and "curve_points" not in data:
            raise ValidationError("give a standard, or curve_points for a device of your own", "standard")
        if "standard" in data and "curve_points" in data and not catalogue.takes_curve_points(data["standard"]):
            raise ValidationError(
                "give either a standard or curve_points (the maker's points only beside settings)", "curve_points"
            )

    @post_load
    def make(self, data, **kwargs):
        points = data.pop("curve_points", None)
        if points is not None:
            data["curve_points"] = tuple((p["current_a"], p["time_s"]) for p in points)
        if "let_through_curve" in data:
            data["let_through_curve"] = curve_of(data["let_through_curve"])
        return built(DeviceSpec, data)


class ConductorsSchema(ContractSchema):
    material = choice(cond.MATERIALS, required=True)
    insulation = choice(cond.insulation_names(), required=True)
    line_csa_mm2 = Number(minimum=0.5, maximum=630, required=True)
    cpc_csa_mm2 = Number(
        minimum=0.5, maximum=630, required=True, metadata={"description": "cpc size; for armour, its cross-section"}
    )
    length_m = Number(
        minimum=0, maximum=5000, required=True, metadata={"description": "route length; for a ring, the whole ring"}
    )
    cpc_arrangement = choice(protective.ARRANGEMENTS, load_default="in-cable")
    ring = Flag(load_default=False)
    parallel_cables = WholeNumber(minimum=1, maximum=20, load_default=1)
    conductor_class = WholeNumber(
        minimum=1, maximum=2, load_default=2, metadata={"description": "IEC 60228 class: 1 solid, 2 stranded"}
    )
    cpc_material = choice(
        protective.CPC_MATERIALS,
        metadata={"description": "default: the line material; steel for armour, sheath or conduit"},
    )
    cpc_resistance_mohm_per_m = Number(
        minimum=0.01, maximum=1000, metadata={"description": "maker's cpc (e.g. armour) resistance at 20 degC"}
    )
    bare_condition = choice(protective.BARE_CONDITIONS, metadata={"description": "for a bare cpc (Table 54.6)"})
    cores = WholeNumber(
        minimum=2,
        maximum=5,
        metadata={"description": "an armoured multicore cable's cores: the armour's resistance without the maker's"},
    )

    @validates_schema
    def one_cable_or_parallel(self, data, **kwargs):
        if data.get("ring") and data.get("parallel_cables", 1) > 1:
            raise ValidationError("a ring final circuit is one cable: not run in parallel cables", "parallel_cables")

    @post_load
    def make(self, data, **kwargs):
        return built(Conductors, data)


class SupplySchema(ContractSchema):
    earthing = choice(disconnection.EARTHING, required=True)
    u0_v = Number(minimum=50, maximum=1000, required=True, metadata={"description": "nominal line to earth voltage"})
    ze_ohm = Number(
        minimum=0.001,
        maximum=2000,
        required=True,
        metadata={"description": "external loop impedance; for TT including RA"},
    )
    prospective_fault_current_ka = Number(
        minimum=0.001,
        maximum=200,
        metadata={
            "description": "the larger of line-neutral and line-earth at the origin (434.1), measured or declared; "
            "if omitted: from the line-neutral loop, or (TN only) U0 x cmax / Ze"
        },
    )
    line_neutral_loop_ohm = Number(
        minimum=0.001,
        maximum=100,
        metadata={
            "description": "line-neutral loop impedance at the origin, measured or declared (for short circuits)"
        },
    )
    c_max = Number(
        minimum=1.05,
        maximum=1.10,
        metadata={"description": "IEC 60909-0 cmax: 1.05 (+6 % systems) to 1.10 (+10 %, the default)"},
    )
    electrode_ohm = Number(minimum=0.01, maximum=10000, metadata={"description": "TT: earth electrode resistance RA"})
    bonding_complete = Flag(
        load_default=False,
        metadata={
            "description": "TT: protective equipotential bonding complete (allows TN times for overcurrent devices)"
        },
    )
    current_kind = choice(disconnection.CURRENT_KINDS, load_default="ac")
    reduced_low_voltage = Flag(load_default=False, metadata={"description": "a reduced low voltage system (411.8)"})
    phases = phases_field("the supply: 1 (230 V) or 3 (230/400 V)")
    three_phase_fault_current_ka = Number(
        minimum=0.001,
        maximum=200,
        metadata={"description": "symmetrical three-phase fault current at the origin; if omitted on three phases: "
                  "twice the line-neutral value (common practice), said in the result"},
    )  # fmt: skip
    max_earth_fault_current_ka = Number(
        minimum=0.001,
        maximum=200,
        metadata={"description": "the largest earth fault at the origin (default U0 x cmax / Ze)"},
    )
    supply_kind = choice(
        capacity.SUPPLY_KINDS,
        load_default="public",
        metadata={"description": "public (a distributor's low voltage supply) or private, for the voltage drop limits"},
    )

    rated_current_a = Number(minimum=1, maximum=10000, metadata={"description": RATED_CURRENT})
    x_over_r = Number(minimum=0, maximum=50, metadata={"description": X_OVER_R})

    @validates_schema
    def one_or_three_phases(self, data, **kwargs):
        check_phases(data)

    @validates_schema
    def electrode_within_ze(self, data, **kwargs):
        message = electrode_problem(data.get("earthing"), data.get("ze_ohm"), data.get("electrode_ohm"))
        if message is not None:  # the core's rule (inputs.electrode_problem), said at both fields
            raise ValidationError({"ze_ohm": [message], "electrode_ohm": [message]})

    @post_load
    def make(self, data, **kwargs):
        return built(Supply, data)


class CircuitSchema(CircuitFactsSchema):
    id = Text(max_length=200, metadata={"description": "your reference, echoed in the result"})
    role = choice(disconnection.ROLES, required=True)
    load = choice(disconnection.LOADS, metadata={"description": "final circuits: what it supplies"})
    design_current_a = Number(minimum=0.01, maximum=10000, metadata={"description": "Ib, A"})
    device = fields.Nested(DeviceSchema, required=True)
    conductors = fields.Nested(ConductorsSchema)
    r1_plus_r2_ohm = Number(
        minimum=0,
        maximum=100,
        metadata={"description": "a known R1+R2 at operating temperature, in place of the conductor calculation"},
    )
    neutral_csa_mm2 = Number(
        minimum=0.5,
        maximum=630,
        metadata={"description": "for line-neutral faults; default: the line conductor's size"},
    )
    installation = fields.Nested(
        InstallationSchema, metadata={"description": "how the cable is run: with design_current_a, the overload check"}
    )
    conditional_short_circuit_ka = Number(
        minimum=0.1,
        maximum=200,
        metadata={
            "description": "the board's conditional short-circuit rating with its upstream device "
            "(a consumer unit to BS EN 61439-3 Annex ZB, e.g. 16 kA behind a BS 88-3 cut-out fuse)"
        },
    )
    phases = phases_field("the circuit: 1 or 3; a three-phase circuit needs a three-phase supply")
    phase = choice(PHASES, metadata={"description": "a single-phase circuit on three phases: the phase it is on"})
    use = choice(capacity.USES, load_default="other", metadata={"description": "lighting or other: the drop limit"})
    voltage_drop_limit_percent = Number(
        minimum=0.5, maximum=20, metadata={"description": "in place of Appendix 4's limit for the use"}
    )

    @validates_schema
    def complete(self, data, **kwargs):
        check_phases(data)
        if "conductors" not in data and "r1_plus_r2_ohm" not in data:
            raise ValidationError("give the conductors, or a known r1_plus_r2_ohm", "conductors")
        if data.get("role") == "final" and "load" not in data:
            raise ValidationError("a final circuit needs its load: socket-outlets or fixed-equipment", "load")
        if "neutral_csa_mm2" in data and "conductors" not in data:
            raise ValidationError("a neutral size needs the conductors", "neutral_csa_mm2")

    @post_load
    def make(self, data, **kwargs):
        neutral = data.pop("neutral_csa_mm2", None)
        if neutral is not None:
            data["conductors"] = dataclasses.replace(data["conductors"], neutral_csa_mm2=neutral)
        return built(Circuit, data)


def checks_field() -> fields.List:
    """The request's optional list of the checks the overall verdict must cover."""
    return fields.List(
        choice(CHECKS),
        validate=validate.Length(min=1, max=len(CHECKS)),
        metadata={
            "description": "the checks the overall verdict covers (default: every check); the result says which "
            "in verdict_scope, e.g. an earth-fault-only question: disconnection-time, max-zs, protective-conductor"
        },
    )


class ScopedSchema(FastSchema, JobSchema):
    """A request that may name the checks its overall verdict covers (and, as every job, its edition, premises and
    the maker's data)."""

    checks = checks_field()

    @validates_schema
    def checks_once(self, data, **kwargs):
        repeated = sorted({c for c in data.get("checks", []) if data["checks"].count(c) > 1})
        if repeated:
            raise ValidationError(f"each check is named once; repeated: {repeated}", "checks")


class CheckRequestSchema(ScopedSchema):
    supply = fields.Nested(SupplySchema, required=True)
    circuit = fields.Nested(CircuitSchema, required=True)


class BatchRequestSchema(ScopedSchema):
    supply = fields.Nested(SupplySchema, required=True)
    circuits = PerItemList(
        fields.Nested(CircuitSchema),
        required=True,
        validate=validate.Length(min=1),
        metadata={
            "description": "one result or one problem per item, in order; the size limit is the server's batch limit"
        },
    )


fastload.register(SupplySchema, CircuitSchema, CheckRequestSchema)
