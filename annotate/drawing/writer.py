"""The one writer: reads the drawing, chooses the text height, adds every mark, saves."""

from __future__ import annotations

import logging
import os
from collections.abc import Callable, Mapping
from dataclasses import dataclass, field, replace
from pathlib import Path
from typing import Any

import ezdxf
from cablewright.core.errors import DrawingReadError
from ezdxf.fonts import fonts

from ..atomic import atomic_path
from ..sketch import Sketch, layer_colors, sketch_entities
from .boxes import LabelIndex
from .device_notes import place_equipment_notes
from .entities import EntityWriter
from .group_tags import place_group_tags
from .inputs import AnnotationInput
from .labels import place_cable_labels
from .linework import drawing_linework
from .obstacles import extents, keep_clear_boxes, scan_modelspace
from .old_marks import remove_old_marks
from .revision_marks import place_fill_marks
from .schedule_table import schedule_table
from .segment_ids import place_segment_ids
from .stretches import route_obstacles, scaled
from .style import DEFAULT_CONFIG, INDEX_CELL_H, SCHEDULE_GAP_H, AnnotateConfig
from .text_height import choose_text_height_m

__all__ = ["AnnotationSummary", "write_annotated_dxf"]

log = logging.getLogger(__name__)

ProgressHook = Callable[[int], None]


@dataclass(frozen=True)
class AnnotationSummary:
    """What :func:`write_annotated_dxf` wrote.

    Attributes
    ----------
    output_path : pathlib.Path
    labels : int
        Cable labels (one per sized circuit).
    group_tags, device_notes, error_notes, schedule_rows : int
    removed : int
        Entities of an earlier run removed from the input.
    overlapping : int
        Labels and notes that found no free spot (placed anyway, flagged).
    text_height : float
        Text height used [drawing units].
    layers : mapping
        Role -> layer name actually used.
    unlabelled : tuple of str
        Sized circuits that got no label (no route geometry), with the reason.
    revision_marks, fill_marks : int
        Revision marks beside changed labels; fill notes at over-full segments.
    sketch : Sketch or None
        Every entity we added, as the preview draws it, and the ACI colour of
        every layer of the drawing (the route layers' in the preview; :mod:`..sketch`).
    segment_ids : int
        Segment ids written on the route network.
    placement : mapping
        How the marks were placed (:class:`.mark_index.PlacementStats`): beside their
        route, with a leader, and the last resorts (crossing a line, overlapping).
    """

    output_path: Path
    labels: int
    group_tags: int
    device_notes: int
    error_notes: int
    schedule_rows: int
    removed: int
    overlapping: int
    text_height: float
    layers: Mapping[str, str]
    unlabelled: tuple[str, ...] = ()
    revision_marks: int = 0
    fill_marks: int = 0
    segment_ids: int = 0
    placement: Mapping[str, float] = field(default_factory=dict)
    sketch: Sketch | None = field(default=None, repr=False, compare=False)


class _RecordingWriter(EntityWriter):
    """The pen, keeping every entity it adds (each passes :meth:`tag`) for the preview."""

    def __init__(self, *args: Any, **kwargs: Any) -> None:
        super().__init__(*args, **kwargs)
        self.added: list[Any] = []

    def tag(self, entity: Any, kind: str, ref: str) -> Any:
        self.added.append(entity)
        return super().tag(entity, kind, ref)


def _with_sketch(w: _RecordingWriter, summary: AnnotationSummary) -> AnnotationSummary:
    """The summary with the sketch of what ``w`` added (for the preview)."""
    layers = layer_colors(w.doc)
    return replace(summary, sketch=sketch_entities(w.added, layers, Sketch(layer_aci=layers)))


def _read_input(src: Path) -> Any:
    """Parse the input drawing (when the caller did not pass the parsed document)."""
    try:
        return ezdxf.readfile(src)
    except OSError as exc:
        raise DrawingReadError(f"{src}: cannot read the drawing ({exc}); check the path") from exc
    except ezdxf.DXFStructureError as exc:
        raise DrawingReadError(
            f"{src}: the drawing is damaged ({exc}); repair it in CAD or re-export it"
        ) from exc


def _place_marks(w: EntityWriter, index: LabelIndex, marks: AnnotationInput,
                 config: AnnotateConfig, progress: ProgressHook | None) -> tuple[Any, ...]:
    """Every mark but the schedule, the least free first: cable labels (strict rule), group
    tags (big blocks), segment ids (bound to their segment), fill notes, device and error
    notes (free to go further out with their leader)."""
    labels, _, unlabelled = place_cable_labels(w, index, marks, progress)
    group_tags = place_group_tags(w, index, marks)[0] if config.group_tags else 0
    segment_ids = place_segment_ids(w, index, marks) if config.segment_ids else 0
    fill_notes = place_fill_marks(w, index, marks)
    device_notes, error_notes, _ = place_equipment_notes(w, index, marks)
    return labels, unlabelled, group_tags, device_notes, error_notes, segment_ids, fill_notes


