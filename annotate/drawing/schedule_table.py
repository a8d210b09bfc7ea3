"""The schedule table beside the drawing, with the cautions note and the title above it."""

from __future__ import annotations

import textwrap
from collections.abc import Sequence

from cablewright.sizing.cable_text import pe_text
from ezdxf.enums import TextEntityAlignment

from ..model import CircuitOutcome
from ..rows import METRE, LengthUnit, rows, unit_of_outcomes
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
from .text import clean, mtext_escape

__all__ = ["HEADER", "header", "schedule_table", "cautions_and_title", "schedule_rows", "title_block_lines"]


#: Columns of the schedule table on the drawing (contract.md, "The annotated DXF").
#: ``order m`` is the length to order: design length (routed plus the tails and
#: allowances) times the cables in parallel (issue 12: the installer cuts this, not
#: the routed length); ``PE`` a protective conductor smaller than the phases.
HEADER = ("circuit", "from", "to", "cable", "PE", "device", "order m", "status")

#: The rules of an R12 schedule (LINE entities).
_GRID = Mark("schedule", "schedule", "grid")


def schedule_table(
    w: EntityWriter, outcomes: Sequence[CircuitOutcome], x0: float, y_top: float, z: float
) -> int:
    """Cautions, title and the schedule table, top left at (x0, y_top)."""
    h = w.height
    y = cautions_and_title(w, x0, y_top, z)
    y -= TITLE_TO_TABLE_H * h
    unit = unit_of_outcomes(outcomes, w.config.length_unit)
    head = header(unit)
    table = schedule_rows(outcomes, unit)
    widths = [
        max(w.text_width(r[i]) for r in [head, *table]) + COLUMN_PADDING_H * h
        for i in range(len(head))
    ]
    table_w = sum(widths)
    row_h = (R12_ROW_PITCH_H if w.r12 else LINE_PITCH) * h
    per_panel = max(1, w.config.schedule_rows_per_panel)
    panels = [table[i : i + per_panel] for i in range(0, len(table), per_panel)] or [[]]
    for p, panel in enumerate(panels):
        px = x0 + p * (table_w + PANEL_GAP_H * h)
        lines = [head, *panel]
        if w.r12:
            _schedule_cells_r12(w, lines, widths, px, y, z, row_h)
        else:
            _schedule_panel(w, lines, widths, px, y, z, row_h)
    return len(table)


def tool_version() -> str:
    """The installed cablewright version ("" when not installed as a package)."""
    from importlib import metadata

    try:
        return metadata.version("cablewright")
    except metadata.PackageNotFoundError:
        return ""


def title_block_lines(config) -> list[str]:
    """``PROJECT ...``, ``DRAWING REVISION ... DATE ...`` and the tool line of the title block
    ([annotate] project, revision, date; "" writes "-")."""
    version = tool_version()
    return [
        f"PROJECT {clean(config.project) or '-'}",
        f"DRAWING REVISION {clean(config.revision) or '-'}   DATE {clean(config.date) or '-'}",
        f"MARKS BY cablewright {version}".rstrip(),
    ]


def cautions_and_title(w: EntityWriter, x0: float, y_top: float, z: float) -> float:
    """The cautions note and the schedule's title, top left at (x0, y_top).

    Returns the title's baseline [drawing units].
    """
    h = w.height
    # title block: project, drawing revision, date, tool version; then the cautions,
    # wrapped to about the table's width
    caution_lines = [*title_block_lines(w.config), "CAUTION",
                     *textwrap.wrap(w.config.cautions, CAUTIONS_WRAP_CHARS)]
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


def header(unit: LengthUnit = METRE) -> tuple[str, ...]:
    """:data:`HEADER` with the length to order in ``unit`` (``"order ft"`` for NEC)."""
    return (*HEADER[:6], f"order {unit.symbol}", HEADER[7])


def schedule_rows(outcomes: Sequence[CircuitOutcome], unit: LengthUnit | None = None,
                  length_unit: str = "") -> list[tuple[str, ...]]:
    """One row of :data:`HEADER` per circuit, ``"-"`` where there is no value.

    Read from the circuits' :class:`..rows.ScheduleRow`; the length to order is
    in ``unit`` (``None``: the rule set's, or ``length_unit``: "m", "ft").
    """
    out = []
    for r in rows(outcomes, unit, length_unit):
        c = r.cable
        pe = pe_text(r.sizing.protective_conductor_mm2, c.selection.csa_mm2) if r.sizing and c else ""
        order = r.order_length_m
        out.append(tuple(clean(v) for v in (
            r.circuit_id, r.from_tag, r.to_tag, c.text if c is not None else "-", pe or "-",
            r.device_text or "-", "-" if order is None else f"{r.unit.of(order):.1f}", r.status)))
    return out


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
    for c in range(len(lines[0])):
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
        w.tag(entity, "schedule", f"column {lines[0][c]}")
        cx += widths[c]
    rules: list[tuple[float, float]] = []
    for r in range(len(lines) + 1):
        yy = y - r * row_h
        ends = [(px, yy), (px + table_w, yy)]
        rules += ends if r % 2 == 0 else ends[::-1]
    cols: list[tuple[float, float]] = []
    cx = px
    for c in range(len(widths) + 1):
        ends = [(cx, y), (cx, bottom)]
        cols += ends if c % 2 == 0 else ends[::-1]
        if c < len(widths):
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


