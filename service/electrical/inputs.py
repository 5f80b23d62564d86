"""What the core is asked about: the supply, the device, the conductors and the circuit.

Plain frozen dataclasses, loaded from requests by the HTTP face and built directly by the CLI and the
tests. Quantities carry their unit in the name.
"""

from __future__ import annotations

import dataclasses
from dataclasses import dataclass
from functools import cache, cached_property
from typing import Any, TypeVar

TT_ZE_BELOW_RA = "in TT, ze_ohm is the whole external loop including the electrode: it cannot be below electrode_ohm"


def electrode_problem(earthing: str | None, ze_ohm: float | None, electrode_ohm: float | None) -> str | None:
    """The supply's cross-field rule, said once for the schemas and the core: in TT the earth fault loop runs
    through the installation's electrode, so the external loop Ze holds its resistance RA and cannot be below it
    (common practice). None: no problem, or a value not given."""
    if earthing == "TT" and electrode_ohm is not None and ze_ohm is not None and electrode_ohm > ze_ohm:
        return TT_ZE_BELOW_RA
    return None


@dataclass(frozen=True)
class Supply:
    """The supply at the origin. For TT, ``ze_ohm`` is the whole external loop including RA."""

    earthing: str
    u0_v: float
    ze_ohm: float
    prospective_fault_current_ka: float | None = None  # the larger of line-neutral and line-earth (434.1)
    c_max: float | None = None
    electrode_ohm: float | None = None
    bonding_complete: bool = False
    current_kind: str = "ac"
    reduced_low_voltage: bool = False
    line_neutral_loop_ohm: float | None = None  # at the origin, measured or declared
    x_over_r: float | None = None  # the supply impedance's X/R at the origin (the largest currents below it)
    phases: int = 1
    three_phase_fault_current_ka: float | None = None  # symmetrical, where known
    max_earth_fault_current_ka: float | None = None  # the largest earth fault (default U0 x cmax / Ze)
    supply_kind: str = "public"  # for the voltage drop limits (Appendix 4, 6.4)
    voltage_drop_percent: float = 0.0  # the drop from the origin to this point (a board of an installation)
    board: str | None = None  # set where the values are those carried down to a board of an installation
    cautions: tuple[str, ...] = ()  # what every result at this point must say (carried down from the origin)
    # at a board of an installation: the device feeding it (selectivity, 536.4), whether selectivity is required
    # for all its circuits, and the assembly's conditional short-circuit rating (BS EN 61439-3)
    upstream_device: DeviceSpec | None = None
    upstream_id: str | None = None
    selectivity_required: bool = False
    conditional_short_circuit_ka: float | None = None
    # the rules beyond the calculations (service.electrical.rules.requirements): the edition applied (None: the one in
    # force), the kind of premises, and at the origin the supply's rated current (for the demand)
    edition: str | None = None
    premises: str | None = None
    rated_current_a: float | None = None


@dataclass(frozen=True)
class Rcd:
    """The residual part of an RCBO, or an RCD in the circuit: IΔn in mA and its delay (general or S)."""

    residual_current_ma: float
    delay: str = "general"
    type: str | None = None  # AC, A, F or B (531.3.3); None: not stated


@dataclass(frozen=True)
class DeviceSpec:
    """A protective device as a request names it: a standard, type and rating, or the user's own curve."""

    rating_a: float
    standard: str | None = None
    type: str | None = None
    breaking_capacity_ka: float | None = None
    curve_points: tuple[tuple[float, float], ...] | None = None
    rcd: Rcd | None = None
    let_through_a2s: float | None = None
    energy_limiting_class: int | None = None  # 1, 2 or 3, as marked on a BS EN 60898 / 61009 breaker
    ir_a: float | None = None  # adjustable breakers (BS EN 60947-2): long-time setting
    ii_a: float | None = None  # instantaneous setting
    isd_a: float | None = None  # short-time pickup
    tsd_s: float | None = None  # short-time delay
    afdd: bool | None = None  # an arc fault detection device at the circuit's origin (421.1.7); None: not stated
    # the maker's let-through energy: (prospective current A, I2t A2s) points, read on log-log axes between them
    let_through_curve: tuple[tuple[float, float], ...] | None = None

    @cached_property  # a frozen dataclass keeps it in its __dict__; equality and hashing read the fields only
    def curve_key(self) -> tuple:
        """What decides the overcurrent characteristic (circuits sharing it share one lookup)."""
        return (
            self.standard,
            self.type,
            float(self.rating_a),
            self.curve_points,
            self.ir_a,
            self.ii_a,
            self.isd_a,
            self.tsd_s,
        )


@dataclass(frozen=True)
class DeviceDefaults:
    """The maker's data said once for every device of a standard and type (a request's ``device_defaults``): each
    device of that standard and type takes the fields it does not state itself."""

    standard: str
    type: str | None = None
    breaking_capacity_ka: float | None = None
    energy_limiting_class: int | None = None
    let_through_curve: tuple[tuple[float, float], ...] | None = None


@dataclass(frozen=True)
class Conductors:
    """The circuit's cable: materials, insulation, sizes, route length, ring, cables in parallel, the cpc."""

    material: str
    insulation: str
    line_csa_mm2: float
    cpc_csa_mm2: float
    length_m: float
    cpc_arrangement: str = "in-cable"
    ring: bool = False
    parallel_cables: int = 1
    conductor_class: int = 2
    cpc_material: str | None = None
    cpc_resistance_mohm_per_m: float | None = None
    bare_condition: str | None = None
    neutral_csa_mm2: float | None = None  # default: the line conductor's size
    cores: int | None = None  # an armoured multicore cable's cores (2, 3, 4): the armour's resistance as the cpc


