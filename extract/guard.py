"""The guard at the entry of the extract stage: every number read is finite and physical.

A drawing or model may hold numbers no plant has: NaN, infinity, or coordinates larger
than the Earth.  Such a number must never reach shapely, the sizing or a writer, so each
entity carrying one is refused here with one line naming the file, the entity (DXF handle
or IFC GlobalId) and the value; the other entities go on.  The snap tolerance is also held
against the drawing's own scale, since a tolerance as large as the plant would join routes
that do not meet and change lengths and grouping without a word.
"""

from __future__ import annotations

import math
from collections.abc import Iterable, Sequence
from itertools import chain

import numpy as np
from cablewright.core.errors import ConfigError, Issue, IssueCode

from .model import Equipment, RoutePolyline

__all__ = [
    "MAX_COORDINATE_M",
    "MAX_SNAP_FRACTION",
    "bad_value",
    "check_equipment",
    "check_polylines",
    "check_snap_tolerance",
    "MAX_SNAP_PIECE_FRACTION",
    "median_piece_length_m",
    "near_miss_reach_m",
]

#: Largest coordinate magnitude accepted, [m]: half the Earth's circumference (about
#: 20,000 km).  No site coordinate is larger: projected grids such as UTM stay below
#: 10,000 km northing (its false northing in the southern hemisphere, common practice).
#: Beyond it float64 still holds the value, but squares of distances overflow and the
#: result has no physical meaning.
MAX_COORDINATE_M = 2.0e7

#: Largest snap tolerance as a fraction of the drawing's extent (the diagonal of the
#: routes' bounding box).  A tolerance of 1 % of the whole plant already joins ends
#: metres apart on a 100 m drawing; the default 50 mm is 0.05 % of it (common practice).
MAX_SNAP_FRACTION = 0.01

#: Largest snap tolerance as a fraction of the drawing's median route-piece length.  A
#: tolerance of half a typical piece joins both ends of most pieces to whatever lies near
#: them: on a drawing read at the wrong scale (metres taken as millimetres, a common export
#: fault) 50 mm then covers most of the plan and the build makes millions of cut points
#: (issue 16: 1,063 pieces gave 2.7 million segments, 70 s, 5.8 GB).  Common practice: a
#: snap tolerance is the drawing's precision, orders of magnitude below a piece length.
MAX_SNAP_PIECE_FRACTION = 0.5

#: The contract's default snap tolerance, [m] (contract.md, "Drawing conventions"); always
#: accepted, so that a small test drawing is not refused for it.
DEFAULT_SNAP_TOLERANCE_M = 0.05


def bad_value(values: Sequence[float] | np.ndarray) -> float | None:
    """The first value that is not finite or exceeds :data:`MAX_COORDINATE_M`, else None.

    Parameters
    ----------
    values : sequence of float
        Coordinates, [m].

    Returns
    -------
    float or None
        The offending value, or None when every value is usable.

    Examples
    --------
    >>> bad_value([1.0, 2.0, 3.0]) is None
    True
    >>> bad_value([1.0, float("nan")])
    nan
    >>> bad_value([3e7, 0.0])
    30000000.0
    """
    arr = np.asarray(values, dtype=float).ravel()
    with np.errstate(invalid="ignore"):
        bad = ~np.isfinite(arr) | (np.abs(arr) > MAX_COORDINATE_M)
    if not bad.any():
        return None
    return float(arr[int(np.argmax(bad))])


def _refusal(source: str, what: str, value: float) -> str:
    where = f"{source}: " if source else ""
    return (
        f"{where}{what} has a coordinate of {value!r} m, not a finite number within "
        f"{MAX_COORDINATE_M:.0e} m of the origin; it is refused - fix it in the drawing or model"
    )


