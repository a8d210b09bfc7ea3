"""The DXF writer: chooses the appending or the full writer, and sums up what was written."""

from __future__ import annotations

import logging
import os
from collections.abc import Callable, Mapping
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

import ezdxf
from cablewright.core.errors import DrawingReadError
from ezdxf.fonts import fonts

from ..atomic import atomic_path
from ..sketch import Sketch
from .append_writer import AppendDeclined, AppendRequest, append_annotated_dxf
from .inputs import AnnotationInput
from .mark_pass import MarkCounts, add_marks
from .obstacles import scan_modelspace
from .old_marks import remove_old_marks
from .style import DEFAULT_CONFIG, AnnotateConfig

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
        How the marks were placed (:class:`.placement_stats.PlacementStats`): beside their
        route, with a leader, and the last resorts (crossing a line, overlapping).
    document : ezdxf.document.Drawing
        The document holding our marks: the annotated drawing (full writer) or
        the scratch document of the drawing's obstacles (appending writer).
    appended : bool
        Written by the appending writer (the input's bytes with our marks).
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
    placement: Mapping[str, Any] = field(default_factory=dict)
    sketch: Sketch | None = field(default=None, repr=False, compare=False)
    document: Any = field(default=None, repr=False, compare=False)
    appended: bool = False


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
    marks: AnnotationInput,
    config: AnnotateConfig = DEFAULT_CONFIG,
    *,
    progress: ProgressHook | None = None,
    document: Any = None,
    stream: AppendRequest | None = None,
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
    stream : AppendRequest, optional
        What the streaming reader kept of the drawing, the header values to set
        and what to do to a document parsed here (:class:`.append_writer.AppendRequest`).
        Without ``document``, the appending writer copies the input's bytes with
        our marks (:mod:`.append_writer`), or, where it declines the drawing
        (said in the debug log), the drawing is parsed here, ``stream.prepare``
        is called on it and the full writer saves it.

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
    if document is None and stream is not None:
        try:
            counts, removed, scratch = append_annotated_dxf(src, dst, marks, config, stream.obstacles,
                                                            progress=progress, header=stream.header)
        except AppendDeclined as exc:
            log.debug("%s: written by the full DXF writer: the appending writer declined it (%s)",
                      src, exc.reason)
        else:
            return _summary(dst, marks, counts, removed, scratch.doc, appended=True)
    doc = document
    if doc is None:
        doc = _read_input(src)
        if stream is not None and stream.prepare is not None:
            stream.prepare(doc)
    removed = remove_old_marks(doc, config)
    if removed:
        log.info("%s: removed %d marks of an earlier run", src, removed)
    r12 = doc.dxfversion <= "AC1009"
    measure = fonts.make_font("txt" if r12 else config.font, 1.0).text_width
    scan = scan_modelspace(doc, measure)
    counts = add_marks(doc, scan, marks, config, measure, str(src), progress)
    with atomic_path(dst) as tmp:
        doc.saveas(tmp)
    return _summary(dst, marks, counts, removed, doc)


#: Last-resort marks named in the warning (the rest are in schedule.json).
LAST_RESORTS_NAMED = 5


def _summary(dst: Path, marks: AnnotationInput, counts: MarkCounts, removed: int,
             doc: Any, *, appended: bool = False) -> AnnotationSummary:
    """The summary of what either writer wrote, and its log lines."""
    stats = counts.placement
    fallbacks = sum(int(stats.get(k, 0)) for k in
                    ("fallback_crossing_linework", "fallback_beyond_reach", "fallback_overlapping"))
    if fallbacks:
        names = list(stats.get("last_resort_marks", ()))
        shown = ", ".join(names[:LAST_RESORTS_NAMED]) + (", ..." if len(names) > LAST_RESORTS_NAMED else "")
        log.warning(
            "%s: %d marks found no spot clear of everything within reach: %d cross a line of "
            "the drawing, %d sit further out, %d overlap another text (last resort: %s; every "
            "one in schedule.json drawing_marks.last_resort_marks; check them on the drawing)",
            dst.name, fallbacks, stats["fallback_crossing_linework"],
            stats["fallback_beyond_reach"], stats["fallback_overlapping"], shown,
        )
    log.info("%s: %d cable labels, %d group tags, %d device notes", dst, counts.labels,
             counts.group_tags, counts.device_notes)
    if stats.get("keyed_notes"):
        log.info("%s: %d notes did not fit in full: written as a key [n] there and in full in "
                 "the KEYED NOTES list above the schedule", dst.name, stats["keyed_notes"])
    unlabelled = counts.unlabelled
    return AnnotationSummary(
        output_path=dst,
        labels=counts.labels,
        group_tags=counts.group_tags,
        device_notes=counts.device_notes,
        error_notes=counts.error_notes,
        schedule_rows=counts.schedule_rows,
        removed=removed,
        overlapping=counts.overlapping,
        text_height=counts.text_height,
        layers=dict(counts.layers),
        unlabelled=tuple(unlabelled),
        revision_marks=sum(1 for o in marks.outcomes if o.circuit_id in marks.changed
                           and o.circuit_id not in {u.split(":")[0] for u in unlabelled}
                           and o.sizing is not None and o.sizing.cable is not None
                           and o.status != "error"),
        fill_marks=counts.fill_marks,
        segment_ids=counts.segment_ids,
        placement=dict(counts.placement),
        sketch=counts.sketch,
        document=doc,
        appended=appended,
    )