@dataclass(frozen=True)
class CableRun:
    """How the cable is run: the capacity table (cable family) and method, and the factors that reduce it."""

    cable: str
    installation_method: str
    ambient_c: float = 30.0
    grouping: str = "bunched"
    grouped_circuits: int = 1
    thermal_insulation_mm: float = 0.0
    ground_c: float | None = None
    soil_resistivity_k_m_per_w: float | None = None
    in_duct: bool = False
    reactance_mohm_per_m: float | None = None
    buried_spacing: str | None = None  # Tables 4C2/4C3: touching, one-cable-diameter, 125-mm ... 1000-mm
    capacity_a: float | None = None  # the tabulated It from the maker or the book, in place of the data files
    voltage_drop_mv_per_a_m: float | None = None  # likewise the cable's mV/A/m
    terminals_c: float | None = None  # the equipment's terminal rating, where the cable runs above 70 degC
    # where it runs (522.6.202/203); None: not stated
    concealed_in_wall: str | None = None  # no, under-50-mm, 50-mm-or-deeper
    wall_has_metal_parts: bool | None = None
    earthed_metallic_covering: bool | None = None  # armour, earthed metal conduit or trunking, or the like


@dataclass(frozen=True)
class EvCharge:
    """What an EV charge point has (Section 722): d.c. fault detection in the charger, the measure against a
    broken PEN; None where not stated."""

    dc_fault_detection: bool | None = None
    earthing_measure: str | None = None  # open-pen-device, earth-electrode or none


@dataclass(frozen=True)
class Circuit:
    """One circuit: its device, its conductors (or a known R1+R2), its role and load, and how it is run."""

    device: DeviceSpec
    conductors: Conductors | None = None
    r1_plus_r2_ohm: float | None = None
    role: str = "final"
    load: str | None = None
    id: str | None = None
    design_current_a: float | None = None
    installation: CableRun | None = None
    conditional_short_circuit_ka: float | None = None  # the board's rating with its upstream device (BS EN 61439-3)
    phases: int = 1
    phase: str | None = None  # L1, L2 or L3 for a single-phase circuit of a three-phase board
    use: str = "other"  # lighting or other, for the voltage drop limit
    voltage_drop_limit_percent: float | None = None  # in place of Appendix 4's
    selectivity_limit_a: float | None = None  # the maker's selectivity limit for the pair
    selectivity_required: bool = False  # a fault here must not take out the board above (or the supply's)
    feeds_board: str | None = None  # the id of the board this circuit supplies (a sub-main)
    diversity: float | None = None  # the share of the design current counted in the board's demand
    # what it supplies and where (the rules beyond the calculations); None: not stated
    equipment: str | None = None
    socket_outlet_rating_a: float | None = None  # the largest socket-outlet on it (None: taken as up to 32 A)
    location: str | None = None
    ev: EvCharge | None = None


@dataclass(frozen=True)
class Unread:
    """An item of a board's circuits its caller could not read (the caller reports why); a board it would feed
    is reported as not checked."""

    id: str | None = None
    feeds_board: str | None = None


@dataclass(frozen=True)
class Board:
    """A board of an installation: its circuits, the circuit feeding it (or none at the origin), its ratings.

    The origin board has no ``fed_from``; its ``device`` is the main device at the origin, used for the
    selectivity of its own circuits. ``diversity`` scales the board's summed demand (Appendix 1, the
    designer's allowance); a stated ``design_current_a`` overrides the sum. ``conditional_short_circuit_ka``
    is the assembly's conditional rating with its upstream device (BS EN 61439-3), given to its circuits.
    """

    id: str
    circuits: tuple[Circuit | Unread, ...]
    fed_from: str | None = None  # the id of the circuit feeding the board
    device: DeviceSpec | None = None
    device_id: str | None = None
    diversity: float = 1.0
    design_current_a: float | None = None
    conditional_short_circuit_ka: float | None = None
    selectivity_required: bool = False


@dataclass(frozen=True)
class Installation:
    """The supply at the origin and the boards fed from it, as a tree through the circuits' ``feeds_board``."""

    supply: Supply
    boards: tuple[Board, ...]
    id: str | None = None
    surge_protection: SurgeProtection | None = None


@dataclass(frozen=True)
class SurgeProtection:
    """Protection against transient overvoltages (443.4): fitted, the consequence of an overvoltage, and whether
    the owner declined it in writing."""

    fitted: bool
    consequence: str | None = None  # human-life, safety-services, commercial or other
    declined_in_writing: bool = False


T = TypeVar("T")


@cache
def _defaults(cls: type) -> tuple[dict[str, Any], frozenset[str]]:
    fields = dataclasses.fields(cls)
    return (
        {f.name: f.default for f in fields if f.default is not dataclasses.MISSING},
        frozenset(f.name for f in fields),
    )


def built(cls: type[T], values: dict[str, Any]) -> T:
    """One of the frozen dataclasses above from fields a schema has already checked, without the per-field
    ``object.__setattr__`` of a frozen dataclass's ``__init__`` (about eight times its cost for a circuit).

    Equal to ``cls(**values)``; a name that is not a field, or a missing field without a default, raises
    TypeError as ``__init__`` would.
    """
    defaults, names = _defaults(cls)
    if not values.keys() <= names:
        raise TypeError(f"{cls.__name__} has no field {sorted(values.keys() - names)}")
    obj = object.__new__(cls)
    state = {**defaults, **values}
    if len(state) != len(names):
        raise TypeError(f"{cls.__name__} misses {sorted(names - state.keys())}")
    obj.__dict__.update(state)
    return obj