def _usable_pieces(pieces: list[RoutePolyline]) -> np.ndarray | None:
    """Per piece: every coordinate usable (one test of all of them), or None if not plain floats.

    The pieces it marks False (and every piece, on None) are tested one by one with
    :func:`bad_value`, which names the value; so the result is the per-piece test's.
    """
    try:
        counts = np.fromiter((sum(len(p) for p in pl.points_m) for pl in pieces), dtype=np.intp, count=len(pieces))
        flat = np.fromiter(
            chain.from_iterable(chain.from_iterable(pl.points_m) for pl in pieces), dtype=float, count=int(counts.sum())
        )
    except (TypeError, ValueError):  # not plain numbers: the per-piece test says which
        return None
    with np.errstate(invalid="ignore"):
        bad = ~np.isfinite(flat) | (np.abs(flat) > MAX_COORDINATE_M)
    usable = np.ones(len(pieces), dtype=bool)
    usable[np.repeat(np.arange(len(pieces)), counts)[bad]] = False
    return usable


def check_polylines(
    polylines: Iterable[RoutePolyline], source: str = ""
) -> tuple[list[RoutePolyline], list[Issue]]:
    """Keep the route pieces whose every coordinate is usable; one issue per refused piece.

    Parameters
    ----------
    polylines : iterable of RoutePolyline
        Route pieces, [m].
    source : str
        File name for the messages.

    Returns
    -------
    kept : list of RoutePolyline
    issues : list of Issue
        Code ``"bad-coordinate"``, naming the file, the piece and the value.
    """
    kept: list[RoutePolyline] = []
    issues: list[Issue] = []
    pieces = list(polylines)
    usable = _usable_pieces(pieces)
    for n, pl in enumerate(pieces):
        if usable is not None and usable[n]:
            kept.append(pl)
            continue
        value = bad_value([c for p in pl.points_m for c in p]) if pl.points_m else None
        if value is None:
            kept.append(pl)
        else:
            what = f"route piece {pl.source_id} on layer {pl.layer}"
            issues.append(Issue(IssueCode.BAD_COORDINATE, _refusal(source, what, value), pl.source_id))
    return kept, issues


def check_equipment(
    equipment: Iterable[Equipment], source: str = ""
) -> tuple[list[Equipment], list[Issue]]:
    """Keep the equipment whose insertion point is usable; one issue per refused one.

    Parameters
    ----------
    equipment : iterable of Equipment
        Equipment, insertion points in [m].
    source : str
        File name for the messages.

    Returns
    -------
    kept : list of Equipment
    issues : list of Issue
        Code ``"bad-coordinate"``; a circuit to a refused tag then fails as an unknown tag.
    """
    kept: list[Equipment] = []
    issues: list[Issue] = []
    for eq in equipment:
        value = bad_value(eq.position_m)
        if value is None:
            kept.append(eq)
        else:
            what = f"equipment {eq.tag} ({eq.source_id}, block {eq.block_name})"
            issues.append(Issue(IssueCode.BAD_COORDINATE, _refusal(source, what, value), eq.source_id))
    return kept, issues


def median_piece_length_m(polylines: Sequence[RoutePolyline]) -> float:
    """The median plan-and-height length of the route pieces, [m] (0 when there are none).

    Examples
    --------
    >>> a = RoutePolyline(((0.0, 0.0, 0.0), (3.0, 4.0, 0.0)), "T", "tray", "E", "1")
    >>> b = RoutePolyline(((0.0, 0.0, 0.0), (1.0, 0.0, 0.0), (1.0, 1.0, 0.0)), "T", "tray", "E", "2")
    >>> median_piece_length_m([a, b, b])
    2.0
    """
    counts = np.fromiter((len(pl.points_m) for pl in polylines), dtype=np.intp, count=len(polylines))
    counts = counts[counts >= 2] if len(counts) else counts
    pts = [p for pl in polylines if len(pl.points_m) >= 2 for p in pl.points_m]
    if not pts:
        return 0.0
    arr = np.asarray(pts, dtype=float)
    steps = np.linalg.norm(np.diff(arr, axis=0), axis=1)  # includes the jumps between pieces
    starts = np.cumsum(counts) - counts  # first point of each piece
    cum = np.concatenate(([0.0], np.cumsum(steps)))
    lengths = cum[starts + counts - 1] - cum[starts]
    return float(np.median(lengths))


