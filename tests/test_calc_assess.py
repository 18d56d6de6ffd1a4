"""Whole assessments: the contract keys, the three outcomes, nulls for what cannot be computed, units as
typed, and errors that name the field."""

from __future__ import annotations

import json
import os
from pathlib import Path

import pytest

from calc import CAUTIONS, InputError, assess

REQUIRED_KEYS = {
    "earth_fault_current_a",
    "short_circuit_current_a",
    "max_disconnection_time_s",
    "device_time_s",
    "device_time_at_short_circuit_s",
    "zs_max_ohm",
    "disconnection_ok",
    "k_line",
    "k_cpc",
    "line_withstand_time_s",
    "line_withstand_ok",
    "cpc_min_csa_mm2",
    "cpc_by_proportional_rule",
    "cpc_ok",
    "verdict",
    "steps",
    "checks",
    "primary_cause",
    "breaking_capacity_ok",
    "earth_path_ok",
    "plausibility",
}
STEP_KEYS = {"id", "title", "formula", "working", "value", "unit", "verdict", "note"}
CHECK_KEYS = {
    "id",
    "title",
    "outcome",
    "ok",
    "figure",
    "limit",
    "unit",
    "relation",
    "margin_pct",
    "margin",
    "why",
    "needs",
    "source",
    "follows_from",
    "current_a",
    "time_s",
    "deciding",
}


def test_output_has_the_contract_keys(circuit):
    out = assess(circuit).to_dict()
    assert REQUIRED_KEYS <= out.keys()
    assert all(set(step) == STEP_KEYS for step in out["steps"])
    assert all(set(check) == CHECK_KEYS for check in out["checks"])
    assert out["cautions"] == list(CAUTIONS)
    json.dumps(out)


def test_b32_at_0_62_ohm_passes(circuit):
    out = assess(circuit).to_dict()
    # If = 230 × 0.95 / 0.62 = 352.4 A (IEC 60364-4-41 411.4.4 with Cmin 0.95)
    assert out["earth_fault_current_a"] == pytest.approx(352.42, abs=0.01)
    assert out["max_disconnection_time_s"] == 0.4  # IEC 60364-4-41 Table 41.1, TN, 230 V
    assert out["device_time_s"] == 0.1
    assert out["zs_max_ohm"] == pytest.approx(1.37, abs=0.01)  # BS 7671:2018 Table 41.3
    assert out["k_line"] == 115 and out["k_cpc"] == 115  # Table 43A, Table A.54.3
    assert out["verdict"] == "pass"
    assert out["primary_cause"] is None
    assert all(check["outcome"] == "pass" for check in out["checks"])


def test_every_check_has_an_outcome_and_ok_agrees(circuit):
    for check in assess(circuit).to_dict()["checks"]:
        assert check["outcome"] in ("pass", "fail", "not-shown")
        assert check["ok"] == {"pass": True, "fail": False, "not-shown": None}[check["outcome"]]


def test_missing_zs_is_not_shown_and_says_what_would_decide(circuit):
    circuit["measured"] = {"polarity": True}
    out = assess(circuit).to_dict()
    assert out["verdict"] == "not-shown"
    for key in ("earth_fault_current_a", "device_time_s", "disconnection_ok", "cpc_min_csa_mm2"):
        assert out[key] is None
    disconnection = next(c for c in out["checks"] if c["id"] == "disconnection")
    assert disconnection["outcome"] == "not-shown"
    assert disconnection["needs"] == "measure Zs, or Ze and R1+R2"
    assert out["primary_cause"]["check"] == "disconnection"
    assert "Disconnection: not shown" in out["reasons"]


def test_zs_from_ze_plus_r1r2(circuit):
    circuit["measured"].update({"ze": 0.35, "r1r2": 0.3})
    del circuit["measured"]["zs"]
    out = assess(circuit).to_dict()
    assert out["zs_ohm"] == pytest.approx(0.65)
    assert out["zs_source"] == "Ze + (R1+R2)"


def test_disconnection_fails_beyond_the_limit(circuit):
    # B32 max Zs 1.366 Ω (U0 230 V, Cmin 0.95, 5 In = 160 A, IEC 60898-1 Table 7).
    limit = 230 * 0.95 / 160
    circuit["measured"]["zs"] = limit * 1.001
    result = assess(circuit)
    assert result.disconnection_ok is False
    assert result.verdict == "fail"
    check = next(c for c in result.checks if c.id == "disconnection")
    assert check.figure == pytest.approx(limit * 1.001) and check.limit == pytest.approx(limit)
    assert check.to_dict()["margin"] == "0.1 % beyond the limit"


