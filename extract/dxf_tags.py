"""Equipment without a tag attribute, tagged from the nearest text (contract.md, Extensions).

Real drawings seldom carry a ``TAG`` attribute: a pump is a circle with "P-101"
written beside it, a board is a block without attributes.  With
``[drawing] tags_from_text = true`` every *symbol* -- a model-space block reference
without the tag attribute, or a CIRCLE or POINT on one of ``tag_symbol_layers`` --
takes the first word of the nearest TEXT or MTEXT within ``tag_text_max_m`` (in
plan) as its tag.  Pairs are taken nearest first and a text names one symbol
only, so two symbols side by side get their own labels.  A symbol with no text
near it is named by its block (or layer) name and an index, as a last resort.
"""

from __future__ import annotations

import re
from collections.abc import Iterable
from dataclasses import dataclass, field

from cablewright.core.errors import Issue, IssueCode

from .model import Equipment, Point3

__all__ = ["TextMark", "Symbol", "TagMarks", "first_word", "looks_like_tag", "tag_symbols", "text_anchor"]

#: A word that reads as an equipment tag: starts with a letter, letters and digits
#: in groups joined by ``- _ . /``, at least one digit ("P-101", "MCC1", "DB-2A",
#: "L-A1"); common practice for plant tags (the trade's letter-and-number labels).
_TAG_RE = re.compile(r"^(?=.*\d)[A-Za-z][A-Za-z0-9]*(?:[-_./][A-Za-z0-9]+)*$")
_TAG_MAX_CHARS = 20

_TRIM = ",;:()[]{}\"'"


def first_word(text: str) -> str:
    """The first word of a text, punctuation around it removed.

    Examples
    --------
    >>> first_word("  P-101: feed pump"), first_word("(MCC-1)"), first_word("")
    ('P-101', 'MCC-1', '')
    """
    for word in text.split():
        word = word.strip(_TRIM)
        if word:
            return word
    return ""


def looks_like_tag(word: str) -> bool:
    """Does ``word`` read as an equipment tag (letters then digits)?

    Examples
    --------
    >>> looks_like_tag("P-101"), looks_like_tag("L-A1"), looks_like_tag("Pump"), looks_like_tag("400V")
    (True, True, False, False)
    """
    return len(word) <= _TAG_MAX_CHARS and bool(_TAG_RE.match(word))


@dataclass(frozen=True)
class TextMark:
    """A TEXT or MTEXT read from the drawing.

    Attributes
    ----------
    word : str
        Its first word.
    text : str
        The whole text, plain.
    position_m : (x, y, z)
        Insertion (or alignment) point in world coordinates, [m].
    layer : str
        Layer.
    source_id : str
        DXF handle.
    """

    word: str
    text: str
    position_m: Point3
    layer: str
    source_id: str


@dataclass(frozen=True)
class Symbol:
    """An equipment symbol without a tag attribute.

    Attributes
    ----------
    name : str
        Block name, or the layer of a CIRCLE or POINT.
    position_m : (x, y, z)
        Insertion point (centre), world coordinates, [m].
    source_id : str
        DXF handle.
    attributes : tuple of (name, value)
        Attributes of a block reference (upper-cased names).
    """

    name: str
    position_m: Point3
    source_id: str
    attributes: tuple[tuple[str, str], ...] = ()


@dataclass
class TagMarks:
    """Texts and symbols collected while walking the drawing."""

    texts: list[TextMark] = field(default_factory=list)
    symbols: list[Symbol] = field(default_factory=list)


def text_anchor(e) -> tuple[float, float, float]:
    """Point of a TEXT (alignment point when justified) or MTEXT, in its layout's coordinates."""
    if e.dxftype() == "MTEXT":
        p = e.dxf.insert
        return (float(p[0]), float(p[1]), float(p[2]))
    p = e.dxf.insert
    if (e.dxf.get("halign", 0) or e.dxf.get("valign", 0)) and e.dxf.hasattr("align_point"):
        p = e.dxf.align_point
    w = e.ocs().to_wcs(p)
    return (float(w[0]), float(w[1]), float(w[2]))


def _pairs(symbols: list[Symbol], texts: list[TextMark], max_m: float) -> list[tuple[float, int, int]]:
    """(plan distance, symbol index, text index) of every pair within ``max_m``, nearest first."""
    if not symbols or not texts:
        return []
    import numpy as np
    import shapely

    tree = shapely.STRtree(shapely.points([t.position_m[:2] for t in texts]))
    sym_pts = shapely.points([s.position_m[:2] for s in symbols])
    found = tree.query(sym_pts, predicate="dwithin", distance=max_m)
    if found.size == 0:
        return []
    si, ti = found
    sx = np.array([symbols[i].position_m[:2] for i in si], dtype=float)
    tx = np.array([texts[j].position_m[:2] for j in ti], dtype=float)
    d = np.hypot(*(sx - tx).T)
    return sorted(zip(d.tolist(), si.tolist(), ti.tolist(), strict=True))


def tag_symbols(
    marks: TagMarks, max_m: float, taken: Iterable[str], path: str
) -> tuple[list[Equipment], list[Issue]]:
    """Tags for the symbols: nearest text first, block name and index last.

    Parameters
    ----------
    marks : TagMarks
        Texts and symbols read from the drawing, [m].
    max_m : float
        Farthest a text may be from its symbol, in plan, [m].
    taken : iterable of str
        Tags already in the drawing (from tag attributes); the last-resort
        names avoid them.
    path : str
        The drawing, for messages.

    Returns
    -------
    (equipment, issues)
        One :class:`Equipment` per symbol; one summary issue when any symbol
        was tagged.
    """
    texts = [t for t in marks.texts if t.word]
    symbols = marks.symbols
    tag_of: dict[int, str] = {}
    used: set[int] = set()
    for _, si, ti in _pairs(symbols, texts, max_m):
        if si in tag_of or ti in used:
            continue
        tag_of[si] = texts[ti].word
        used.add(ti)
    names = set(taken) | set(tag_of.values())
    counters: dict[str, int] = {}
    fallback: list[str] = []
    out: list[Equipment] = []
    for i, s in enumerate(symbols):
        tag = tag_of.get(i)
        if tag is None:
            k = counters.get(s.name, 0)
            while True:
                k += 1
                tag = f"{s.name}-{k}"
                if tag not in names:
                    break
            counters[s.name] = k
            names.add(tag)
            fallback.append(tag)
        out.append(Equipment(tag, s.source_id, s.position_m, s.name, s.attributes))
    issues = []
    if symbols:
        shown = ", ".join(fallback[:5]) + (" ..." if len(fallback) > 5 else "")
        rest = (f"; {len(fallback)} had no text within {max_m:g} m and are named by block or layer "
                f"and index ({shown})" if fallback else "")
        issues.append(Issue(
            IssueCode.TAGS_FROM_TEXT,
            f"{path}: {len(tag_of)} of {len(symbols)} equipment symbols without a tag attribute took "
            f"the first word of the nearest text as their tag{rest}; check the tags against the drawing",
        ))
    return out, issues
