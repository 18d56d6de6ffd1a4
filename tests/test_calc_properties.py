"""Properties of the core, with hypothesis: monotonic physics, verdicts flipping only at limits,
round trips, and no exception but the core's own typed error."""

from __future__ import annotations

import copy
import json

from hypothesis import HealthCheck, assume, given, settings
from hypothesis import strategies as st
from samples import BASE_CIRCUIT

from calc import CalcError, assess

DEVICES = st.one_of(
    st.builds(
        lambda c, r: {"kind": "mcb", "curve": c, "rating": r},
        st.sampled_from("BCD"),
        st.sampled_from([6, 10, 16, 20, 32, 40, 63, 100, 125]),
    ),
    st.builds(lambda r: {"kind": "fuse-gg", "rating": r}, st.sampled_from([6, 16, 32, 63, 100, 200])),
)
ZS = st.floats(min_value=0.01, max_value=50, allow_nan=False)
FAST = settings(max_examples=150, deadline=None, suppress_health_check=[HealthCheck.too_slow])


def circuit_with(device: dict, zs: float, **measured: float) -> dict:
    data = copy.deepcopy(BASE_CIRCUIT)
    data["circuit"]["device"] = device
    data["measured"] = {"zs": zs, **measured}
    return data


@FAST
@given(DEVICES, ZS, ZS)
def test_higher_zs_never_gives_more_current_or_a_faster_device(device, a, b):
    low, high = sorted((a, b))
    r_low, r_high = assess(circuit_with(device, low)), assess(circuit_with(device, high))
    assert r_high.earth_fault_current_a <= r_low.earth_fault_current_a
    if r_high.device_time_s is not None:
        assert r_low.device_time_s is not None
        assert r_high.device_time_s >= r_low.device_time_s


@FAST
@given(DEVICES, ZS)
def test_disconnection_verdict_flips_only_at_zs_max(device, zs):
    result = assess(circuit_with(device, zs))
    if result.zs_max_ohm is None:
        return
    assume(abs(zs - result.zs_max_ohm) > 1e-9 * result.zs_max_ohm)
    assert result.disconnection_ok is (zs < result.zs_max_ohm)


@FAST
@given(DEVICES, ZS, st.floats(0.01, 10), st.floats(-10, 40))
def test_output_json_round_trips_through_its_normalised_inputs(device, zs, zsc, temp):
    first = assess(circuit_with(device, zs, zsc=zsc, test_temp_c=temp)).to_dict()
    text = json.dumps(first)
    assert json.loads(text) == first
    again = assess(json.loads(text)["inputs"]).to_dict()
    assert again == first


JSONISH = st.recursive(
    st.none() | st.booleans() | st.floats() | st.integers() | st.text(max_size=12),
    lambda children: (
        st.lists(children, max_size=4) | st.dictionaries(st.text(max_size=8), children, max_size=4)
    ),
    max_leaves=20,
)
FIELD_VALUES = st.one_of(
    JSONISH,
    st.sampled_from(
        [
            "0.5 mm^2",
            "620 mΩ",
            "1e400",
            "-0",
            " ",
            "2.5mm",
            "30 mA",
            "°C",
            "nan",
            "inf ohm",
            "1/0",
            "ohm ohm",
            "1 kA**2",
            "(",
            "1 A*s",
        ]
    ),
)
PATHS = st.sampled_from(
    [
        ("measured", "zs"),
        ("measured", "zsc"),
        ("measured", "r1r2"),
        ("measured", "test_temp_c"),
        ("supply", "u0"),
        ("supply", "cmin"),
        ("supply", "system"),
        ("circuit", "line", "csa"),
        ("circuit", "cpc", "csa"),
        ("circuit", "device", "rating"),
        ("circuit", "device", "curve"),
        ("circuit", "device", "kind"),
        ("circuit", "device", "points"),
        ("circuit", "rcd"),
        ("circuit", "let_through_i2t"),
        ("circuit", "cpc", "arrangement"),
        ("circuit", "line", "material"),
        ("supply",),
        ("circuit",),
        ("measured",),
        ("settings", "final_circuit_max_a"),
    ]
)


@settings(max_examples=400, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(st.lists(st.tuples(PATHS, FIELD_VALUES), min_size=1, max_size=4))
def test_no_input_raises_anything_but_the_typed_error(changes):
    data = copy.deepcopy(BASE_CIRCUIT)
    for path, value in changes:
        target = data
        for key in path[:-1]:
            if not isinstance(target.get(key), dict):
                target[key] = {}
            target = target[key]
        target[path[-1]] = value
    try:
        out = assess(data).to_dict()
    except CalcError:
        return
    json.dumps(out)
    assert out["verdict"] in ("pass", "fail", "incomplete")


@settings(max_examples=150, deadline=None)
@given(JSONISH)
def test_any_json_value_as_a_whole_input(value):
    try:
        assess(value)
    except CalcError:
        pass
