"""The style of our marks: layers, colours, text heights and spacing, what to add."""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass, field
from typing import Literal

__all__ = ["CAUTIONS", "DEFAULT_CONFIG", "LINE_PITCH", "AnnotateConfig"]

#: The cautions written on the drawing and in the report (DEVELOPERS.md, "Safety").
CAUTIONS = (
    "Design aid only: results must be checked by a qualified person against local "
    "wiring rules, the cable maker's data and the installation as built."
)

# -- spacing, in text heights h (our own choices unless a source is named) ----------

#: MTEXT line pitch / char height at spacing factor 1 (ezdxf, DXF reference).
LINE_PITCH = 5.0 / 3.0
#: Line pitch of stacked TEXT lines on DXF R12 (no MTEXT there): the MTEXT pitch
#: rounded to three places, so R12 notes look like the MTEXT ones.
R12_LINE_PITCH_H = 1.667
#: Margin added to a label's text width: 0.2 h clear at each end, so two labels
#: placed end to end never touch.
LABEL_MARGIN_H = 0.4
#: Height of a one-line label box: cap height (1 h) plus the descender (0.2 h)
#: plus 0.25 h clear above and below.
LABEL_BOX_H = 1.7
#: Extra height of a multi-line note box over its MTEXT content: 0.35 h clear
#: above and below, so stacked notes keep a visible gap.
NOTE_MARGIN_H = 0.7
#: Left inset of left-aligned note lines in their box (half of :data:`LABEL_MARGIN_H`).
NOTE_INSET_H = 0.2
#: Top inset of a left-aligned MTEXT note in its box (half of :data:`NOTE_MARGIN_H`).
NOTE_TOP_INSET_H = 0.35
#: Grid cell of the placed-label index: about one label's length (a 20-30
#: character label is 12-18 h wide), so an overlap test looks at a few cells.
INDEX_CELL_H = 12.0
#: A group tag further than this from its run gets a leader: beyond a line or
#: so of clear space the reader no longer sees which run it belongs to.
GROUP_LEADER_AFTER_H = 1.5
#: Clear space between the drawing's extents (and every placed mark) and the
#: cautions note and schedule table on their right.
SCHEDULE_GAP_H = 10.0
#: Characters per line of the wrapped cautions note (about the table's width).
CAUTIONS_WRAP_CHARS = 60
#: Gap between the cautions note and the schedule title's baseline.
TITLE_GAP_H = 2.0
#: Letter height of the schedule title (one step up the ISO 3098 series from
#: 2.5 mm is 3.5 mm, 1.4 h; from memory).
TITLE_HEIGHT_H = 1.4
#: Gap between the title's baseline and the table's top rule.
TITLE_TO_TABLE_H = 0.6
#: Padding added to a schedule column's widest text (0.6 h each side).
COLUMN_PADDING_H = 1.2
#: Inset of a schedule cell's text from the column's left rule.
CELL_INSET_H = 0.6
#: Row pitch of the schedule on DXF R12 (TEXT per cell, middle aligned).
R12_ROW_PITCH_H = 1.8
#: Gap between two panels (columns of rows) of the schedule.
PANEL_GAP_H = 3.0
#: A block reference (equipment symbol) is a keep-clear box when its larger side is
#: at most ``symbol_max_text_heights`` text heights; a box's side is twice its half size.
BOX_SIDES_PER_HALF = 2.0

# -- colours (AutoCAD Color Index) ------------------------------------------------

#: Colour of the label of a failing circuit: ACI 1, red, the usual colour of a warning.
FAIL_COLOR = 1


