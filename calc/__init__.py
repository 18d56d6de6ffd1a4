"""Boardside calculation core: from a measured loop impedance to fault current, device time and
conductor verdicts, with the working shown step by step.

Pure Python plus pint. Public names:

- `assess(data) -> Assessment`: one circuit in the JSON shape of the calc contract.
- `parse_value(field, value) -> float`: one field ("measured.zs", "circuit.line.csa", ...) to base units.
- `device_curve(device) -> list[(current_a, time_s)]`: the device's time-current model, for plotting.
- `CalcError`, `InputError`: the typed errors (InputError carries `.field` and `.problem`).
"""

from __future__ import annotations

from typing import Any

from calc.assessment import Assessment, assess
from calc.devices import make_device
from calc.errors import CalcError, InputError
from calc.inputs import parse_value, read_device, read_points
from calc.steps import CAUTIONS, Step
from calc.version import __version__


def device_curve(device: dict[str, Any]) -> list[tuple[float, float]]:
    """(current_a, time_s) points of a device's time-current model (upper-bound times), for plotting.

    `device` has the shape of the input's `circuit.device`; raises InputError for a bad device.
    """
    if not isinstance(device, dict):
        raise InputError("circuit.device", "must be an object")
    return make_device(read_device(device)).curve()


__all__ = [
    "CAUTIONS",
    "Assessment",
    "CalcError",
    "InputError",
    "Step",
    "__version__",
    "assess",
    "device_curve",
    "parse_value",
    "read_points",
]
