"""Properties of the whole-circuit check over generated circuits (hypothesis)."""

import dataclasses
import math

from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from service.electrical.circuit_arrays import CircuitFailure
from service.electrical.devices import fuses
from service.electrical.inputs import Circuit, Conductors, DeviceSpec, Rcd, Supply
from service.electrical.pipeline import check_circuit, check_circuits

SIZES = [1.0, 1.5, 2.5, 4, 6, 10, 16, 25, 35, 50]


@st.composite
def devices(draw):
    kind = draw(st.sampled_from(["breaker", "rcbo", "fuse", "user"]))
    if kind in ("breaker", "rcbo"):
        standard = "BS EN 60898" if kind == "breaker" else "BS EN 61009"
        rcd = (
            Rcd(draw(st.sampled_from([10, 30, 100, 300])), draw(st.sampled_from(["general", "S"])))
            if kind == "rcbo"
            else None
        )
        return DeviceSpec(
            rating_a=draw(st.sampled_from([6, 10, 16, 20, 32, 40, 63, 100])),
            standard=standard,
            type=draw(st.sampled_from("BCD")),
            breaking_capacity_ka=draw(st.sampled_from([None, 3, 6, 10])),
            rcd=rcd,
        )
    if kind == "fuse":
        standard = draw(st.sampled_from(fuses.fuse_standards()))
        return DeviceSpec(rating_a=draw(st.sampled_from(fuses.fuse_ratings(standard))), standard=standard)
    i0 = draw(st.floats(20, 200))
    return DeviceSpec(rating_a=16, curve_points=((i0, 10.0), (i0 * 3, 0.5), (i0 * 8, 0.02)))


@st.composite
def circuits(draw):
    conductors = Conductors(
        material="copper",
        insulation=draw(st.sampled_from(["thermoplastic-70", "thermosetting-90"])),
        line_csa_mm2=draw(st.sampled_from(SIZES)),
        cpc_csa_mm2=draw(st.sampled_from(SIZES)),
        length_m=draw(st.floats(0.5, 300)),
        ring=draw(st.booleans()),
        parallel_cables=draw(st.sampled_from([1, 2])),
        cpc_arrangement=draw(st.sampled_from(["in-cable", "separate"])),
    )
    role = draw(st.sampled_from(["final", "distribution"]))
    return Circuit(
        device=draws_device(draw),
        conductors=conductors,
        role=role,
        load=draw(st.sampled_from(["socket-outlets", "fixed-equipment"])) if role == "final" else None,
        id=draw(st.text(max_size=8)),
    )


def draws_device(draw):
    return draw(devices())


supplies = st.builds(
    Supply,
    earthing=st.sampled_from(["TN-S", "TN-C-S", "TT"]),
    u0_v=st.sampled_from([110.0, 230.0, 240.0, 400.0]),
    ze_ohm=st.floats(0.01, 50),
    prospective_fault_current_ka=st.one_of(st.none(), st.floats(0.1, 25)),
    electrode_ohm=st.one_of(st.none(), st.floats(1, 300)),
    bonding_complete=st.booleans(),
)


def plain(result):
    return dataclasses.asdict(result)


def finite_everywhere(value):
    if isinstance(value, float):
        return math.isfinite(value)
    if isinstance(value, dict):
        return all(finite_everywhere(v) for v in value.values())
    if isinstance(value, list):
        return all(finite_everywhere(v) for v in value)
    return True


@given(supplies, st.lists(circuits(), min_size=1, max_size=12))
@settings(max_examples=120, deadline=None, suppress_health_check=[HealthCheck.too_slow])
def test_array_path_equals_scalar_path(supply, items):
    batch = check_circuits(supply, items)
    assert len(batch) == len(items)
    for item, result in zip(items, batch, strict=False):
        if isinstance(result, CircuitFailure):
            continue
        assert plain(result) == plain(check_circuit(supply, item))


@given(supplies, circuits())
@settings(max_examples=300, deadline=None)
def test_verdict_rules_and_finite_output(supply, item):
    result = check_circuits(supply, [item])[0]
    if isinstance(result, CircuitFailure):
        return
    verdicts = [c.verdict for c in result.checks]
    assert set(verdicts) <= {"pass", "fail", "not-verified"}
    if result.verdict == "pass":
        assert all(v == "pass" for v in verdicts)
    if "fail" in verdicts:
        assert result.verdict == "fail"
    elif "not-verified" in verdicts:
        assert result.verdict == "not-verified"
    assert finite_everywhere(plain(result))
    assert result.cautions[:3] and any("competent person" in c for c in result.cautions)


@given(supplies, circuits())
@settings(max_examples=300, deadline=None)
def test_max_zs_and_disconnection_time_agree_without_an_rcd(supply, item):
    # If >= Ia  <=>  Zs <= U0 Cmin / Ia  <=>  t(If) <= t_required, on the same characteristic
    if item.device.rcd is not None:
        return
    result = check_circuits(supply, [item])[0]
    if isinstance(result, CircuitFailure):
        return
    checks = {c.check: c for c in result.checks}
    dt, mz = checks["disconnection-time"], checks["max-zs"]
    if mz.limit is None or abs(mz.value - mz.limit) <= 1e-6 * mz.limit:
        return
    if dt.verdict in ("pass", "fail") and mz.verdict in ("pass", "fail"):
        assert dt.verdict == mz.verdict


def test_a_bad_item_never_sinks_the_others():
    supply = Supply(earthing="TN-S", u0_v=230, ze_ohm=0.8)
    good = Circuit(
        device=DeviceSpec(rating_a=16, standard="BS EN 60898", type="B", breaking_capacity_ka=6),
        conductors=Conductors("copper", "thermoplastic-70", 2.5, 1.5, 20),
        role="final",
        load="socket-outlets",
        id="a",
    )
    bad_size = dataclasses.replace(good, id="b", conductors=dataclasses.replace(good.conductors, line_csa_mm2=3))
    bad_fuse = dataclasses.replace(good, id="c", device=DeviceSpec(rating_a=17, standard="BS 88-2"))
    no_rcd = dataclasses.replace(good, id="d", device=DeviceSpec(rating_a=16, standard="BS EN 61009", type="B"))
    out = check_circuits(supply, [good, bad_size, bad_fuse, no_rcd, good])
    assert [type(r).__name__ for r in out] == [
        "CircuitResult",
        "CircuitFailure",
        "CircuitFailure",
        "CircuitFailure",
        "CircuitResult",
    ]
    assert out[1].path == ("circuit", "conductors", "line_csa_mm2")
    assert out[2].path == ("circuit", "device", "rating_a") and out[3].path == ("circuit", "device", "rcd")
    assert [r.id for r in out] == ["a", "b", "c", "d", "a"]
