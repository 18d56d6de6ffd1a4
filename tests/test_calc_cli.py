"""The calc command line contract: JSON out with exit 0, or one line on stderr and exit 2."""

from __future__ import annotations

import json
import subprocess
import sys
from pathlib import Path

import pytest
from samples import BASE_CIRCUIT

ROOT = Path(__file__).resolve().parents[1]


def run(*args: str, stdin: str | None = None) -> subprocess.CompletedProcess[str]:
    return subprocess.run(
        [sys.executable, "-m", "calc", *args],
        input=stdin,
        capture_output=True,
        text=True,
        cwd=ROOT,
        timeout=60,
    )


def test_assess_from_stdin_prints_json():
    result = run("assess", "-", stdin=json.dumps(BASE_CIRCUIT))
    assert result.returncode == 0, result.stderr
    out = json.loads(result.stdout)
    assert out["verdict"] == "pass"
    assert {check["outcome"] for check in out["checks"]} == {"pass"}
    assert result.stderr == ""


def test_assess_from_file_and_failing_verdict_exits_0(tmp_path):
    data = json.loads(json.dumps(BASE_CIRCUIT))
    data["measured"]["zs"] = "2.0 ohm"
    path = tmp_path / "c.json"
    path.write_text(json.dumps(data), encoding="utf-8")
    result = run("assess", str(path))
    assert result.returncode == 0
    assert json.loads(result.stdout)["verdict"] == "fail"


def test_text_output_shows_the_working_and_cautions():
    result = run("assess", "-", "--text", stdin=json.dumps(BASE_CIRCUIT))
    assert result.returncode == 0
    assert "If = 230 × 0.95 / 0.62 = 352.4 A" in result.stdout
    assert "competent person" in result.stdout


@pytest.mark.parametrize(
    ("change", "field"),
    [
        ({"measured": {"zs": -0.5}}, "measured.zs"),
        ({"measured": {"zs": 0}}, "measured.zs"),
        ({"measured": {"zs": "0.5 mm^2"}}, "measured.zs"),
        ({"circuit": {"device": {"kind": "mcb", "curve": "Q", "rating": 32}}}, "circuit.device.curve"),
        ({"circuit": {"device": {"kind": "curve", "points": [[100, 1], [200, 2]]}}}, "circuit.device.points"),
        ({"circuit": {"line": {"csa": 0}}}, "circuit.line.csa"),
        ({"supply": {"u0": 230}}, "supply.system"),
        ({"supply": {"system": "TN-S", "cmin": 1.1}}, "supply.cmin"),
        ({"circuit": {"let_through_i2t": "45,000"}}, "circuit.let_through_i2t"),
        ({"measured": {"zs": int("9" * 400)}}, "measured.zs"),
        ({"measured": {"zs": "9" * 400}}, "measured.zs"),
    ],
)
def test_invalid_input_one_line_exit_2(change, field):
    data = json.loads(json.dumps(BASE_CIRCUIT))
    for section, values in change.items():
        for key, value in values.items():
            data[section][key] = value
        if section == "supply" and "system" not in values:
            data["supply"].pop("system")
    result = run("assess", "-", stdin=json.dumps(data))
    assert result.returncode == 2
    assert result.stdout == ""
    lines = result.stderr.strip().splitlines()
    assert len(lines) == 1 and field in lines[0]
    assert "Traceback" not in result.stderr


@pytest.mark.parametrize(
    "args_stdin",
    [
        (("assess", "-"), "{not json"),
        (("assess", "-"), "[1, 2]"),
        (("assess", "/no/such/file"), None),
        (("assess",), None),
        (("frobnicate",), None),
        (("limits", "--device", "Z99"), None),
        (("limits", "--device", "curve"), None),
        (("limits", "--device", "B33"), None),
        (("assess", "-"), '{"measured": {"zs": ' + "9" * 5000 + "}}"),
    ],
)
def test_bad_usage_is_one_line(args_stdin):
    args, stdin = args_stdin
    result = run(*args, stdin=stdin)
    assert result.returncode == 2
    assert result.stdout == ""
    assert len(result.stderr.strip().splitlines()) == 1
    assert "Traceback" not in result.stderr


def test_limits_for_b32():
    result = run("limits", "--device", "B32", "--json")
    assert result.returncode == 0
    rows = json.loads(result.stdout)["limits"]
    assert [r["time_s"] for r in rows] == [0.1, 0.2, 0.4, 1.0, 5.0]
    # BS 7671:2018 Table 41.3: B32 1.37 Ω
    assert all(abs(r["zs_max_ohm"] - 1.37) < 0.01 for r in rows)


def test_limits_for_fuse_and_curve():
    fuse = run("limits", "--device", "gG63")
    assert fuse.returncode == 0 and "0.440" in fuse.stdout  # BS 7671:2018 Table 41.2: 0.44 Ω at 0.4 s
    curve = run("limits", "--device", "curve", "--points", "100,10", "1000,0.1")
    assert curve.returncode == 0 and "not shown to clear" not in curve.stdout.splitlines()[3]