def test_units_as_typed_give_the_same_result(circuit):
    as_numbers = assess(circuit).to_dict()
    circuit["measured"]["zs"] = "620 mΩ"
    circuit["circuit"]["line"]["csa"] = "2.5mm2"
    circuit["circuit"]["cpc"]["csa"] = "1.5mm"
    circuit["circuit"]["device"]["rating"] = "32 A"
    circuit["circuit"]["device"]["breaking_capacity"] = "6 kA"
    circuit["supply"]["pfc"] = "0.8 kA"
    assert assess(circuit).to_dict() == as_numbers


@pytest.mark.parametrize(
    ("path", "value", "field"),
    [
        (("measured", "zs"), -1, "measured.zs"),
        (("measured", "zs"), 0, "measured.zs"),
        (("measured", "zs"), "0.5 mm^2", "measured.zs"),
        (("measured", "zs"), "abc", "measured.zs"),
        (("circuit", "line", "csa"), 0, "circuit.line.csa"),
        (("circuit", "device", "curve"), "E", "circuit.device.curve"),
        (("circuit", "device", "rating"), 33, "circuit.device.rating"),
        (("supply", "system"), "IT", "supply.system"),
        (("measured", "zss"), 1, "measured.zss"),
        (("measured", "zs"), True, "measured.zs"),
        (("measured", "zs"), float("nan"), "measured.zs"),
        (("circuit", "device", "breaking_capacity"), 6, "circuit.device.breaking_capacity"),
        (("circuit", "cpc", "bunched"), True, "circuit.cpc.bunched"),
        (("measured", "polarity"), "yes", "measured.polarity"),
    ],
)
def test_bad_input_names_the_field(circuit, path, value, field):
    target = circuit
    for key in path[:-1]:
        target = target[key]
    target[path[-1]] = value
    with pytest.raises(InputError) as info:
        assess(circuit)
    assert info.value.field == field


def test_missing_required_fields(circuit):
    del circuit["supply"]["system"]
    with pytest.raises(InputError, match=r"^supply\.system: is required"):
        assess(circuit)


def test_error_message_text():
    with pytest.raises(InputError) as info:
        assess(
            {
                "supply": {"system": "TN-S"},
                "circuit": {
                    "device": {"kind": "mcb", "curve": "B", "rating": 32},
                    "line": {"csa": 2.5},
                    "cpc": {"csa": 1.5},
                },
                "measured": {"zs": -0.2},
            }
        )
    assert str(info.value) == "measured.zs: must be greater than zero"


def test_a_bare_breaking_capacity_says_to_write_the_unit(circuit):
    circuit["circuit"]["device"]["breaking_capacity"] = 6
    with pytest.raises(InputError) as info:
        assess(circuit)
    assert str(info.value) == (
        "circuit.device.breaking_capacity: must be at least 500 A (a bare number is in amperes: write 6 kA)"
    )


def test_an_rcbo_needs_its_idn(circuit):
    circuit["circuit"]["device"]["kind"] = "rcbo"
    with pytest.raises(InputError, match=r"^circuit\.rcd: is required for an RCBO"):
        assess(circuit)
    circuit["circuit"]["rcd"] = {"idn": "30 mA", "waveform": "A"}
    out = assess(circuit).to_dict()
    assert out["inputs"]["circuit"]["rcd"] == {"idn": 0.03, "type": "general", "waveform": "A"}


def test_nothing_printed_says_from_memory(circuit):
    circuit["circuit"]["cpc"] = {"csa": 2.5, "material": "copper", "arrangement": "armour"}
    circuit["circuit"]["rcd"] = {"idn": 0.03}
    text = json.dumps(assess(circuit).to_dict(), ensure_ascii=False).lower()
    assert "memory" not in text


def test_the_unit_registry_is_built_only_when_a_unit_is_parsed() -> None:
    # Building pint's registry takes most of a second (several in the browser build): a value typed
    # without a unit assesses without it, and the first unit builds it with the same result.
    import subprocess
    import sys

    script = (
        "import sys, calc\n"
        "from samples import BASE_CIRCUIT\n"
        "assert calc.assess(BASE_CIRCUIT).verdict == 'pass'\n"
        "assert 'pint' not in sys.modules, 'pint imported for plain numbers'\n"
        "assert calc.parse_value('measured.zs', '620 mΩ') == 0.62\n"
        "assert 'pint' in sys.modules\n"
    )
    tests = str(Path(__file__).parent)
    done = subprocess.run([sys.executable, "-c", script], capture_output=True, text=True,
                          cwd=Path(__file__).parents[1], env={**os.environ, "PYTHONPATH": tests})
    assert done.returncode == 0, done.stderr
