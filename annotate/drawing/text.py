"""Text as DXF stores it: one clean line, DXF and MTEXT escaping, ratings."""

from __future__ import annotations

from ..text_limits import dxf_string_limit, fit_text

__all__ = ["clean", "dxf_escape", "mtext_escape", "rating_text"]


def clean(text: str) -> str:
    """One line of TEXT content: no line breaks, no control characters."""
    return " ".join(str(text).split())


def dxf_escape(text: str) -> str:
    """Text content as DXF stores it, so that it reads back as ``text``.

    DXF text takes ``%%`` + a letter as a control code (``%%c`` diameter,
    ``%%d`` degree, ``%%p`` plus/minus, ``%%u`` underline ...) and ``%%%`` as a
    single percent sign; a caret followed by a letter is a control character
    (``^J``) and ``"^ "`` a single caret.  Where a ``%%`` occurs every ``%`` is
    written ``%%%``; every ``^`` is written ``"^ "``.

    Examples
    --------
    >>> dxf_escape("P-101%%c")
    'P-101%%%%%%c'
    >>> dxf_escape("5% load")
    '5% load'
    >>> dxf_escape("A^J")
    'A^ J'

    References
    ----------
    .. [1] ezdxf documentation, "Special Characters" (``%%c``, ``%%d``, ``%%p``,
       ``%%%``) and ``ezdxf.tools.text.caret_decode``.
    """
    if "%%" in text:
        text = text.replace("%", "%%%")
    return text.replace("^", "^ ")


def mtext_escape(text: str) -> str:
    def escape(plain: str) -> str:
        return dxf_escape(plain.replace("\\", "\\\\").replace("{", "\\{").replace("}", "\\}"))

    return fit_text(clean(text), dxf_string_limit("AC1015"), "AC1015", escape)  # one line of a note


def rating_text(value: float) -> str:
    return f"{value:g}"

