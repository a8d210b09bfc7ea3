"""The style of our marks: layers, colours, text heights and spacing, what to add."""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass, field

__all__ = ["CAUTIONS", "DEFAULT_CONFIG", "LINE_PITCH", "AnnotateConfig"]

#: The cautions written on the drawing and in the report (DEVELOPERS.md, "Safety").
CAUTIONS = (
    "Design aid only: results must be checked by a qualified person against local "
    "wiring rules, the cable maker's data and the installation as built."
)

#: Usual drawing scale denominators (1:n), common practice in building and plant drawings.

LINE_PITCH = 5.0 / 3.0  # MTEXT line pitch / char height at spacing factor 1 (ezdxf, DXF ref.)


@dataclass(frozen=True)
class AnnotateConfig:
    """How the annotated drawing looks.  Every name may be changed.

    Attributes
    ----------
    label_layer, group_layer, device_layer, schedule_layer, notes_layer : str
        Our layers.  When the input already has a layer of that name that is not
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
        ``schedule``, ``notes``).
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
    symbol_max_text_heights: float = 40.0
    cautions: str = CAUTIONS
    crowd_fraction: float | None = 0.25



#: The defaults, one instance (a frozen dataclass, so safe as a default argument).
DEFAULT_CONFIG = AnnotateConfig()
