"""The time–current picture: a line chart whose axes carry log10 values with decade labels."""

from __future__ import annotations

import flet as ft
import flet_charts as fch

from mobile_app.state.chart import ChartModel

_STYLE: dict[str, tuple[str, list[int] | None, float]] = {
    "device": (ft.Colors.PRIMARY, None, 3),
    "fault": (ft.Colors.ERROR, [6, 4], 2),
    "short": ("#E07B00", [2, 3], 2),
    "limit": (ft.Colors.ON_SURFACE, [8, 4], 2),
    "line": ("#3D7FD9", None, 2),
    "cpc": ("#A05BC0", [10, 3], 2),
}
"""Colour, dash and width per series role; theme colours or mid tones that read in both themes."""


def tc_chart(model: ChartModel, height: int = 300) -> ft.Column:
    """The chart and its legend (each line named in words and drawn with its dash)."""
    data = []
    legend: list[ft.Control] = []
    for series in model.series:
        colour, dash, width = _STYLE.get(series.role, ("#000000", None, 2))
        data.append(
            fch.LineChartData(
                points=[fch.LineChartDataPoint(x=x, y=y) for x, y in series.points],
                color=colour,
                stroke_width=width,
                dash_pattern=dash,
                curved=False,
                point=False,
            )
        )
        legend.append(
            ft.Row(
                [ft.Container(width=18, height=4, bgcolor=colour), ft.Text(series.name, size=12)],
                spacing=4,
                tight=True,
            )
        )
    chart = fch.LineChart(
        key="tc-chart",
        data_series=data,
        min_x=model.x_min,
        max_x=model.x_max,
        min_y=model.y_min,
        max_y=model.y_max,
        height=height,
        interactive=False,
        horizontal_grid_lines=fch.ChartGridLines(interval=1, color=ft.Colors.OUTLINE_VARIANT, width=1),
        vertical_grid_lines=fch.ChartGridLines(interval=1, color=ft.Colors.OUTLINE_VARIANT, width=1),
        left_axis=fch.ChartAxis(
            labels=[fch.ChartAxisLabel(value=v, label=ft.Text(t, size=11)) for v, t in model.y_ticks],
            label_size=36,
            title=ft.Text(model.y_title, size=12),
            title_size=18,
        ),
        bottom_axis=fch.ChartAxis(
            labels=[fch.ChartAxisLabel(value=v, label=ft.Text(t, size=11)) for v, t in model.x_ticks],
            label_size=22,
            title=ft.Text(model.x_title, size=12),
            title_size=18,
        ),
        border=ft.Border.all(1, ft.Colors.OUTLINE),
    )
    return ft.Column([chart, ft.Row(legend, wrap=True, spacing=12)], spacing=8)
