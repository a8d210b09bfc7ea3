"""One pass adding every mark to a document, given what is already on the drawing.

Shared by both writers: the full writer (:mod:`.writer`) runs it on the parsed
drawing; the appending writer (:mod:`.append_writer`) on a small scratch
document holding only what the marks must avoid (:mod:`.append_scan`), then
copies the marks into the original bytes.  One implementation of what a mark
is and where it goes.
"""

from __future__ import annotations

import logging
from collections.abc import Callable, Iterable, Mapping, Sequence
from dataclasses import dataclass, field
from itertools import chain
from typing import Any

from ..sketch import Sketch, layer_colors, sketch_entities
from .boxes import LabelIndex
from .device_notes import place_equipment_notes
from .entities import EntityWriter
from .group_tags import TaggedRun, place_group_tags, tagged_runs
from .inputs import AnnotationInput
from .labels import place_cable_labels
from .linework import drawing_linework
from .mark_rounds import MarkRound, no_repair_rounds, place_in_rounds
from .note_keys import keyed_notes_list
from .obstacles import DrawingScan, extents, keep_clear_boxes
from .revision_marks import place_fill_marks
from .schedule_table import schedule_table
from .segment_ids import id_stretches, place_segment_ids
from .stretches import route_obstacles, scaled
from .style import INDEX_CELL_H, SCHEDULE_GAP_H, TITLE_TO_TABLE_H, AnnotateConfig
from .text_height import choose_text_height_m

__all__ = ["MarkCounts", "add_marks"]

log = logging.getLogger(__name__)

ProgressHook = Callable[[int], None]


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
    segment_ids: int = 0
    placement: Mapping[str, Any] = field(default_factory=dict)
    sketch: Sketch | None = field(default=None, repr=False, compare=False)


class _RecordingWriter(EntityWriter):
    """The pen, keeping every entity it adds (each passes :meth:`tag`) for the preview."""

    def __init__(self, *args: Any, **kwargs: Any) -> None:
        super().__init__(*args, **kwargs)
        self.added: list[Any] = []

    def tag(self, entity: Any, kind: str, ref: str) -> Any:
        self.added.append(entity)
        return super().tag(entity, kind, ref)


def _sketch(w: _RecordingWriter) -> Sketch:
    """The sketch of what ``w`` added, with the drawing's layer colours (for the preview)."""
    layers = layer_colors(w.doc)
    return sketch_entities(w.added, layers, Sketch(layer_aci=layers))


def _place_marks(w: EntityWriter, index: LabelIndex, marks: AnnotationInput,
                 config: AnnotateConfig, progress: ProgressHook | None,
                 select: MarkRound | None, runs: Sequence[TaggedRun]) -> tuple[Any, ...]:
    """Every mark but the schedule, the least free first: (on a drawing too large for repair
    rounds, the ids of short segments, :mod:`.segment_ids`), cable labels (strict rule), group
    tags (big blocks), segment ids (bound to their segment), fill notes, device and error
    notes (free to go further out with their leader); ``select``: a repair round's marks
    first, kind by kind (:mod:`.mark_rounds`); ``runs``: the runs that get group tags
    (:func:`.group_tags.tagged_runs`), their fills written under them."""
    ids_first = config.segment_ids and no_repair_rounds(marks)
    ids = id_stretches(marks) if config.segment_ids else []  # once for both passes
    segment_ids = place_segment_ids(w, index, marks, select, short=True, todo=ids) if ids_first else 0
    labels, _, unlabelled = place_cable_labels(w, index, marks, progress, select)
    group_tags, _, fills_under_tags = (place_group_tags(w, index, marks, select, runs)
                                       if config.group_tags else (0, 0, 0))
    if config.segment_ids:
        segment_ids += place_segment_ids(w, index, marks, select, short=False if ids_first else None,
                                         todo=ids)
    fill_notes = place_fill_marks(w, index, marks, select, runs) + fills_under_tags
    device_notes, error_notes, _ = place_equipment_notes(w, index, marks, select)
    return labels, unlabelled, group_tags, device_notes, error_notes, segment_ids, fill_notes


def add_marks(
    doc: Any,
    scan: DrawingScan,
    marks: AnnotationInput,
    config: AnnotateConfig,
    measure: Callable[[str], float],
    source: str,
    progress: ProgressHook | None = None,
    *,
    lines: Iterable[Any] = (),
) -> MarkCounts:
    """Choose the text height and add labels, tags, ids, notes and the schedule to ``doc``.

    Parameters
    ----------
    doc : ezdxf.document.Drawing
        Where the marks go (its tables get our layers, style, linetype, app id); with
        ``config.avoid_linework`` its modelspace lines are obstacles (:mod:`.linework`).
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
    lines : iterable of shapely geometries, optional
        More of the drawing's linework than ``doc`` holds (the appending writer's
        LINEs, :mod:`.append_scan`), avoided with it.
    """
    k = float(marks.units_per_m)
    route_pts = [p for seg in marks.segments.values() for p in scaled(seg.points_m, k)]
    route_pts += [scaled([e.position_m], k)[0] for e in marks.equipment.values()]
    xmin, ymin, xmax, ymax = extents(scan, route_pts)
    extents_m = ((xmax - xmin) / k, (ymax - ymin) / k)
    h = choose_text_height_m(marks, extents_m, measure, config, source) * k
    route_layers = sorted({str(getattr(s, "layer", "")) for s in marks.segments.values()} - {""})
    w = _RecordingWriter(doc, config, h, route_layers)
    blocked = keep_clear_boxes(scan, config, h)
    routes = route_obstacles(scaled(s.points_m, k) for s in marks.segments.values())
    # the drawing's own linework (walls, routes, symbol lines) as obstacles, one tree
    linework = drawing_linework(doc, config.appid, h, chain(routes, lines)) if config.avoid_linework else None
    log.debug("%s: %d text and symbol boxes kept clear", source, len(blocked))

    def make_index() -> LabelIndex:
        return LabelIndex(cell=INDEX_CELL_H * h, blocked=blocked, lines=linework)

    runs = tagged_runs(marks) if config.group_tags else []  # one decision for tags and fills

    def place_all(index: LabelIndex, select: MarkRound, first_round: bool) -> tuple[Any, ...]:
        return _place_marks(w, index, marks, config, progress if first_round else None, select,
                            runs)

    placed_marks, index = place_in_rounds(w, make_index, place_all)
    labels, unlabelled, group_tags, device_notes, error_notes, segment_ids, fill_notes = placed_marks
    stats = index.stats  # the last resorts are logged by the writer, naming its output

    # everything placed so far widens the extents the schedule sits beside
    placed = index.bounds()
    if placed is not None:
        _, _, placed_xmax, placed_ymax = placed
        xmax, ymax = max(xmax, placed_xmax), max(ymax, placed_ymax)
    x0 = xmax + SCHEDULE_GAP_H * h
    y_top = ymax  # the keyed notes (:mod:`.note_keys`) first, then the schedule under them
    if stats.keyed_notes:
        y_top = keyed_notes_list(w, stats.keyed_notes, x0, ymax, 0.0) - TITLE_TO_TABLE_H * h
    schedule_rows = 0
    if config.schedule:
        schedule_rows = schedule_table(w, marks.outcomes, x0, y_top, 0.0)
    return MarkCounts(labels, group_tags, device_notes, error_notes, schedule_rows,
                      stats.overlapping, h, dict(w.layers), tuple(unlabelled), fill_notes,
                      segment_ids=segment_ids, placement=stats.as_dict(), sketch=_sketch(w))
