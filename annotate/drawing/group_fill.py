"""Tray and duct fill written under the group tag of the run it belongs to.

An over-full segment that is part of a tagged run of shared segments gets its
fill line under that run's tag (one placed block, one leader, the fill line on
the fill layer), not a note of its own: the cables the fill counts are the ones
the tag lists, and a crowded tray gets one block instead of two competing for
the same room.  Segments in no tagged run keep their own fill note
(:func:`.revision_marks.place_fill_marks`).  Our own choice of layout.
"""

from __future__ import annotations

from collections import defaultdict
from collections.abc import Iterable, Mapping, Sequence
from typing import Any

from .text import clean

__all__ = ["FILL_LINES_MAX", "fill_lines", "fills_by_run"]

#: Fill lines under one group tag at most; further segments are summed up in the last
#: line (every segment's figure stays in the segment schedule).  Our own choice.
FILL_LINES_MAX = 3

_RESULT_ORDER = {"fail": 0, "warning": 1}


def fills_by_run(runs: Iterable[Sequence[str]], fill_marks: Iterable[Any]) -> dict[tuple[str, ...], list[Any]]:
    """The fill marks of each run that has any, keyed by the run (segment ids as given)."""
    fills = {f.segment_id: f for f in fill_marks}
    out: dict[tuple[str, ...], list[Any]] = {}
    for run in runs:
        mine = [fills[sid] for sid in run if sid in fills]
        if mine:
            out[tuple(run)] = mine
    return out


def fill_lines(fills: Sequence[Any], *, ids_per_line: int = 3, max_lines: int = FILL_LINES_MAX) -> list[str]:
    """Lines naming the over-full segments of a run: segments of equal text joined, fails first.

    Parameters
    ----------
    fills : sequence of FillMark
        ``segment_id``, ``text`` ("TRAY FILL 106 %"), ``result`` ("fail", "warning"),
        ``percent`` and ``containment`` ("TRAY").
    ids_per_line : int
        Segment ids per line are twice this (as on the tag's head lines).
    max_lines : int
        Lines at most; the segments beyond are summed up in the last one.

    Examples
    --------
    >>> from types import SimpleNamespace as F
    >>> def fm(sid, pct, result):
    ...     return F(segment_id=sid, text=f"TRAY FILL {pct} %", result=result, percent=pct,
    ...              containment="TRAY")
    >>> fill_lines([fm("S6", 106, "fail"), fm("S9", 89, "warning"), fm("S3", 106, "fail")])
    ['S6, S3: TRAY FILL 106 % (FAIL)', 'S9: TRAY FILL 89 % (WARNING)']
    >>> fill_lines([fm(f"S{i}", 100 + i, "fail") for i in range(5)], max_lines=2)
    ['S4: TRAY FILL 104 % (FAIL)', '+4 segments: TRAY FILL 100-103 % (FAIL)']
    """
    groups: dict[tuple[str, str], list[Any]] = defaultdict(list)
    for f in fills:
        groups[(f.text, f.result)].append(f)
    order = sorted(groups.values(), key=lambda g: (_RESULT_ORDER.get(g[0].result, 2), -g[0].percent))
    per = 2 * max(1, ids_per_line)
    lines: list[str] = []
    for n, group in enumerate(order):
        if len(lines) + 1 >= max_lines and n < len(order) - 1:
            rest = [f for g in order[n:] for f in g]
            low = min(f.percent for f in rest)
            high = max(f.percent for f in rest)
            worst = min((f.result for f in rest), key=lambda r: _RESULT_ORDER.get(r, 2))
            lines.append(f"+{len(rest)} segments: {group[0].containment} FILL {low:.0f}-{high:.0f} % "
                         f"({worst.upper()})")
            break
        sids = [f.segment_id for f in group]
        text, result = group[0].text, group[0].result
        chunks = [", ".join(sids[i : i + per]) for i in range(0, len(sids), per)]
        chunks[-1] += f": {text} ({result.upper()})"
        lines += chunks
    return [clean(line) for line in lines]


def fill_segment_ids(tagged: Mapping[tuple[str, ...], Sequence[Any]]) -> frozenset[str]:
    """The segments whose fill is written under a group tag."""
    return frozenset(f.segment_id for fills in tagged.values() for f in fills)
