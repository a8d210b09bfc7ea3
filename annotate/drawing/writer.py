"""The one writer: reads the drawing, chooses the text height, adds every mark, saves."""

from __future__ import annotations

import logging
import os
from collections import defaultdict
from collections.abc import Callable, Mapping, Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import Any

import ezdxf
from cablewright.extract.errors import DrawingReadError
from ezdxf.fonts import fonts
from shapely.geometry import Point

from ..atomic import atomic_path
from ..model import CircuitOutcome
from .boxes import LabelIndex
from .entities import EntityWriter
from .group_tags import group_runs, group_tag_lines, segment_cables
from .labels import label_text, route_stretches
from .obstacles import extents, scan_modelspace
from .old_marks import remove_old_marks
from .placement import (
    Stretch,
    place_along,
    place_near_point,
    rank_stretches,
    route_obstacles,
    scaled,
    straight_stretches,
)
from .schedule_table import schedule_table
from .style import DEFAULT_CONFIG, AnnotateConfig
from .text import rating_text
from .text_height import crowded_text_height_m, mark_area_per_h2, text_height_m_for_extents

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


def write_annotated_dxf(
    input_path: str | os.PathLike[str],
    output_path: str | os.PathLike[str],
    outcomes: Sequence[CircuitOutcome],
    segments: Mapping[str, Any],
    per_segment: Mapping[str, Sequence[str]],
    equipment: Mapping[str, Any],
    units_per_m: float,
    config: AnnotateConfig = DEFAULT_CONFIG,
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
    outcomes : sequence of CircuitOutcome
        Every circuit; those with a cable get a label, ``error`` ones a note.
    segments : mapping
        Segment id -> RouteSegment (``points_m`` in metres, world).
    per_segment : mapping
        Segment id -> circuit ids routed through it.
    equipment : mapping
        Tag -> Equipment (``position_m`` in metres, world).
    units_per_m : float
        Drawing units per metre (1000 for a drawing in mm) [1/m].
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
        annotated drawing, e.g. for :func:`~.preview.render_preview_png`.

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
    if not units_per_m > 0.0:
        raise ValueError(f"units_per_m must be > 0, got {units_per_m!r}")
    if dst.exists() and src.resolve() == dst.resolve():
        raise DrawingReadError(
            f"{dst}: the annotated drawing would overwrite the input; choose another output folder"
        )
    if document is not None:
        doc = document
    else:
        doc = _read_input(src)

    removed = remove_old_marks(doc, config)
    if removed:
        log.info("%s: removed %d marks of an earlier run", src, removed)
    k = float(units_per_m)

    r12 = doc.dxfversion <= "AC1009"
    measure = fonts.make_font("txt" if r12 else config.font, 1.0).text_width
    scan = scan_modelspace(doc, measure)
    route_pts = [p for seg in segments.values() for p in scaled(seg.points_m, k)]
    route_pts += [scaled([e.position_m], k)[0] for e in equipment.values()]
    xmin, ymin, xmax, ymax = extents(scan, route_pts)
    if config.text_height_m is not None:
        h_m = float(config.text_height_m)
    else:
        h_m = text_height_m_for_extents(
            (xmax - xmin) / k,
            (ymax - ymin) / k,
            paper_text_height_mm=config.paper_text_height_mm,
            sheet_mm=config.sheet_mm,
            min_m=config.min_text_height_m,
            max_m=config.max_text_height_m,
        )
        if config.crowd_fraction is not None:
            demand = mark_area_per_h2(outcomes, per_segment, measure, config)
            crowded = crowded_text_height_m(
                demand,
                (xmax - xmin) / k,
                (ymax - ymin) / k,
                fraction=config.crowd_fraction,
                paper_text_height_mm=config.paper_text_height_mm,
                min_m=config.min_text_height_m,
            )
            if crowded < h_m:
                log.info(
                    "%s: crowded drawing (%d circuits); text height %.3g m instead of %.3g m",
                    src, len(outcomes), crowded, h_m,
                )
                h_m = crowded
    h = h_m * k
    w = EntityWriter(doc, config, h)
    # the drawing's own text and its equipment symbols: no mark goes on them; a
    # symbol bigger than ``symbol_max_text_heights`` text heights (a frame, a room
    # block) is not an obstacle, or nothing could be placed inside it
    big = config.symbol_max_text_heights * h
    blocked = list(scan.texts) if config.avoid_drawing_text else []
    if config.avoid_symbols:
        blocked += [b for b in scan.symbols if 2.0 * max(b[4], b[5]) <= big]
    index = LabelIndex(
        cell=12.0 * h,
        obstacles=route_obstacles(scaled(s.points_m, k) for s in segments.values()),
        blocked=blocked,
    )
    log.debug("%s: %d text and symbol boxes kept clear", src, len(blocked))

    from_count: dict[str, int] = defaultdict(int)
    to_count: dict[str, int] = defaultdict(int)
    for o in outcomes:
        if o.route is not None:
            from_count[o.from_tag] += 1
            to_count[o.to_tag] += 1

    labels = overlapping = 0
    unlabelled: list[str] = []
    cut_cache: dict[str, list[Stretch]] = {}
    for o in outcomes:
        if o.status == "error" or o.sizing is None or o.sizing.cable is None:
            continue
        stretches = route_stretches(o, segments, per_segment, k, from_count, to_count, cut_cache)
        if not stretches:
            unlabelled.append(f"{o.circuit_id}: no route geometry to put a label on")
            log.warning(
                "circuit %s: sized but has no route geometry; no label on the drawing", o.circuit_id
            )
            continue
        text = label_text(o)
        bw, bh = w.line_box(text)
        place = place_along(index, rank_stretches(stretches, bw), bw, bh)
        overlapping += place.overlaps
        w.text(
            text,
            place.x,
            place.y,
            place.z,
            role="label",
            kind="cable-label",
            ref=o.circuit_id,
            rotation=place.rotation_deg,
            color=1 if o.status == "fail" else None,
        )
        labels += 1
        if progress is not None:
            progress(1)

    group_tags = 0
    if config.group_tags:
        cables = segment_cables(outcomes, per_segment)
        for run in group_runs(segments, per_segment, k, min_circuits=2):
            by_count: dict[tuple[int, int], list[str]] = defaultdict(list)
            for seg_id in run:
                n_circuits = len(set(per_segment[seg_id]))
                by_count[(n_circuits, cables.get(seg_id, n_circuits))].append(seg_id)
            counts = [(sids, nc, nk) for (nc, nk), sids in sorted(by_count.items(), reverse=True)]
            busiest = counts[0][0][0]
            circuits = list(per_segment[busiest])
            lines = group_tag_lines(
                run,
                circuits,
                counts[0][2],
                ids_per_line=config.ids_per_line,
                max_ids=config.group_tag_max_ids,
                counts=counts,
            )
            stretches = [
                st
                for seg_id in run
                for st in straight_stretches(
                    scaled(segments[seg_id].points_m, k),
                    crowd=len(per_segment[seg_id]),
                    key=seg_id,
                )
            ]
            if not stretches:
                continue
            bw, bh = w.block_box(lines)
            place = place_along(index, rank_stretches(stretches, bw), bw, bh)
            overlapping += place.overlaps
            w.block(lines, place, role="group", kind="group-tag", ref=",".join(run))
            if place.polygon.distance(Point(place.anchor)) > 1.5 * h:
                w.leader(place, place.z, role="group", kind="group-leader", ref=run[0])
            group_tags += 1

    device_notes = error_notes = 0
    notes_by_load: dict[str, list[str]] = defaultdict(list)
    errors_by_tag: dict[str, list[str]] = defaultdict(list)
    for o in outcomes:
        s = o.sizing
        if o.status != "error" and s is not None and s.device_rating_a is not None:
            notes_by_load[o.to_tag].append(f"{o.circuit_id}: {rating_text(s.device_rating_a)} A")
        elif o.status == "error":
            tag = o.to_tag if o.to_tag in equipment else o.from_tag
            errors_by_tag[tag].append(f"{o.circuit_id}: NOT SIZED, see report")

    def notes_at_equipment(by_tag: dict[str, list[str]], role: str, kind: str) -> tuple[int, int]:
        """Place one note with a leader at each equipment; (notes placed, overlaps)."""
        placed = overlaps = 0
        for tag, lines in by_tag.items():
            eq = equipment.get(tag)
            if eq is None:
                continue
            x, y, z = scaled([eq.position_m], k)[0]
            bw, bh = w.block_box(lines)
            place = place_near_point(index, x, y, z, bw, bh)
            overlaps += place.overlaps
            w.block(lines, place, role=role, kind=f"{kind}-note", ref=tag)
            w.leader(place, z, role=role, kind=f"{kind}-leader", ref=tag)
            placed += 1
        return placed, overlaps

    if config.device_notes:
        device_notes, extra = notes_at_equipment(notes_by_load, "device", "device")
        overlapping += extra
    if config.error_notes:
        error_notes, extra = notes_at_equipment(errors_by_tag, "notes", "error")
        overlapping += extra

    # everything placed so far widens the extents the schedule sits beside
    placed = index.bounds()
    if placed is not None:
        xmin, ymin = min(xmin, placed[0]), min(ymin, placed[1])
        xmax, ymax = max(xmax, placed[2]), max(ymax, placed[3])
    schedule_rows = 0
    if config.schedule:
        schedule_rows = schedule_table(w, outcomes, xmax + 10.0 * h, ymax, 0.0)

    if overlapping:
        log.warning(
            "%s: %d labels or notes found no free spot and overlap others", dst, overlapping
        )
    with atomic_path(dst) as tmp:
        doc.saveas(tmp)
    log.info(
        "%s: %d cable labels, %d group tags, %d device notes", dst, labels, group_tags, device_notes
    )
    return AnnotationSummary(
        output_path=dst,
        labels=labels,
        group_tags=group_tags,
        device_notes=device_notes,
        error_notes=error_notes,
        schedule_rows=schedule_rows,
        removed=removed,
        overlapping=overlapping,
        text_height=h,
        layers=dict(w.layers),
        unlabelled=tuple(unlabelled),
    )
