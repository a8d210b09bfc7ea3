"""Text that fits DXF's string limits: cut with an ellipsis on the drawing only.

A DXF string value (group codes 0-9, 1000) may hold 255 bytes up to DXF R14
and 2049 from AutoCAD 2000 on [1]_; a longer value is cut by some readers or
refused by others.  A label on the drawing is cut to fit, ending in an
ellipsis; the schedule files keep every value whole.

The size counted is the size as written: UTF-8 bytes from DXF R2007 (AC1021),
whose files are UTF-8; before that, each character outside ASCII counted as the
seven bytes of its ``\\U+XXXX`` escape [2]_, which is the most it can take.

References
----------
.. [1] Autodesk, DXF Reference (AutoCAD 2012), "Group Code Value Types":
   strings "with the introduction of extended symbol names in AutoCAD 2000,
   the 255-character limit has been increased to 2049 single-byte characters
   not including the newline at the end of the line".
.. [2] ezdxf documentation, "DXF File Encoding": before R2007 characters outside
   the code page are written as ``\\U+XXXX``.
"""

from __future__ import annotations

from collections.abc import Callable

__all__ = ["ELLIPSIS", "dxf_string_limit", "encoded_size", "fit_text"]

#: What ends a cut text: U+2026 HORIZONTAL ELLIPSIS.
ELLIPSIS = "…"

#: (DXF version code, limit in bytes) [1]_: R12 to R14, then AutoCAD 2000 and later.
_LIMITS = (("AC1014", 255), ("AC1015", 2049))


def dxf_string_limit(dxfversion: str) -> int:
    """Bytes one DXF string value may hold in a file of ``dxfversion`` [1]_.

    Examples
    --------
    >>> dxf_string_limit("AC1009"), dxf_string_limit("AC1015"), dxf_string_limit("AC1032")
    (255, 2049, 2049)
    """
    return 255 if dxfversion <= _LIMITS[0][0] else _LIMITS[1][1]


def encoded_size(text: str, dxfversion: str = "AC1032") -> int:
    """Bytes ``text`` takes in a DXF file of ``dxfversion`` (module docstring).

    Examples
    --------
    >>> encoded_size("P-101"), encoded_size("mm²"), encoded_size("mm²", "AC1015")
    (5, 4, 9)
    """
    if dxfversion >= "AC1021":
        return len(text.encode("utf-8"))
    return sum(1 if ord(ch) < 128 else 7 for ch in text)


def fit_text(
    text: str,
    limit: int,
    dxfversion: str = "AC1032",
    escape: Callable[[str], str] = lambda s: s,
) -> str:
    """``escape(text)``, or ``escape`` of its longest head plus :data:`ELLIPSIS`, within ``limit`` bytes.

    ``escape`` turns plain text into the text as stored (control codes doubled
    and so on); the cut is made in the plain text, so no escape is split.

    Parameters
    ----------
    text : str
        Plain text of the label.
    limit : int
        Bytes the stored value may hold [bytes].
    dxfversion : str
        The file's DXF version code, for :func:`encoded_size`.
    escape : callable
        Plain text -> stored text.

    Returns
    -------
    str
        The stored text, never longer than ``limit`` bytes.

    Examples
    --------
    >>> fit_text("P-101: 4C 70 mm²", 255)
    'P-101: 4C 70 mm²'
    >>> fit_text("x" * 300, 10)
    'xxxxxxx…'
    >>> encoded_size(fit_text("x" * 300, 10))
    10
    """
    whole = escape(text)
    if encoded_size(whole, dxfversion) <= limit:
        return whole
    low, high = 0, len(text)  # the longest head that fits, by bisection
    while low < high:
        mid = (low + high + 1) // 2
        if encoded_size(escape(text[:mid].rstrip()) + ELLIPSIS, dxfversion) <= limit:
            low = mid
        else:
            high = mid - 1
    return escape(text[:low].rstrip()) + ELLIPSIS
