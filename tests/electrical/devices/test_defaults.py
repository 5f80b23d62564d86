"""The maker's data said once (device_defaults): each device of a standard and type takes the fields it leaves out.
Common practice: what a device states itself always wins; invented demo figures."""

import pytest

from service.electrical.devices.defaults import apply, check_defaults, with_defaults
from service.electrical.errors import InvalidInput
from service.electrical.inputs import Circuit, DeviceDefaults, DeviceSpec
from tests.electrical.pipeline import TWIN_2_5

CURVE = ((200.0, 900.0), (1000.0, 2000.0), (3000.0, 4500.0))
RCBO_B = DeviceDefaults("BS EN 61009", "B", breaking_capacity_ka=6, energy_limiting_class=3, let_through_curve=CURVE)
ANY_60898 = DeviceDefaults("BS EN 60898", None, breaking_capacity_ka=10)


def test_a_device_takes_what_it_leaves_out_and_keeps_what_it_states():
    plain = DeviceSpec(32, "BS EN 61009", "B")
    done = with_defaults(plain, [RCBO_B, ANY_60898])
    assert done.breaking_capacity_ka == 6 and done.energy_limiting_class == 3 and done.let_through_curve == CURVE
    own = with_defaults(DeviceSpec(32, "BS EN 61009", "B", breaking_capacity_ka=10), [RCBO_B])
    assert own.breaking_capacity_ka == 10 and own.let_through_curve == CURVE
    # a default without a type serves every type of its standard; another standard is untouched
    assert with_defaults(DeviceSpec(16, "BS EN 60898", "C"), [RCBO_B, ANY_60898]).breaking_capacity_ka == 10
    assert with_defaults(DeviceSpec(63, "BS 88-2", "gG"), [RCBO_B, ANY_60898]) == DeviceSpec(63, "BS 88-2", "gG")


def test_circuits_sharing_a_device_share_the_completed_one_and_a_repeat_is_refused():
    device = DeviceSpec(32, "BS EN 61009", "B")
    a, b = apply([Circuit(device, TWIN_2_5), Circuit(device, TWIN_2_5), "not a circuit"], [RCBO_B])[:2]
    assert a.device is b.device and a.device.let_through_curve == CURVE
    with pytest.raises(InvalidInput) as err:
        check_defaults([RCBO_B, RCBO_B])
    assert err.value.path == ("device_defaults", 1)
