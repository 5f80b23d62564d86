"""Running the check pipeline on a few circuits, for the tests of its steps."""

from service.electrical.circuit_arrays import columns_of, prepare
from service.electrical.inputs import Circuit, Conductors, DeviceSpec, Rcd, Supply
from service.electrical.pipeline import Checked, check_columns

# Invented demo scenario: Larkspur Bakery (TN-C-S, 230 V, Ze 0.28 ohm, 2.1 kA stated) and its TT garden kiosk
BAKERY = Supply(earthing="TN-C-S", u0_v=230, ze_ohm=0.28, prospective_fault_current_ka=2.1)
KIOSK = Supply(earthing="TT", u0_v=230, ze_ohm=21, electrode_ohm=20)
B32 = DeviceSpec(rating_a=32, standard="BS EN 60898", type="B", breaking_capacity_ka=6)
RCBO_B16 = DeviceSpec(rating_a=16, standard="BS EN 61009", type="B", breaking_capacity_ka=6, rcd=Rcd(30))
TWIN_6 = Conductors("copper", "thermoplastic-70", 6, 2.5, 18)
TWIN_2_5 = Conductors("copper", "thermoplastic-70", 2.5, 1.5, 25)


def circuit(device=B32, conductors=TWIN_6, load="fixed-equipment", **kwargs) -> Circuit:
    return Circuit(device=device, conductors=conductors, role=kwargs.pop("role", "final"), load=load, **kwargs)


def run(supply, *circuits) -> Checked:
    """The pipeline's arrays for these circuits (every one must be computable)."""
    supplies = [supply] * len(circuits) if isinstance(supply, Supply) else list(supply)
    good, failures = prepare(supplies, list(circuits))
    assert not failures, failures
    return check_columns(columns_of(supplies, list(circuits)))


def step(checked: Checked, name: str):
    return next(c for c in checked.checks if c.check == name)
