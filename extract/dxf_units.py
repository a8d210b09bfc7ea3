"""Units of a DXF drawing: the config's override or ``$INSUNITS``, and the scale check.

contract.md, Extensions: ``[drawing] units``, when given, overrides ``$INSUNITS``,
with one line saying so.  After reading, the route extents and the median route
piece are checked (:func:`cablewright.extract.units.check_scale`) and a likely
wrong scale is reported, naming the likely units.
"""

from __future__ import annotations

from pathlib import Path
from typing import TYPE_CHECKING

from cablewright.core.errors import DrawingReadError, Issue, IssueCode

from .model import DrawingConfig
from .units import (
    COMMON_UNITS,
    INSUNITS,
    UNIT_TO_M,
    DrawingSummary,
    check_scale,
    extents,
    unit_name,
)

if TYPE_CHECKING:  # pragma: no cover
    from ezdxf.document import Drawing

__all__ = ["resolve_units", "summarise", "header_code"]


def header_code(doc: Drawing) -> int:
    """The drawing's ``$INSUNITS`` code (0 when absent or not a number)."""
    try:
        return int(doc.header.get("$INSUNITS", 0) or 0)
    except (TypeError, ValueError):
        return 0


def _known() -> str:
    return ", ".join(COMMON_UNITS) + " (or any $INSUNITS length: " + ", ".join(
        n for n in UNIT_TO_M if n not in COMMON_UNITS) + ")"


def resolve_units(doc: Drawing, path: Path, config: DrawingConfig, issues: list[Issue]
                  ) -> tuple[str, str, int]:
    """The units to read the drawing in.

    Parameters
    ----------
    doc : ezdxf.document.Drawing
        The drawing.
    path : Path
        Its file, for messages.
    config : DrawingConfig
        ``config.units``, when given, wins over the header.
    issues : list of Issue
        A ``units-override`` issue is added when the config's units replace
        different header units.

    Returns
    -------
    (units, source, code)
        Unit name, ``"config"`` or ``"header"``, and the header's ``$INSUNITS``.

    Raises
    ------
    DrawingReadError
        Unknown units in the config; a unitless (or non-length) header without
        units in the config.
    """
    code = header_code(doc)
    header = INSUNITS.get(code, (None, 0.0))[0]
    if config.units is not None:
        name = unit_name(str(config.units))
        if name is None:
            raise DrawingReadError(file=path, problem=f'units {config.units!r} from the config or --units are not known',
                                   fix=f'use one of {_known()}')
        if header is not None and header != name:
            issues.append(Issue(
                IssueCode.UNITS_OVERRIDE,
                f"{path}: the drawing says {header} ($INSUNITS={code}); read in {name} as the "
                "config or --units says",
            ))
        return name, "config", code
    if header is None:
        what = "unitless ($INSUNITS=0)" if code == 0 else f"in units that are not a length ($INSUNITS={code})"
        raise DrawingReadError(file=path, problem=f'the drawing is {what}',
                               fix=f"give its units with --units or in the config ([drawing] units = one of {', '.join(COMMON_UNITS)}), or save it with drawing units set")
    return header, "header", code


def summarise(doc: Drawing, path: Path, config: DrawingConfig, content) -> DrawingSummary:
    """Units, route extents and the scale check of a drawing just read.

    A scale that is not plausible adds a ``units-implausible`` issue to
    ``content.issues`` naming the likely units.

    Parameters
    ----------
    doc : ezdxf.document.Drawing
        The drawing.
    path : Path
        Its file, for messages.
    config : DrawingConfig
        As read with.
    content : DxfContent
        What was read (``units``, ``polylines`` in metres, ``issues``).

    Returns
    -------
    DrawingSummary
    """
    code = header_code(doc)
    source = "config" if config.units is not None else "header"
    ext = extents(p.points_m for p in content.polylines)
    scale = check_scale(ext, content.units) if ext is not None else None
    if scale is not None and not scale.plausible:
        likely = (f"; it looks drawn in {' or '.join(scale.likely_units[:2])} - give "
                  f"--units {scale.likely_units[0]} (or [drawing] units) if so"
                  if scale.likely_units else "; check the drawing's units")
        content.issues.append(Issue(
            IssueCode.UNITS_IMPLAUSIBLE,
            f"{path}: read in {content.units} ({'config' if source == 'config' else '$INSUNITS'}), "
            f"{scale.reason}{likely}",
        ))
    return DrawingSummary(content.units, source, code, ext, scale)
