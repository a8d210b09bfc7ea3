"""The annotated DXF, in rooms that follow the drawing's anatomy.

What is already on the drawing (:mod:`.obstacles`); what we add - cable labels
(:mod:`.labels`), group tags (:mod:`.group_tags`), device and error notes
(:mod:`.device_notes`), the schedule table with the cautions note and title
(:mod:`.schedule_table`); where it goes (:mod:`.stretches`, :mod:`.placement`,
:mod:`.boxes`); the
style (:mod:`.style`, :mod:`.text_height`); the text as DXF stores it (:mod:`.text`);
the removal of an earlier run's marks (:mod:`.old_marks`); the pen that adds our
entities (:mod:`.entities`); and the one writer that orchestrates (:mod:`.writer`),
fed one :class:`AnnotationInput` (:mod:`.inputs`).

It writes the annotated DXF: cable labels, group tags, device notes, schedule and cautions.

The input drawing is read with ezdxf and never written to; everything we add goes
on layers of our own (see :class:`AnnotateConfig`) and carries extended data
(XDATA) under our application id, so a later run finds and removes it first and
the label count stays the same (contract.md, "The annotated DXF").  The file is
written to a temporary name and renamed into place (:mod:`cablewright.annotate.atomic`).

What is added (default layer names):

========================  ===============================================
``CW-CABLE-LABEL``        one TEXT per sized circuit: ``"P-101: 4C 70 mm² Cu/XLPE"``,
                          along its route, never upside down
``CW-GROUP-TAG``          one MTEXT per run of shared route segments (2+
                          circuits): counts per segment, then circuit ids
``CW-DEVICE-NOTE``        at each load a note with a leader line:
                          ``"P-101: 125 A"``
``CW-SCHEDULE``           a table (circuit, from, to, cable, device, length,
                          status) beside the drawing's extents
``CW-NOTES``              the cautions text; notes for circuits not sized
========================  ===============================================

Text height follows the drawing's scale: the extents are fitted on a sheet
(default A1 landscape, usable 800 mm x 560 mm), the scale is rounded up to a
usual drawing scale and the text is ``paper_text_height_mm`` at that scale
(common practice: 2.5 mm lettering on plotted drawings).

References
----------
.. [1] ezdxf documentation: ``Drawing.saveas``, ``DXFEntity.set_xdata``,
   ``ezdxf.bbox.extents``, ``ezdxf.fonts``.
.. [2] ISO 3098-0:1997, lettering heights 1.8, 2.5, 3.5, 5, 7 mm (the series the
   default 2.5 mm is taken from; from memory).
"""

from typing import TYPE_CHECKING, Any

from .inputs import AnnotationInput
from .style import CAUTIONS, AnnotateConfig

if TYPE_CHECKING:  # pragma: no cover
    from .writer import AnnotationSummary, write_annotated_dxf


def __getattr__(name: str) -> Any:
    """The writer on first use (PEP 562): the settings model reads :class:`AnnotateConfig`
    without importing ezdxf and shapely (``calc`` needs neither)."""
    if name in ("AnnotationSummary", "write_annotated_dxf"):
        from . import writer

        return getattr(writer, name)
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")

__all__ = [
    "CAUTIONS",
    "AnnotateConfig",
    "AnnotationInput",
    "AnnotationSummary",
    "write_annotated_dxf",
]
