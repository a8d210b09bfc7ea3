"""The advance widths of the drawing's own texts: the font of each text's style, where it is here.

A drawing's TEXT, MTEXT and ATTRIB name a text style; the style names its font file
(DXF reference, STYLE table, group 3).  Our marks keep clear of those texts by their
boxes (:mod:`.obstacles`), so a text is measured by the wider of two fonts: ours (the
font our marks are set in, :attr:`.style.AnnotateConfig.font`) and its style's, when
ezdxf's font manager finds that font on this machine.  A style whose font is not here
(an SHX font of another CAD program, most often) keeps our font, as before; a wide or
extended font makes its texts' boxes wider, never narrower (on the safe side: a mark
crowds a text less, and never sits on letters our font would have missed).

References
----------
.. [1] ezdxf documentation, ``ezdxf.fonts.fonts``: ``font_manager.has_font``,
   ``make_font(...).text_width``.
.. [2] Autodesk, DXF Reference (2012), STYLE table: group 3, primary font file name.
"""

from __future__ import annotations

import os
import string
from collections.abc import Callable
from typing import Any

from ezdxf.fonts import fonts

__all__ = ["StyleMeasures"]

Measure = Callable[[str], float]


class StyleMeasures:
    """Per text style, the advance width at height 1 its texts are measured by.

    ``of(entity)`` gives the measure for a text entity (by its ``style``); the styles are
    looked up once each.
    """

    def __init__(self, doc: Any, ours: Measure) -> None:
        self._doc = doc
        self._ours = ours
        self._by_style: dict[str, Measure] = {}

    def of(self, entity: Any) -> Measure:
        """The measure of ``entity``'s style (ours when the style or its font is missing)."""
        name = str(entity.dxf.get("style", "Standard") or "Standard")
        key = name.upper()
        found = self._by_style.get(key)
        if found is None:
            found = self._by_style[key] = self._style_measure(name)
        return found

    def _style_measure(self, name: str) -> Measure:
        styles = getattr(self._doc, "styles", None)
        style = styles.get(name) if styles is not None and styles.has_entry(name) else None
        font = os.path.basename(str(style.dxf.get("font", "") or "")) if style is not None else ""
        if not font or not fonts.font_manager.has_font(font):
            return self._ours
        theirs = fonts.make_font(font, 1.0).text_width
        ours = self._ours
        if all(theirs(c) <= ours(c) for c in _PROBES):
            return ours  # no letter wider than ours: ours, at no cost per text
        return lambda text: max(ours(text), theirs(text))


#: The letters compared one by one: a style's font no wider than ours in any of them (the
#: printable ASCII letters, digits and signs, and the signs of cable notes) is left out.
_PROBES = string.ascii_letters + string.digits + string.punctuation + " ²³°±µ×Ø"
