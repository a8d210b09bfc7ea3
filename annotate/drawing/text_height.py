"""The text height: fitted to the sheet, lowered on a crowded drawing."""

from __future__ import annotations

import logging
import math
from collections.abc import Callable, Mapping, Sequence

from ..model import CircuitOutcome
from .inputs import AnnotationInput
from .labels import label_text
from .style import LABEL_BOX_H, LABEL_MARGIN_H, LINE_PITCH, AnnotateConfig

#: A typical device note or group tag, for the estimate of :func:`mark_area_per_h2`:
#: three lines of 24 characters, a character 0.6 h wide (about the mean advance
#: width of a sans-serif font; common practice).
_NOTE_LINES = 3
_NOTE_CHARS = 24
_CHAR_WIDTH_H = 0.6

__all__ = [
    "USUAL_SCALES",
    "text_height_m_for_extents",
    "crowded_text_height_m",
    "mark_area_per_h2",
    "choose_text_height_m",
]

log = logging.getLogger(__name__)

#: Usual drawing scale denominators (1:n), common practice in building and plant drawings.
USUAL_SCALES = (1, 2, 5, 10, 20, 25, 50, 100, 200, 250, 500, 1000, 2000, 2500, 5000, 10000)


def text_height_m_for_extents(
    width_m: float,
    height_m: float,
    *,
    paper_text_height_mm: float = 2.5,
    sheet_mm: tuple[float, float] = (800.0, 560.0),
    min_m: float = 0.002,
    max_m: float = 10.0,
) -> float:
    """Model-space text height for a drawing of the given extents.

    The scale that fits the extents on the sheet is rounded up to the next
    usual scale (:data:`USUAL_SCALES`); the text height is the paper height
    times that scale, clamped to ``[min_m, max_m]``::

        n = next_usual(max(1000 W / sheet_w, 1000 H / sheet_h))
        h = paper_text_height_mm * n / 1000

    Parameters
    ----------
    width_m, height_m : float
        Extents of the drawing [m].
    paper_text_height_mm : float
        Plotted text height [mm].
    sheet_mm : (float, float)
        Usable sheet size [mm].
    min_m, max_m : float
        Clamp [m].

    Returns
    -------
    float
        Text height [m].

    Examples
    --------
    A 60 m x 30 m plant room fits A1 at 1:100 (60 m / 0.8 m = 75 -> 100):

    >>> text_height_m_for_extents(60.0, 30.0)
    0.25
    """
    need = max(1000.0 * width_m / sheet_mm[0], 1000.0 * height_m / sheet_mm[1], 1.0)
    scale: float | None = next((s for s in USUAL_SCALES if s >= need - 1e-9), None)
    if scale is None:
        scale = need
    return min(max(paper_text_height_mm * scale / 1000.0, min_m), max_m)


def crowded_text_height_m(
    area_per_h2: float,
    width_m: float,
    height_m: float,
    *,
    fraction: float = 0.25,
    paper_text_height_mm: float = 2.5,
    min_m: float = 0.002,
) -> float:
    """Text height at which the marks cover at most ``fraction`` of the extents.

    Marks of text height ``h`` cover ``A * h**2`` (``A`` = ``area_per_h2``, the
    sum of every mark's box in units of ``h**2``).  The largest height with
    ``A * h**2 <= fraction * W * H`` is rounded down to the plotted text height
    at a usual scale (:data:`USUAL_SCALES`): the crowded drawing is then read
    at that larger scale, on several sheets, rather than squeezed on one.
    The rule and the default fraction are our own choice (labels that do not
    fit overlap, and cost the most time to place).

    Parameters
    ----------
    area_per_h2 : float
        Total box area of the marks divided by the text height squared [-].
    width_m, height_m : float
        Extents of the drawing [m].
    fraction : float
        Share of the extents the marks may cover [-].
    paper_text_height_mm : float
        Plotted text height [mm].
    min_m : float
        Lower clamp [m].

    Returns
    -------
    float
        Text height [m]; ``inf`` when there are no marks.

    Examples
    --------
    1,000 marks of 20 h x 2 h on a 1,000 m x 500 m plant, 5 % covered: the
    largest height is sqrt(0.05 * 5e5 / 4e4) = 0.79 m, so 1:250 (0.625 m).

    >>> crowded_text_height_m(40_000.0, 1000.0, 500.0, fraction=0.05)
    0.625
    """
    if area_per_h2 <= 0.0:
        return math.inf
    limit = math.sqrt(max(fraction, 0.0) * max(width_m, 0.0) * max(height_m, 0.0) / area_per_h2)
    fitting = [s for s in USUAL_SCALES if paper_text_height_mm * s / 1000.0 <= limit + 1e-12]
    h = paper_text_height_mm * max(fitting) / 1000.0 if fitting else min_m
    return max(h, min_m)


