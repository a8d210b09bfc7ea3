"""The schedule table beside the drawing, with the cautions note and the title above it."""

from __future__ import annotations

import textwrap
from collections.abc import Sequence

from ezdxf.enums import TextEntityAlignment

from ..model import CircuitOutcome
from .entities import EntityWriter, Mark
from .placement import Placement
from .style import (
    CAUTIONS_WRAP_CHARS,
    CELL_INSET_H,
    COLUMN_PADDING_H,
    LINE_PITCH,
    PANEL_GAP_H,
    R12_ROW_PITCH_H,
    TITLE_GAP_H,
    TITLE_HEIGHT_H,
    TITLE_TO_TABLE_H,
)
from .text import clean, mtext_escape, rating_text

__all__ = ["HEADER", "schedule_table", "cautions_and_title", "schedule_rows"]


#: Columns of the schedule table on the drawing (contract.md, "The annotated DXF").
HEADER = ("circuit", "from", "to", "cable", "device", "length", "status")

#: The rules of an R12 schedule (LINE entities).
_GRID = Mark("schedule", "schedule", "grid")


def schedule_table(
    w: EntityWriter, outcomes: Sequence[CircuitOutcome], x0: float, y_top: float, z: float
) -> int:
    """Cautions, title and the schedule table, top left at (x0, y_top)."""
    h = w.height
    y = cautions_and_title(w, x0, y_top, z)
    y -= TITLE_TO_TABLE_H * h
    rows = schedule_rows(outcomes)
    widths = [
        max(w.text_width(r[i]) for r in [HEADER, *rows]) + COLUMN_PADDING_H * h
        for i in range(len(HEADER))
    ]
    table_w = sum(widths)
    row_h = (R12_ROW_PITCH_H if w.r12 else LINE_PITCH) * h
    per_panel = max(1, w.config.schedule_rows_per_panel)
    panels = [rows[i : i + per_panel] for i in range(0, len(rows), per_panel)] or [[]]
    for p, panel in enumerate(panels):
        px = x0 + p * (table_w + PANEL_GAP_H * h)
        lines = [HEADER, *panel]
        if w.r12:
            _schedule_cells_r12(w, lines, widths, px, y, z, row_h)
        else:
            _schedule_panel(w, lines, widths, px, y, z, row_h)
    return len(rows)


def cautions_and_title(w: EntityWriter, x0: float, y_top: float, z: float) -> float:
    """The cautions note and the schedule's title, top left at (x0, y_top).

    Returns the title's baseline [drawing units].
    """
    h = w.height
    # cautions, wrapped to about the table's width
    caution_lines = ["CAUTION"] + textwrap.wrap(w.config.cautions, CAUTIONS_WRAP_CHARS)
    bw, bh = w.block_box(caution_lines)
    note = Placement(x0 + bw / 2.0, y_top - bh / 2.0, z, 0.0, bw, bh, None, False)  # type: ignore[arg-type]
    w.block(caution_lines, note, Mark("notes", "cautions", "cautions"), left=True)
    y = y_top - bh - TITLE_GAP_H * h  # title baseline: a gap, then the title letters
    w.text(
        "CABLE SCHEDULE (cablewright)",
        (x0, y, z),
        Mark("schedule", "schedule", "title"),
        align=TextEntityAlignment.BOTTOM_LEFT,
        height=TITLE_HEIGHT_H * h,
    )
    return y


def schedule_rows(outcomes: Sequence[CircuitOutcome]) -> list[tuple[str, ...]]:
    """One row of :data:`HEADER` per circuit, ``"-"`` where there is no value."""
    rows = []
    for o in outcomes:
        s = o.sizing
        cable = s.cable.describe() if s is not None and s.cable is not None else "-"
        device = (
            f"{rating_text(s.device_rating_a)} A"
            if s is not None and s.device_rating_a is not None
            else "-"
        )
        length = (
            f"{o.route.routed_length_m:.1f} m"
            if o.route is not None and getattr(o.route, "routed_length_m", None) is not None
            else "-"
        )
        rows.append(
            tuple(
                clean(v)
                for v in (o.circuit_id, o.from_tag, o.to_tag, cable, device, length, o.status)
            )
        )
    return rows


def _schedule_panel(
    w: EntityWriter,
    lines: Sequence[Sequence[str]],
    widths: Sequence[float],
    px: float,
    y: float,
    z: float,
    row_h: float,
) -> None:
    """One panel: one MTEXT per column and two polylines for the rules.

    A 2,000-row schedule is then a few hundred entities, not 14,000 TEXT and 2,000 LINE.
    """
    h = w.height
    config = w.config
    table_w = sum(widths)
    bottom = y - len(lines) * row_h
    cx = px
    for c in range(len(HEADER)):
        column = "\\P".join(mtext_escape(row[c]) for row in lines)
        entity = w.msp.add_mtext(
            column,
            dxfattribs={
                "layer": w.layers["schedule"],
                "style": config.text_style,
                "char_height": h,
                "attachment_point": 1,  # top left
                "insert": (cx + CELL_INSET_H * h, y - (row_h - h) / 2.0, z),
                "line_spacing_style": 2,  # exact: rows stay on the grid
                "line_spacing_factor": row_h / (LINE_PITCH * h),
                "width": 0.0,
            },
        )
        w.tag(entity, "schedule", f"column {HEADER[c]}")
        cx += widths[c]
    rules: list[tuple[float, float]] = []
    for r in range(len(lines) + 1):
        yy = y - r * row_h
        ends = [(px, yy), (px + table_w, yy)]
        rules += ends if r % 2 == 0 else ends[::-1]
    cols: list[tuple[float, float]] = []
    cx = px
    for c in range(len(HEADER) + 1):
        ends = [(cx, y), (cx, bottom)]
        cols += ends if c % 2 == 0 else ends[::-1]
        if c < len(HEADER):
            cx += widths[c]
    for pts, ref in ((rules, "grid rows"), (cols, "grid columns")):
        entity = w.msp.add_lwpolyline(
            pts, dxfattribs={"layer": w.layers["schedule"], "elevation": z}
        )
        w.tag(entity, "schedule", ref)


def _schedule_cells_r12(
    w: EntityWriter,
    lines: Sequence[Sequence[str]],
    widths: Sequence[float],
    px: float,
    y: float,
    z: float,
    row_h: float,
) -> None:
    """Schedule panel for DXF R12 (no MTEXT, no LWPOLYLINE): TEXT per cell, LINE rules."""
    h = w.height
    for r, row in enumerate(lines):
        yc = y - (r + 0.5) * row_h
        cx = px
        for c, value in enumerate(row):
            w.text(
                value,
                (cx + CELL_INSET_H * h, yc, z),
                Mark("schedule", "schedule", row[0] if r else "header"),
                align=TextEntityAlignment.MIDDLE_LEFT,
            )
            cx += widths[c]
    table_w = sum(widths)
    bottom = y - len(lines) * row_h
    for r in range(len(lines) + 1):
        yy = y - r * row_h
        w.line((px, yy, z), (px + table_w, yy, z), _GRID)
    cx = px
    for c in range(len(widths) + 1):
        w.line((cx, y, z), (cx, bottom, z), _GRID)
        if c < len(widths):
            cx += widths[c]


