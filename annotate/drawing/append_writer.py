"""The appending writer: our marks added to a streamed drawing without parsing or saving it.

The drawing was read once by the streaming reader (``stream_dxf(...,
marks_appid=...)``), which kept what our marks must avoid
(:class:`~cablewright.extract.dxf_stream_scan.StreamObstacles`).  The marks are
built by the same code as on a parsed drawing (:func:`.mark_pass.add_marks`)
into a scratch document of the drawing's obstacles (:mod:`.append_scan`) and
spliced into the original bytes (:mod:`.append_splice`).  Drawings it does not
handle (DXF R12, binary DXF, a structure it does not recognise) raise
:class:`~.append_splice.AppendDeclined`; the full writer (:mod:`.writer`) then
takes them.
"""

from __future__ import annotations

import logging
import os
from collections.abc import Callable, Mapping
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from cablewright.core.errors import DrawingReadError
from ezdxf.fonts import fonts

from ..atomic import atomic_path
from .append_scan import ScratchDrawing, scratch_drawing
from .append_splice import AppendDeclined, splice_marks
from .inputs import AnnotationInput
from .mark_pass import MarkCounts, add_marks
from .style import AnnotateConfig

__all__ = ["AppendDeclined", "AppendRequest", "append_annotated_dxf"]

log = logging.getLogger(__name__)

#: The first bytes of a binary DXF file (DXF reference, "Binary DXF Files"): declined.
_BINARY_SENTINEL = b"AutoCAD Binary DXF"


@dataclass(frozen=True)
class AppendRequest:
    """What ``write_annotated_dxf(..., stream=...)`` needs to append instead of saving.

    Attributes
    ----------
    obstacles : StreamObstacles
        What the streaming reader kept (``stream_dxf(..., marks_appid=...).obstacles``).
    header : mapping
        Header variables to set in the copy, name -> (group code, value).
    prepare : callable, optional
        Called with the document parsed when this writer declines the drawing
        (the caller pins the save metadata there).
    """

    obstacles: Any
    header: Mapping[str, tuple[int, str]] = field(default_factory=dict)
    prepare: Callable[[Any], None] | None = None


def append_annotated_dxf(
    src: Path,
    dst: Path,
    marks: AnnotationInput,
    config: AnnotateConfig,
    obstacles: Any,
    *,
    progress: Callable[[int], None] | None = None,
    header: Mapping[str, tuple[int, str]] | None = None,
) -> tuple[MarkCounts, int, ScratchDrawing]:
    """Write ``dst``: the bytes of ``src`` with our marks in place of an earlier run's.

    Parameters
    ----------
    src, dst : pathlib.Path
        The drawing (only read) and the annotated copy (written atomically).
    marks : AnnotationInput
    config : AnnotateConfig
    obstacles : StreamObstacles
        What the streaming reader kept of ``src`` for this writer.
    progress : callable, optional
        Called with 1 per cable label placed.
    header : mapping, optional
        Header variables to set in the copy, name -> (group code, value).

    Returns
    -------
    (MarkCounts, int, ScratchDrawing)
        What was added, how many old marks were removed, and the scratch
        document holding our marks and the drawing's text and symbols.

    Raises
    ------
    AppendDeclined
        The drawing is one this writer does not handle; use the full writer.
    """
    if obstacles is None or getattr(obstacles, "appid", None) != config.appid:
        raise AppendDeclined("the drawing was not streamed for this application id")
    if not obstacles.dxfversion or obstacles.dxfversion <= "AC1012":
        raise AppendDeclined(f"DXF version {obstacles.dxfversion or 'unknown'} (R12 and older)")
    with open(src, "rb") as f:  # the bytes themselves only after the placement (memory)
        if f.read(len(_BINARY_SENTINEL)) == _BINARY_SENTINEL:
            raise AppendDeclined("binary DXF")
        before = os.fstat(f.fileno())
    measure = fonts.make_font(config.font, 1.0).text_width
    route_layers = sorted({str(getattr(s, "layer", "")) for s in marks.segments.values()} - {""})
    scratch = scratch_drawing(obstacles, config, measure, route_layers)
    counts = add_marks(scratch.doc, scratch.scan, marks, config, measure, str(src), progress,
                       lines=scratch.lines)
    out, removed = splice_marks(_same_bytes(src, before), scratch, obstacles, header)
    if removed:
        log.info("%s: removed %d marks of an earlier run", src, removed)
    with atomic_path(dst) as tmp:
        Path(tmp).write_bytes(out)
    return counts, removed, scratch


def _same_bytes(src: Path, before: os.stat_result) -> bytes:
    """The bytes of ``src``, read after the placement; refused when the file was saved
    over since it was read (its size or modification time changed): our marks and their
    handles belong to the drawing as it was streamed."""
    with open(src, "rb") as f:
        now = os.fstat(f.fileno())
        if (now.st_size, now.st_mtime_ns) != (before.st_size, before.st_mtime_ns):
            raise DrawingReadError(file=src, problem="the drawing was saved while it was being annotated",
                                   fix="run cablewright again on the saved drawing")
        return f.read()