@dataclass(frozen=True)
class AnnotateConfig:
    """How the annotated drawing looks.  Every name may be changed.

    Attributes
    ----------
    label_layer, group_layer, device_layer, schedule_layer, notes_layer : str
        Our layers.  Their colours (``colors``) are kept unless a route layer of the
        drawing uses the same colour; then another is chosen at run time
        (:mod:`.mark_style`), so no mark of ours reads as a route.
    revision_layer, fill_layer : str
        Our layers for the revision marks (``size --previous``: a diamond holding the
        revision beside each new or changed circuit's label) and the fill marks (tray
        or duct fill above its limit, at the segment).  When the input already has a layer of that name that is not
        ours, ``-2``, ``-3`` ... is appended.
    appid : str
        XDATA application id marking every entity (and layer) we add.
    text_style : str
        Text style we create (font ``font``; ``txt`` for DXF R12).
    font : str
        Font file of the text style, also used to measure labels.
    text_height_m : float or None
        Fixed text height in model space [m]; ``None`` derives it from the
        extents (see :func:`text_height_m_for_extents`).
    paper_text_height_mm : float
        Plotted text height [mm] (2.5 mm, ISO 3098 series, common practice).
    sheet_mm : (float, float)
        Usable sheet width and height the extents are fitted on [mm]
        (A1 landscape, 841 x 594 mm less margins).
    min_text_height_m, max_text_height_m : float
        Clamp of the derived height [m].
    colors : mapping
        ACI colour per layer role (``label``, ``group``, ``device``,
        ``schedule``, ``notes``, ``revision``, ``fill``).
    label_fields : tuple of str
        What a cable label shows, in order: ``circuit`` (id), ``cable`` (cores x
        size, conductor/insulation; the NEC size label for NEC), ``pe`` (a separate
        or reduced protective conductor), ``parallel`` (cables in parallel),
        ``length`` (length to order), ``device``.
    device_fields : tuple of str
        What a device note shows besides the tag: ``device`` (kind and rating).
    length_unit : str
        Unit of the lengths on the drawing, in the schedule files and the report:
        ``"m"`` or ``"ft"`` (1 ft = 0.3048 m exactly); "" follows the rule set,
        metres for IEC, feet for NEC (:func:`cablewright.annotate.rows.length_unit`).
        ``schedule.json`` keeps metres.
    group_tags, device_notes, schedule, error_notes : bool
        Switch each kind of mark on or off (labels are always written).
    schedule_rows_per_panel : int
        Rows in one column of the schedule table before a new column starts.
    ids_per_line : int
        Circuit ids per line in a group tag.
    group_tag_max_ids : int
        Circuit ids written in a group tag; beyond that the tag ends with
        ``"+k more"`` (the full membership of every segment is in
        ``schedule.json``: each circuit's ``route.segments``).
    avoid_drawing_text : bool
        Keep marks off the drawing's own TEXT, MTEXT and visible ATTRIB boxes.
    avoid_linework : bool
        Keep our texts off the drawing's lines (walls, routes, symbol lines; issue 12).
        False only places marks clear of text, symbols and each other.
    segment_ids : bool
        Write every route segment's id once on the segment (the ids of the segment
        schedule and of ``route.segments`` in schedule.json).
    avoid_symbols : bool
        Keep marks off block references (equipment symbols).
    symbol_max_text_heights : float
        A block reference larger than this many text heights (a frame, a whole
        room drawn as a block) is not an obstacle.
    cautions : str
        Text of the cautions note.
    crowd_fraction : float or None
        On a crowded drawing the derived text height is lowered until the
        marks cover at most this share of the extents (see
        :func:`crowded_text_height_m`); ``None`` keeps the sheet-fitted height.
    project, revision, date : str
        Header of every page of report.html and report.pdf
        (:class:`cablewright.annotate.report_trace.ReportConfig`): "" writes the
        drawing's name, "-", and ``SOURCE_DATE_EPOCH`` or no date.

    Notes
    -----
    Group tags.  A route segment shared by two or more circuits is tagged, but
    not every such segment: shared segments that continue one another (end to
    end, with no third shared segment at the joint) form one *run* and get one
    tag, so a tray from which circuits peel off at every tee carries one tag,
    not one per tee (see :func:`group_runs`).  The tag is placed beside the
    run's best stretch (free, least crowded, long enough) and reads::

        S4, S5: 6 circuits, 6 cables
        S6: 5 circuits, 5 cables
        F-MCC1, P-101, P-102
        P-103, P-104, SP-1 +3 more

    The head lines name every segment of the run, grouped by equal circuit and
    cable counts (most crowded first; at most four lines, the rest summed up
    as ``"+k segments: 2-4 circuits"``), so each shared segment stays
    traceable; at most ``group_tag_max_ids`` circuit ids of the most crowded
    segment follow, ``ids_per_line`` a line.
    A tag pushed away from its run by other marks gets a leader line.
    """

    label_layer: str = "CW-CABLE-LABEL"
    group_layer: str = "CW-GROUP-TAG"
    device_layer: str = "CW-DEVICE-NOTE"
    schedule_layer: str = "CW-SCHEDULE"
    notes_layer: str = "CW-NOTES"
    appid: str = "CABLEWRIGHT"
    text_style: str = "CW-TEXT"
    font: str = "arial.ttf"
    text_height_m: float | None = None
    paper_text_height_mm: float = 2.5
    sheet_mm: tuple[float, float] = (800.0, 560.0)
    min_text_height_m: float = 0.002
    max_text_height_m: float = 10.0
    colors: Mapping[str, int] = field(
        default_factory=lambda: {
            "label": 5,
            "group": 6,
            "device": 94,
            "schedule": 7,
            "notes": 1,
            "revision": 30,
            "fill": 1,
        }
    )
    group_tags: bool = True
    device_notes: bool = True
    schedule: bool = True
    error_notes: bool = True
    schedule_rows_per_panel: int = 60
    ids_per_line: int = 3
    group_tag_max_ids: int = 6
    avoid_drawing_text: bool = True
    avoid_symbols: bool = True
    avoid_linework: bool = True
    segment_ids: bool = True
    symbol_max_text_heights: float = 40.0
    cautions: str = CAUTIONS
    crowd_fraction: float | None = 0.25
    project: str = ""
    revision: str = ""
    date: str = ""
    revision_layer: str = "CW-REVISION"
    fill_layer: str = "CW-FILL"
    label_fields: tuple[str, ...] = ("circuit", "parallel", "cable", "pe")
    device_fields: tuple[str, ...] = ("device",)
    length_unit: Literal["", "m", "ft"] = ""



#: The defaults, one instance (a frozen dataclass, so safe as a default argument).
DEFAULT_CONFIG = AnnotateConfig()
