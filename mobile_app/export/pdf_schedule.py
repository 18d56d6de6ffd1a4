"""The schedule of test results in the PDF: for each board a landscape table, one row per circuit,
grouped as the work is done (the circuit, its protection, the tests with the supply off, the live
tests, the outcome with its reason in words), then the board's details."""

from __future__ import annotations

from typing import Any

from fpdf import FPDF

from mobile_app.export.pdf_blocks import heading, key_value_rows, outcome_style
from mobile_app.export.pdf_layout import BLACK, BOLD, GREY, PLAIN, paragraph, table_row, use_font
from mobile_app.export.schedule import board_details, circuit_values, one_line

GROUPS: tuple[tuple[str, float], ...] = (
    ("Circuit", 63),
    ("Protection", 34),
    ("Tests with the supply off", 55),
    ("Live tests", 40),
    ("Outcome", 75),
)
HEADINGS: tuple[tuple[str, float], ...] = (
    ("Ref", 10),
    ("Circuit", 40),
    ("Line / CPC mm²", 13),
    ("Device", 19),
    ("RCD", 15),
    ("Continuity Ω", 21),
    ("Insulation MΩ", 20),
    ("Polarity", 14),
    ("Zs Ω", 22),
    ("RCD ms", 18),
    ("Outcome", 17),
    ("Reason", 58),
)
LEGEND = (
    "Figures are rounded as the instrument shows them; the calculation annex keeps full precision. "
    "Continuity: R1+R2 or R2 of a radial circuit, a ring's end-to-end r1, rn, r2 and (r1+r2)/4, "
    "what each point of the ring reads. Insulation: line to "
    "line and line to earth at the test voltage shown; >999 is beyond the instrument's range. Zs: as "
    "measured, or worked out where marked; its limit is the largest reading that still meets the "
    "disconnection time, at the test temperature where one is recorded, set by the device or by the "
    "RCD where marked. RCD ms: operating time at IΔn (×1) and 5 IΔn (×5). — : not recorded."
)
_FONT_PT = 7.0
_LINE_MM = 3.1


def _lines(*parts: str) -> str:
    """The non-blank parts, one per line; "—" when there are none."""
    return "\n".join(part for part in parts if part) or "—"


def _labelled(pairs: tuple[tuple[str, str], ...]) -> list[str]:
    return [f"{label} {text}" for label, text in pairs if text]


def row_texts(values: dict[str, str]) -> tuple[str, ...]:
    """The printed cells of one circuit's row, from its schedule values."""
    v = {key: one_line(text) for key, text in values.items()}
    points = f"{v['points']} point{'' if v['points'] == '1' else 's'}" if v["points"] else ""
    details = " · ".join(part for part in (
        v["form"], points, v["wiring"], f"method {v['method']}" if v["method"] else "",
        f"{v['length']} m" if v["length"] else "") if part)
    sizes = f"{v['line_csa'] or '?'} / {v['cpc_csa'] or '?'}" if v["line_csa"] or v["cpc_csa"] else ""
    zs = v["zs"] + (f" ({v['zs_from']})" if v["zs"] and v["zs_from"] != "measured" else "")
    limit = f"limit {v['zs_limit']}" + (" RCD" if v["zs_limit_by"] == "RCD" else "") if v["zs_limit"] else ""
    continuity = _labelled((("R1+R2", v["r1r2"]), ("R2", v["r2"]), ("r1", v["ring_r1"]),
                            ("rn", v["ring_rn"]), ("r2", v["ring_r2"]), ("(r1+r2)/4", v["ring_r1r2"])))
    insulation = _labelled((("L–L", v["ir_ll"]), ("L–E", v["ir_le"])))
    if v["ir_voltage"]:
        insulation.append(f"at {v['ir_voltage']} V")
    rcd_times = _labelled((("×1", v["rcd_1x"]), ("×5", v["rcd_5x"])))
    if v["rcd_button"]:
        rcd_times.append(f"button {v['rcd_button']}")
    return (
        v["ref"] or "—",
        _lines(v["description"], details),
        sizes or "—",
        _lines(v["device"], f"{v['breaking_capacity']} kA" if v["breaking_capacity"] else ""),
        _lines(v["rcd_type"], f"{v['rcd_idn']} mA" if v["rcd_idn"] else ""),
        _lines(*continuity),
        _lines(*insulation),
        v["polarity"] or "—",
        _lines(zs, limit),
        _lines(*rcd_times),
        v["outcome"],
        v["reason"],
    )


def _headings(pdf: FPDF) -> None:
    """The two heading rows: the groups, then the columns."""
    table_row(pdf, [w for _, w in GROUPS], [g for g, _ in GROUPS], [BOLD] * len(GROUPS), _LINE_MM, _FONT_PT)
    table_row(pdf, [w for _, w in HEADINGS], [h for h, _ in HEADINGS], [BOLD] * len(HEADINGS), _LINE_MM,
              _FONT_PT)


def board_schedule(pdf: FPDF, board: dict[str, Any], library: dict[int, str]) -> None:
    """One board on landscape pages: its schedule of test results, the legend, then its details."""
    pdf.add_page(orientation="L")
    title = f"Board {board.get('designation')}"
    if board.get("location"):
        title += f" · {board.get('location')}"
    heading(pdf, f"Schedule of test results · {title}", 12)
    circuits = board.get("circuits") or []
    if not circuits:
        paragraph(pdf, 5, "No circuits recorded on this board.")
    else:
        _headings(pdf)
        widths = [w for _, w in HEADINGS]
        for circuit in circuits:
            values = circuit_values(circuit, library)
            styles = [PLAIN] * 10 + [outcome_style(circuit.get("verdict")), PLAIN]
            table_row(pdf, widths, row_texts(values), styles, _LINE_MM, _FONT_PT,
                      on_new_page=lambda: _headings(pdf))
        pdf.ln(1)
        pdf.set_text_color(*GREY)
        use_font(pdf, "", 7)
        curves = sorted({v for c in circuits if (v := circuit_values(c, library)["device_curve"])})
        legend = LEGEND + (" Maker's curves: " + "; ".join(curves) + "." if curves else "")
        paragraph(pdf, 3.2, legend)
        pdf.set_text_color(*BLACK)
    heading(pdf, f"Details of board {one_line(board.get('designation'))}", 10.5)
    key_value_rows(pdf, board_details(board) or [("Supply", "as the job's supply (nothing else recorded)")])