def near_miss_reach_m(snap_tolerance_m: float, near_miss_factor: float, median_m: float) -> float:
    """How far from a free end the near-miss search looks, [m].

    ``near_miss_factor`` times the snap tolerance, but never more than the median piece
    length: beyond a typical piece every end has a route "near" it, the search would list
    ordinary neighbours and its candidates grow with the square of the reach.

    Examples
    --------
    >>> near_miss_reach_m(0.05, 10.0, 20.0)
    0.5
    >>> near_miss_reach_m(0.05, 10.0, 0.2)
    0.2
    """
    reach = float(snap_tolerance_m) * float(near_miss_factor)
    if median_m > 0.0:
        reach = min(reach, max(float(median_m), float(snap_tolerance_m)))
    return reach


def check_snap_tolerance(
    snap_tolerance_m: float, polylines: Sequence[RoutePolyline], source: str = ""
) -> None:
    """Refuse a snap tolerance that is not positive, or large against the drawing.

    Parameters
    ----------
    snap_tolerance_m : float
        Route ends closer than this join, [m].
    polylines : sequence of RoutePolyline
        The (guarded) route pieces, [m]; their bounding box gives the drawing's scale.
    source : str
        File name for the message.

    Raises
    ------
    ConfigError
        The tolerance is NaN, infinite, zero or negative, or more than
        :data:`MAX_SNAP_FRACTION` of the diagonal of the routes' bounding box (and more
        than the default :data:`DEFAULT_SNAP_TOLERANCE_M`), or more than
        :data:`MAX_SNAP_PIECE_FRACTION` of the median piece length (the default too: such
        a drawing is at the wrong scale or the tolerance would join most of it).

    Examples
    --------
    >>> line = RoutePolyline(((0.0, 0.0, 0.0), (100.0, 0.0, 0.0)), "T", "tray", "E", "1")
    >>> check_snap_tolerance(0.05, [line])
    >>> check_snap_tolerance(5.0, [line])
    Traceback (most recent call last):
    ...
    cablewright.core.errors.ConfigError: snap_tolerance_m = 5 m is 5 % of the drawing's extent (100 m), more than 1 %; it would join routes that do not meet - use a tolerance near the drawing's precision (the default is 0.05 m)
    """
    tol = float(snap_tolerance_m)
    if not (math.isfinite(tol) and tol > 0.0):
        raise ConfigError(
            f"snap_tolerance_m = {snap_tolerance_m!r} must be a positive finite length in metres "
            "(the default is 0.05 m)", column="snap_tolerance_m", value=snap_tolerance_m
        )
    if not polylines:
        return
    pts = np.asarray([p for pl in polylines for p in pl.points_m], dtype=float)
    extent_m = float(np.linalg.norm(pts.max(axis=0) - pts.min(axis=0)))
    if tol > max(MAX_SNAP_FRACTION * extent_m, DEFAULT_SNAP_TOLERANCE_M):
        where = f"{source}: " if source else ""
        raise ConfigError(
            f"{where}snap_tolerance_m = {tol:g} m is {100 * tol / extent_m:.0f} % of the drawing's "
            f"extent ({extent_m:.0f} m), more than {100 * MAX_SNAP_FRACTION:.0f} %; it would join "
            "routes that do not meet - use a tolerance near the drawing's precision "
            "(the default is 0.05 m)", file=source or None, column="snap_tolerance_m", value=tol
        )
    median_m = median_piece_length_m(polylines)
    if median_m > 0.0 and tol > MAX_SNAP_PIECE_FRACTION * median_m:
        where = f"{source}: " if source else ""
        raise ConfigError(
            f"{where}snap_tolerance_m = {tol:g} m is {tol / median_m:.3g} times the median route "
            f"piece length ({median_m:.3g} m, {len(polylines)} pieces, extent {extent_m:.3g} m); "
            "it would join most of the drawing - check the drawing units ([drawing] units or "
            "--units) or use a smaller snap_tolerance_m", file=source or None, column="snap_tolerance_m",
            value=tol
        )