def mark_area_per_h2(
    outcomes: Sequence[CircuitOutcome],
    per_segment: Mapping[str, Sequence[str]],
    measure: Callable[[str], float],
    config: AnnotateConfig,
) -> float:
    """Box area of the marks to place, in units of text height squared (an estimate).

    Cable labels from their text (``measure`` = advance width at height 1, box
    margins as :meth:`EntityWriter.line_box`); one device note per load and one group
    tag per shared segment as three-line blocks of 24 characters (a typical
    size; the exact tags are only known later).
    """
    area = 0.0
    loads = set()
    for o in outcomes:
        if o.status != "error" and o.sizing is not None and o.sizing.cable is not None:
            area += (measure(label_text(o)) + LABEL_MARGIN_H) * LABEL_BOX_H
            loads.add(o.to_tag)
    block = (_NOTE_CHARS * _CHAR_WIDTH_H + LABEL_MARGIN_H) * (
        (_NOTE_LINES - 1) * LINE_PITCH + LABEL_BOX_H
    )
    if config.device_notes:
        area += len(loads) * block
    if config.group_tags:
        area += sum(1 for c in per_segment.values() if len(set(c)) >= 2) * block
    return area



def choose_text_height_m(
    marks: AnnotationInput,
    extents_m: tuple[float, float],
    measure: Callable[[str], float],
    config: AnnotateConfig,
    source: str = "",
) -> float:
    """The text height of this drawing [m]: fixed, sheet-fitted, or lowered when crowded.

    Parameters
    ----------
    marks : AnnotationInput
        What will be written (for the crowding estimate).
    extents_m : (float, float)
        Width and height of the drawing's extents [m].
    measure : callable
        Advance width of a text at height 1 [-].
    config : AnnotateConfig
        ``text_height_m`` (fixed), else the sheet fit (:func:`text_height_m_for_extents`)
        and, with ``crowd_fraction``, :func:`crowded_text_height_m`.
    source : str
        The drawing, named in the log.

    Returns
    -------
    float
        Text height [m].
    """
    if config.text_height_m is not None:
        return float(config.text_height_m)
    width_m, height_m = extents_m
    h_m = text_height_m_for_extents(
        width_m,
        height_m,
        paper_text_height_mm=config.paper_text_height_mm,
        sheet_mm=config.sheet_mm,
        min_m=config.min_text_height_m,
        max_m=config.max_text_height_m,
    )
    if config.crowd_fraction is not None:
        demand = mark_area_per_h2(marks.outcomes, marks.per_segment, measure, config)
        crowded = crowded_text_height_m(
            demand,
            width_m,
            height_m,
            fraction=config.crowd_fraction,
            paper_text_height_mm=config.paper_text_height_mm,
            min_m=config.min_text_height_m,
        )
        if crowded < h_m:
            log.info(
                "%s: crowded drawing (%d circuits); text height %.3g m instead of %.3g m",
                source, len(marks.outcomes), crowded, h_m,
            )
            h_m = crowded
    return h_m