def write_annotated_dxf(
    input_path: str | os.PathLike[str],
    output_path: str | os.PathLike[str],
    marks: AnnotationInput,
    config: AnnotateConfig = DEFAULT_CONFIG,
    *,
    progress: ProgressHook | None = None,
    document: Any = None,
) -> AnnotationSummary:
    """Write a copy of the drawing with cable labels, group tags, notes and schedule.

    Parameters
    ----------
    input_path : path-like
        The drawing (DXF).  Only read.
    output_path : path-like
        Where the annotated copy goes; written atomically.  Must differ from
        ``input_path``.
    marks : AnnotationInput
        The circuits' outcomes, the route segments, the circuits per segment,
        the equipment and the drawing units per metre.
    config : AnnotateConfig
        Layer names, text height, what to add.
    progress : callable, optional
        Called with ``1`` after each cable label is placed (one call per
        labelled circuit), e.g. ``tqdm.update``.
    document : ezdxf.document.Drawing, optional
        The drawing already parsed from ``input_path`` (``Measurement.source_document``,
        kept by the extract stage), so the file is not read a second time.  Our
        marks are added to this document, which is then saved to
        ``output_path`` (never to ``input_path``); afterwards it holds the
        annotated drawing (the preview draws from ``AnnotationSummary.sketch`` instead).

    Returns
    -------
    AnnotationSummary

    Raises
    ------
    DrawingReadError
        The input cannot be read, or the output would overwrite it.
    """
    src = Path(input_path)
    dst = Path(output_path)
    if dst.exists() and src.resolve() == dst.resolve():
        raise DrawingReadError(
            f"{dst}: the annotated drawing would overwrite the input; choose another output folder"
        )
    doc = document if document is not None else _read_input(src)

    removed = remove_old_marks(doc, config)
    if removed:
        log.info("%s: removed %d marks of an earlier run", src, removed)
    k = float(marks.units_per_m)

    r12 = doc.dxfversion <= "AC1009"
    measure = fonts.make_font("txt" if r12 else config.font, 1.0).text_width
    scan = scan_modelspace(doc, measure)
    route_pts = [p for seg in marks.segments.values() for p in scaled(seg.points_m, k)]
    route_pts += [scaled([e.position_m], k)[0] for e in marks.equipment.values()]
    xmin, ymin, xmax, ymax = extents(scan, route_pts)
    extents_m = ((xmax - xmin) / k, (ymax - ymin) / k)
    h = choose_text_height_m(marks, extents_m, measure, config, str(src)) * k
    route_layers = sorted({str(getattr(s, "layer", "")) for s in marks.segments.values()} - {""})
    w = _RecordingWriter(doc, config, h, route_layers)
    blocked = keep_clear_boxes(scan, config, h)
    routes = route_obstacles(scaled(s.points_m, k) for s in marks.segments.values())
    index = LabelIndex(
        cell=INDEX_CELL_H * h,
        blocked=blocked,
        # the drawing's own linework (walls, routes, symbol lines) as obstacles
        lines=drawing_linework(doc, config.appid, h, routes) if config.avoid_linework else None,
    )
    log.debug("%s: %d text and symbol boxes kept clear", src, len(blocked))

    labels, unlabelled, group_tags, device_notes, error_notes, segment_ids, fill_notes = (
        _place_marks(w, index, marks, config, progress))
    stats = index.stats
    if stats.fallbacks:
        log.warning(
            "%s: %d marks found no spot clear of everything within reach: %d cross a line of "
            "the drawing, %d sit further out, %d overlap another text (last resort)", dst.name,
            stats.fallbacks, stats.crossing_linework, stats.beyond_reach, stats.overlapping,
        )

    # everything placed so far widens the extents the schedule sits beside
    placed = index.bounds()
    if placed is not None:
        _, _, placed_xmax, placed_ymax = placed
        xmax, ymax = max(xmax, placed_xmax), max(ymax, placed_ymax)
    schedule_rows = 0
    if config.schedule:
        schedule_rows = schedule_table(w, marks.outcomes, xmax + SCHEDULE_GAP_H * h, ymax, 0.0)

    with atomic_path(dst) as tmp:
        doc.saveas(tmp)
    log.info(
        "%s: %d cable labels, %d group tags, %d device notes", dst, labels, group_tags, device_notes
    )
    return _with_sketch(w, AnnotationSummary(
        output_path=dst,
        labels=labels,
        group_tags=group_tags,
        device_notes=device_notes,
        error_notes=error_notes,
        schedule_rows=schedule_rows,
        removed=removed,
        overlapping=stats.overlapping,
        text_height=h,
        layers=dict(w.layers),
        unlabelled=tuple(unlabelled),
        revision_marks=sum(1 for o in marks.outcomes if o.circuit_id in marks.changed
                           and o.circuit_id not in {u.split(":")[0] for u in unlabelled}
                           and o.sizing is not None and o.sizing.cable is not None
                           and o.status != "error"),
        fill_marks=fill_notes,
        segment_ids=segment_ids,
        placement=stats.as_dict(),
    ))
