"""One pass adding every mark to a document, given what is already on the drawing.

Shared by both writers: the full writer (:mod:`.writer`) runs it on the parsed
drawing; the appending writer (:mod:`.append_writer`) on a small scratch
document holding only what the marks must avoid (:mod:`.append_scan`), then
copies the marks into the original bytes.  One implementation of what a mark
is and where it goes.
"""

from __future__ import annotations

import logging
from collections.abc import Callable
from dataclasses import dataclass
from typing import Any

from .boxes import LabelIndex
from .device_notes import place_equipment_notes
from .entities import EntityWriter
from .group_tags import place_group_tags
from .inputs import AnnotationInput
from .labels import place_cable_labels
from .linework import drawing_linework
from .obstacles import DrawingScan, extents, keep_clear_boxes
from .revision_marks import place_fill_marks
from .schedule_table import schedule_table
from .stretches import route_obstacles, scaled
from .style import INDEX_CELL_H, SCHEDULE_GAP_H, AnnotateConfig
from .text_height import choose_text_height_m

__all__ = ["MarkCounts", "add_marks"]

log = logging.getLogger(__name__)


@dataclass(frozen=True)
class MarkCounts:
    """What :func:`add_marks` added (see ``writer.AnnotationSummary``)."""

    labels: int
    group_tags: int
    device_notes: int
    error_notes: int
    schedule_rows: int
    overlapping: int
    text_height: float
    layers: dict[str, str]
    unlabelled: tuple[str, ...]
    fill_marks: int


def add_marks(
    doc: Any,
    scan: DrawingScan,
    marks: AnnotationInput,
    config: AnnotateConfig,
    measure: Callable[[str], float],
    source: str,
    progress: Callable[[int], None] | None = None,
) -> MarkCounts:
    """Choose the text height and add labels, tags, notes and the schedule to ``doc``.

    Parameters
    ----------
    doc : ezdxf.document.Drawing
        Where the marks go (its tables get our layers, style, linetype, app id).
    scan : DrawingScan
        The drawing's extents, text and symbol boxes (:func:`.obstacles.scan_modelspace`).
    marks : AnnotationInput
    config : AnnotateConfig
    measure : callable
        Advance width of a text at height 1 in the drawing's font.
    source : str
        The input's name, for messages.
    progress : callable, optional
        Called with 1 per cable label placed.
    """
    k = float(marks.units_per_m)
    route_pts = [p for seg in marks.segments.values() for p in scaled(seg.points_m, k)]
    route_pts += [scaled([e.position_m], k)[0] for e in marks.equipment.values()]
    xmin, ymin, xmax, ymax = extents(scan, route_pts)
    extents_m = ((xmax - xmin) / k, (ymax - ymin) / k)
    h = choose_text_height_m(marks, extents_m, measure, config, source) * k
    route_layers = sorted({str(getattr(s, "layer", "")) for s in marks.segments.values()} - {""})
    w = EntityWriter(doc, config, h, route_layers)
    blocked = keep_clear_boxes(scan, config, h)
    routes = route_obstacles(scaled(s.points_m, k) for s in marks.segments.values())
    index = LabelIndex(
        cell=INDEX_CELL_H * h,
        blocked=blocked,
        # the drawing's own linework as obstacles: off by default, the wider search it
        # needs costs minutes on a 2,000-circuit plant (benchmarks/RESULTS.md)
        lines=drawing_linework(doc, config.appid, h, routes) if config.avoid_linework else None,
    )
    log.debug("%s: %d text and symbol boxes kept clear", source, len(blocked))

    labels, overlapping, unlabelled = place_cable_labels(w, index, marks, progress)
    group_tags = 0
    if config.group_tags:
        group_tags, extra = place_group_tags(w, index, marks)
        overlapping += extra
    device_notes, error_notes, extra = place_equipment_notes(w, index, marks)
    overlapping += extra
    fill_notes = place_fill_marks(w, index, marks)

    # everything placed so far widens the extents the schedule sits beside
    placed = index.bounds()
    if placed is not None:
        _, _, placed_xmax, placed_ymax = placed
        xmax, ymax = max(xmax, placed_xmax), max(ymax, placed_ymax)
    schedule_rows = 0
    if config.schedule:
        schedule_rows = schedule_table(w, marks.outcomes, xmax + SCHEDULE_GAP_H * h, ymax, 0.0)
    return MarkCounts(labels, group_tags, device_notes, error_notes, schedule_rows, overlapping,
                      h, dict(w.layers), tuple(unlabelled), fill_notes)
