"""`python -m calc`: the calculation core's command line (a contract for office scripts).

    python -m calc assess FILE [--text]     FILE "-" reads standard input
    python -m calc limits --device B32 [--u0 230] [--cmin 0.95]
    python -m calc limits --device curve --points 100,10 300,1 1000,0.1

Exit 0 with the result on stdout (whatever the verdict); exit 2 with one line on stderr naming the
field for invalid input, nothing on stdout.
"""

from __future__ import annotations

import argparse
import json
import re
import sys
from collections.abc import Sequence
from typing import Any, TextIO

from calc.assessment import assess
from calc.devices import make_device
from calc.errors import CalcError, InputError
from calc.formulas import max_loop_impedance_ohm
from calc.inputs import DEFAULT_CMIN, DEFAULT_U0_V, parse_value, read_device
from calc.report import render_text

LIMIT_TIMES_S = (0.1, 0.2, 0.4, 1.0, 5.0)
_DEVICE = re.compile(r"^(?:(?P<curve>[A-Za-z])|(?P<fuse>gG))\s*(?P<rating>\d+(?:\.\d+)?)$")


class UsageError(CalcError, ValueError):
    """The command line was used wrongly."""


class _Parser(argparse.ArgumentParser):
    """Usage errors as one line on stderr, exit 2."""

    def error(self, message: str) -> None:  # type: ignore[override]
        raise UsageError(f"{self.prog}: {message}")


def build_parser() -> argparse.ArgumentParser:
    parser = _Parser(prog="python -m calc", description="Boardside calculation core")
    sub = parser.add_subparsers(dest="command", required=True, parser_class=_Parser)
    a = sub.add_parser("assess", help="assess one circuit given as JSON")
    a.add_argument("file", help='JSON file, or "-" for standard input')
    a.add_argument("--text", action="store_true", help="print the working for a person")
    lim = sub.add_parser("limits", help="maximum Zs of a device for 0.1, 0.2, 0.4, 1 and 5 s")
    lim.add_argument("--device", required=True, help='"B32", "C16", "D6", "gG63" or "curve"')
    lim.add_argument("--points", nargs="+", default=None, help="for a curve: CURRENT,TIME pairs")
    lim.add_argument("--u0", default=None, help="U0 (default 230 V)")
    lim.add_argument("--cmin", default=None, help="Cmin (default 0.95)")
    lim.add_argument("--json", action="store_true", help="print JSON")
    return parser


def _read_json(name: str, stdin: TextIO) -> Any:
    try:
        if name == "-":
            text = stdin.read()
        else:
            with open(name, encoding="utf-8") as handle:
                text = handle.read()
    except OSError as exc:
        raise UsageError(f"{name}: cannot read ({exc.strerror or exc})") from None
    except UnicodeDecodeError:
        raise UsageError(f"{name}: not UTF-8 text") from None
    try:
        return json.loads(text)
    except json.JSONDecodeError as exc:
        raise InputError(
            "input", f"not valid JSON ({exc.msg} at line {exc.lineno} column {exc.colno})"
        ) from None
    except RecursionError:
        raise InputError("input", "JSON nested too deeply") from None
    except ValueError:  # e.g. an integer of thousands of digits (int_max_str_digits)
        raise InputError("input", "a number has too many digits to be a reading") from None


def device_from_text(text: str, points: Sequence[str] | None) -> dict[str, Any]:
    """The `circuit.device` object for a short device name ("B32", "gG63", "curve")."""
    if text.strip().lower() == "curve":
        if not points:
            raise InputError("--points", "a curve device needs CURRENT,TIME pairs")
        pairs = []
        for item in points:
            parts = item.split(",")
            if len(parts) != 2:
                raise InputError("--points", f'"{item}" is not CURRENT,TIME')
            pairs.append([p.strip() for p in parts])
        return {"kind": "curve", "points": pairs}
    match = _DEVICE.match(text.strip())
    if match is None:
        raise InputError("--device", f'"{text}" is not a device such as B32, C16, D6, gG63 or curve')
    if match.group("fuse"):
        return {"kind": "fuse-gg", "rating": match.group("rating")}
    return {"kind": "mcb", "curve": match.group("curve"), "rating": match.group("rating")}


def limits(device: dict[str, Any], u0_v: float, cmin: float) -> list[dict[str, Any]]:
    """Maximum Zs for each of LIMIT_TIMES_S (IEC 60364-4-41 411.4.4: Zs = U0 · Cmin / Ia)."""
    model = make_device(read_device(device))
    rows = []
    for time_s in LIMIT_TIMES_S:
        ia = model.current_for_time(time_s)
        zs = max_loop_impedance_ohm(u0_v, cmin, ia) if ia is not None else None
        rows.append({"time_s": time_s, "ia_a": ia, "zs_max_ohm": zs})
    return rows


def _limits_text(label: str, u0_v: float, cmin: float, rows: list[dict[str, Any]]) -> str:
    lines = [f"Maximum Zs for {label} at U0 {u0_v:g} V, Cmin {cmin:g}", "  time s    Ia A     Zs max Ω"]
    for row in rows:
        if row["ia_a"] is None:
            lines.append(f"  {row['time_s']:<7g}   —        not shown to clear")
        else:
            lines.append(f"  {row['time_s']:<7g}   {row['ia_a']:<8.4g} {row['zs_max_ohm']:.3f}")
    return "\n".join(lines)


def run(argv: Sequence[str], stdin: TextIO, stdout: TextIO) -> int:
    """Run the command line; raises CalcError for anything the user got wrong."""
    args = build_parser().parse_args(argv)
    if args.command == "assess":
        data = _read_json(args.file, stdin)
        if not isinstance(data, dict):
            raise InputError("input", "must be a JSON object")
        result = assess(data)
        stdout.write(
            render_text(result) if args.text else json.dumps(result.to_dict(), indent=2, ensure_ascii=False)
        )
        stdout.write("\n")
        return 0
    u0 = parse_value("supply.u0", args.u0) if args.u0 is not None else DEFAULT_U0_V
    cmin = parse_value("supply.cmin", args.cmin) if args.cmin is not None else DEFAULT_CMIN
    device = device_from_text(args.device, args.points)
    rows = limits(device, u0, cmin)
    if args.json:
        stdout.write(
            json.dumps(
                {"device": make_device(read_device(device)).label, "u0": u0, "cmin": cmin, "limits": rows},
                indent=2,
            )
            + "\n"
        )
    else:
        stdout.write(_limits_text(make_device(read_device(device)).label, u0, cmin, rows) + "\n")
    return 0


def main(argv: Sequence[str] | None = None) -> int:
    """Entry point: typed errors become one line on stderr and exit 2."""
    try:
        return run(sys.argv[1:] if argv is None else argv, sys.stdin, sys.stdout)
    except BrokenPipeError:  # the reader stopped early (`| head`): not an error of ours
        sys.stderr.close()
        return 0
    except CalcError as exc:
        message = str(exc) if isinstance(exc, UsageError) else f"invalid input: {exc}"
        print(message.replace("\n", " "), file=sys.stderr)
        return 2
