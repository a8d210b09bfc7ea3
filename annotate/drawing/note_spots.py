"""A note near a point (a device note at its load, a fill note at its segment), with a leader.

Rings round the point, many directions each; the note clear of every line, text, symbol
and mark of the drawing, its leader clear of texts and marks (it starts inside the
equipment's symbol).  A note may be written on one line or wrapped onto two
(:func:`two_lines`): the variants are tried together, tier by tier, so a wrapped note
clear of everything near the point is preferred to one line further out, and either to a
last resort.  The last resorts (crossing a line, overlapping) are counted in
``index.stats`` and reported, as for :func:`.label_spots.place_on_route`.
"""

from __future__ import annotations

from collections.abc import Sequence

import numpy as np

from .label_spots import KeySize, RouteSpot, pick, record
from .label_spots import _spot as spot_at
from .mark_index import LabelIndex
from .spot_arrays import COLUMNS, ring_spots

__all__ = ["NEAR_GAPS_H", "FAR_GAPS_H", "NOTE_DIRECTIONS", "note_variants",
           "place_note", "two_lines"]

#: Gaps from an equipment point to the nearest edge of its note, tried first [text
#: heights]: the symbol round the point is kept clear anyway, so the first rings only fit
#: beside a small symbol; then about one note height apart, up to 9 heights (a leader a
#: reader still follows at a glance to its symbol; our own choice, issue 12).
NEAR_GAPS_H = (0.75, 1.25, 1.75, 2.5, 3.25, 4.0, 5.0, 6.0, 7.0, 8.0, 9.0)
#: Further rings, tried only when no variant of the note fits within :data:`NEAR_GAPS_H`
#: (a long leader, in a linetype no route uses, rather than a note over another text).
FAR_GAPS_H = (10.5, 12.0, 14.0, 16.0)
#: Directions tried round the point (every 10 degrees; our own choice, measured on the demo
#: and the benchmark plants, benchmarks/RESULTS.md).
NOTE_DIRECTIONS = 36
#: Shifts of a note straight above or below the point, in note widths: its end or a
#: quarter over the point, so a long note fits between two lines the ring would cross (our
#: own choice).
SIDE_SHIFTS = (-0.5, 0.5, -0.25, 0.25)


def two_lines(line: str) -> list[str]:
    """``line`` wrapped at the space that makes its longer half shortest (one line kept
    when it has no space).

    Examples
    --------
    >>> two_lines("P-101: breaker 160 A")
    ['P-101:', 'breaker 160 A']
    >>> two_lines("S6: TRAY FILL 106 % (FAIL)")
    ['S6: TRAY FILL', '106 % (FAIL)']
    >>> two_lines("S6")
    ['S6']
    """
    spaces = [i for i, c in enumerate(line) if c == " "]
    if not spaces:
        return [line]
    cut = min(spaces, key=lambda i: (max(i, len(line) - i - 1), -i))
    return [line[:cut], line[cut + 1:]]


def note_variants(lines: Sequence[str]) -> list[list[str]]:
    """The note as given and, when it differs, each line wrapped onto two."""
    wrapped = [part for line in lines for part in two_lines(line)]
    return [list(lines)] if wrapped == list(lines) else [list(lines), wrapped]


def note_spots(point: tuple[float, float, float], width: float, height: float,
               gaps: Sequence[float]) -> np.ndarray:
    """Ring spots round ``point`` and the note shifted along above and below it, gap by gap
    (the nearest first; rows as :func:`.label_spots.ring_spots`)."""
    rings = ring_spots([point], width, height, gaps, NOTE_DIRECTIONS)
    g = np.repeat(np.asarray(gaps, dtype=float), 2 * len(SIDE_SHIFTS))
    side = np.tile(np.repeat([1.0, -1.0], len(SIDE_SHIFTS)), len(gaps))
    shift = np.tile(np.asarray(SIDE_SHIFTS * 2), len(gaps))
    rows = np.empty((len(g), len(COLUMNS)))
    rows[:, 0] = point[0] + shift * width
    rows[:, 1] = point[1] + side * (g + height / 2.0)
    rows[:, 2:4] = (1.0, 0.0)
    rows[:, 4:6] = (width / 2.0, height / 2.0)
    rows[:, 6:8] = point[:2]
    rows[:, 8] = g
    rows[:, 9] = point[2]
    both = np.concatenate([rings, rows])
    return both[np.argsort(both[:, 8], kind="stable")]


def place_note(index: LabelIndex, at: Sequence[float], sizes: Sequence[tuple[float, float]],
               text_height: float, key_size: KeySize | None = None
               ) -> tuple[RouteSpot, int]:
    """Place the first fitting of several variants of a note (box sizes ``sizes``, best
    first) near the point ``at`` (x, y, z); (where it went, which variant).

    Tiers: every variant clear of everything within :data:`NEAR_GAPS_H`, then within
    :data:`FAR_GAPS_H`; then, with ``key_size``, the note's key (:mod:`.note_keys`) the
    same way (variant ``len(sizes)``; ``key_size`` a box or a function giving it, called
    only then); then the first variant crossing a line of the
    drawing but no text or mark; then overlapping the drawing's own text or symbols
    rather than a mark of ours; both last resorts counted.
    """
    h = text_height
    point = (float(at[0]), float(at[1]), float(at[2]) if len(at) > 2 else 0.0)
    tiers: list[list[np.ndarray]] = [[], []]  # per variant: the near spots, the far ones
    for tier, gaps in zip(tiers, (NEAR_GAPS_H, FAR_GAPS_H), strict=True):
        for i, (width, height) in enumerate(sizes):
            tier.append(note_spots(point, width, height, [g * h for g in gaps]))
            spot = pick(index, tier[i], h, leader_lines=False, leader_from_symbol=True)
            if spot is not None:
                return record(index, spot, h, leader=True, how="leader"), i
    if key_size is not None:
        key_w, key_h = key_size() if callable(key_size) else key_size
        for gaps in (NEAR_GAPS_H, FAR_GAPS_H):
            spots = note_spots(point, key_w, key_h, [g * h for g in gaps])
            spot = pick(index, spots, h, leader_lines=False, leader_from_symbol=True)
            if spot is not None:
                return record(index, spot, h, leader=True, how="leader"), len(sizes)
    # the last resorts over all gaps (near before far, as one array per variant)
    every = [np.concatenate(pair) for pair in zip(*tiers, strict=True)]
    for i, spots in enumerate(every):
        spot = pick(index, spots, h, lines=False, leader_lines=False, leader_from_symbol=True)
        if spot is not None:
            return record(index, spot, h, leader=True, how="crossing"), i
    spot = pick(index, every[0], h, lines=False, leader_lines=False, leader_from_symbol=True,
                fixed=False)
    return record(index, spot or spot_at(every[0], 0), h, leader=True, how="overlapping"), 0
