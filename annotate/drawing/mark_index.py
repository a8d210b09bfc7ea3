"""The index of what our marks keep clear of: the drawing's own geometry and our marks so far.

Two kinds of obstacle, both plain shapely geometry in drawing units (so any source of
obstacles, a parsed document or a streamed one, can hand them in):

* fixed ones, known before the first mark: the drawing's linework (walls, routes,
  symbol lines) and its text and symbol boxes, each kind in one shapely ``STRtree``;
  a batch of candidate spots is tested against them in one bulk query
  (``STRtree.query`` with an array of polygons);
* our marks placed so far (label boxes, leaders, revision diamonds), which change with
  every mark: those up to the last rebuild (every :data:`REBUILD_AFTER`) in shapely trees
  (:mod:`.mark_trees`), tested in bulk; the last ones in a uniform grid of oriented
  boxes, tested by the separating axis test (:func:`.boxes.boxes_overlap`), only for
  the spots the bulk queries left free, in order of preference, up to the first free one.

A candidate array is taken a chunk at a time (:data:`FIRST_CHUNK`, growing), so spots
after the first free one are never built; leaders are screened in bulk against our boxes
(:mod:`.leader_screen`) before the exact test.  Neither changes which spot is chosen.

:class:`PlacementStats` counts each placement; last resorts are reported, never silent.

References: shapely 2 manual, ``STRtree.query(geometry_array, predicate="intersects")``.
"""

from __future__ import annotations

import hashlib
import math
from collections.abc import Iterable, Sequence
from dataclasses import dataclass
from typing import Any

import numpy as np
import shapely
from shapely.geometry import Point, Polygon

from .box_arrays import box_polygons, row_box, thin_box, tree_of
from .boxes import Box, _polygon, boxes_overlap
from .leader_screen import crossing_marks
from .mark_trees import MarkLevel, MarkTrees
from .placement_stats import PlacementStats

__all__ = ["LabelIndex", "PlacementStats", "box_polygons", "row_box", "thin_box"]


#: Marks added before the tree of our marks is rebuilt: a rebuild costs about as much as
#: a few hundred grid tests (measured on the benchmark plant, benchmarks/RESULTS.md).
REBUILD_AFTER = 200
POLY_MEMO = 4  #: candidate arrays whose polygons are kept (tiers and last resorts reuse some)
#: Boxes of a candidate array tested in bulk at first, the next chunk :data:`CHUNK_GROWTH`
#: times as many: half the first free boxes are among the first 6-12 of a few hundred,
#: but a crowded drawing's arrays are mostly tested to their end, where each chunk costs
#: a few shapely calls (measured on the benchmark plants, benchmarks/RESULTS.md).
FIRST_CHUNK = 32
CHUNK_GROWTH = 8
#: Spots left from which leaders are screened in bulk first (fewer: the screen costs more).
SCREEN_FROM = 4


@dataclass
class _Tested:
    """A candidate array's bulk result against the fixed obstacles, boxes ``0:done``."""

    ok: np.ndarray
    done: int = 0


class LabelIndex:
    """Our marks placed so far, the drawing's fixed obstacles, and the bulk tests.

    Parameters
    ----------
    cell : float
        Grid cell of the placed marks [drawing units]; about a label's length.
    obstacles : iterable of shapely geometries, optional
        Soft lines (route lines) a spot should rather not cross
        (:meth:`crosses_obstacle`; used by :func:`.placement.place_along`).
    blocked : iterable of Box, optional
        The drawing's text and symbol boxes: no mark goes on them.
    lines : shapely.STRtree or iterable of shapely geometries, optional
        The drawing's linework (walls, routes, symbol lines): no text crosses it.
    """

    def __init__(
        self, cell: float, obstacles: Iterable[object] = (), blocked: Iterable[Box] = (),
        lines: shapely.STRtree | Iterable[Any] | None = None,
    ) -> None:
        if not cell > 0.0:
            raise ValueError(f"grid cell must be > 0, got {cell!r}")
        self.cell = float(cell)
        self._eps = 1e-9 * self.cell
        self._grid: dict[tuple[int, int], list[int]] = {}
        self._boxes: list[Box] = []
        self._line_grid: dict[tuple[int, int], list[int]] = {}
        self._own_lines: list[Any] = []
        self._obstacles = tree_of(obstacles)
        self._fixed = list(blocked)
        self._fixed_polys = box_polygons(self._fixed)
        self._fixed_tree = shapely.STRtree(self._fixed_polys) if len(self._fixed) else None
        self._lines = lines if isinstance(lines, shapely.STRtree) or lines is None else tree_of(lines)
        self.stats = PlacementStats()
        # our marks so far in a tree (boxes and leaders), rebuilt every REBUILD_AFTER marks;
        # those added since are tested through the grid
        self._marks = MarkTrees(REBUILD_AFTER)
        self._in_tree = (0, 0)  # boxes, lines in the trees
        # for the leader screen: the placed boxes as rows, each mark geometry's box number
        # (-1 for a line), the tree's numbers and a small tree of the boxes added since
        self._box_rows = np.empty((64, 6))
        self._since: tuple[int, int, shapely.STRtree | None] = (0, 0, None)
        # polygons of the last few candidate arrays, held with the array (identity is safe)
        self._poly_memo: list[tuple[np.ndarray, np.ndarray, np.ndarray]] = []
        # the fixed obstacles never change: a candidate array's bulk result, by its boxes
        self._static_memo: dict[tuple[bool, bool, bytes], _Tested] = {}

    # -- what is there -------------------------------------------------------------
    @property
    def blocked(self) -> tuple[Polygon, ...]:
        """Every fixed box (drawing text, symbols), as shapely polygons."""
        return tuple(self._fixed_polys)

    @property
    def boxes(self) -> tuple[Polygon, ...]:
        """Every box placed so far, as shapely polygons."""
        return tuple(_polygon(b) for b in self._boxes)

    @property
    def has_linework(self) -> bool:
        """True when the drawing's linework is an obstacle."""
        return self._lines is not None

    def __len__(self) -> int:
        return len(self._boxes)

    def bounds(self) -> tuple[float, float, float, float] | None:
        """(xmin, ymin, xmax, ymax) of every box placed, ``None`` when empty."""
        if not self._boxes:
            return None
        return (min(b.xmin for b in self._boxes), min(b.ymin for b in self._boxes),
                max(b.xmax for b in self._boxes), max(b.ymax for b in self._boxes))

    def _cells(self, xmin: float, ymin: float, xmax: float, ymax: float) -> Iterable[tuple[int, int]]:
        c = self.cell
        for i in range(math.floor(xmin / c), math.floor(xmax / c) + 1):
            for j in range(math.floor(ymin / c), math.floor(ymax / c) + 1):
                yield (i, j)

    # -- recording -----------------------------------------------------------------
    def add(self, box: Box, polygon: Polygon | None = None) -> None:
        """Record a placed box (``polygon``: its :func:`.boxes._polygon`, when made already)."""
        idx = len(self._boxes)
        self._boxes.append(box)
        self._marks.add(_polygon(box) if polygon is None else polygon, idx)
        if idx == len(self._box_rows):
            self._box_rows = np.concatenate([self._box_rows, np.empty_like(self._box_rows)])
        self._box_rows[idx] = box[:6]
        for key in self._cells(box.xmin, box.ymin, box.xmax, box.ymax):
            self._grid.setdefault(key, []).append(idx)

    def add_line(self, line: Any) -> None:
        """Record one of our own lines (a leader) that later boxes must not cross."""
        idx = len(self._own_lines)
        self._own_lines.append(line)
        self._marks.add(line, -1)
        for key in self._cells(*line.bounds):
            self._line_grid.setdefault(key, []).append(idx)

    # -- single tests --------------------------------------------------------------
    def _box_free(self, box: Box) -> bool:
        """True when ``box`` overlaps no placed box and no fixed (text, symbol) box."""
        if self._fixed_tree is not None and self._hits_fixed(box):
            return False
        return self.free_of_marks(box)

    def _hits_fixed(self, box: Box) -> bool:
        for i in self._fixed_tree.query(_polygon(box)):  # type: ignore[union-attr]
            if boxes_overlap(box, self._fixed[int(i)], self._eps):
                return True
        return False

    def free_of_marks(self, box: Box, *, since_tree: bool = False) -> bool:
        """True when ``box`` overlaps none of our placed boxes and crosses none of our lines
        (with ``since_tree``, only those added since the marks' tree was built)."""
        first_box, first_line = self._in_tree if since_tree else (0, 0)
        cells = list(self._cells(box.xmin, box.ymin, box.xmax, box.ymax))
        seen: set[int] = set()
        for key in cells:
            for idx in self._grid.get(key, ()):
                if idx >= first_box and idx not in seen:
                    seen.add(idx)
                    if boxes_overlap(box, self._boxes[idx], self._eps):
                        return False
        return self._free_of_own_lines(box, cells, first_line)

    def _free_of_own_lines(self, box: Box, cells: list[tuple[int, int]], first: int) -> bool:
        """True when ``box`` crosses none of our lines from number ``first`` on."""
        poly = None
        seen: set[int] = set()
        for key in cells:
            for idx in self._line_grid.get(key, ()):
                if idx < first or idx in seen:
                    continue
                seen.add(idx)
                line = self._own_lines[idx]
                x0, y0, x1, y1 = line.bounds
                if x1 < box.xmin or x0 > box.xmax or y1 < box.ymin or y0 > box.ymax:
                    continue
                poly = _polygon(box) if poly is None else poly
                if poly.intersects(line):
                    return False
        return True

    def crosses_line(self, box: Box) -> bool:
        """True when ``box`` crosses the drawing's linework or one of our leaders."""
        if self._lines is not None and len(self._lines.query(_polygon(box), predicate="intersects")):
            return True
        # our leaders: free of our boxes but not of our marks means a leader is crossed
        return self.free_of_boxes(box) and not self.free_of_marks(box)

    def free_of_boxes(self, box: Box) -> bool:
        """True when ``box`` overlaps none of our placed boxes (leaders not counted)."""
        for key in self._cells(box.xmin, box.ymin, box.xmax, box.ymax):
            for idx in self._grid.get(key, ()):
                if boxes_overlap(box, self._boxes[idx], self._eps):
                    return False
        return True

    def is_free(self, box: Box) -> bool:
        """True when ``box`` overlaps no placed or fixed box and crosses no line."""
        return bool(self.static_free([box], lines=True)[0]) and self.free_of_marks(box)

    def crosses_obstacle(self, box: Box) -> bool:
        """True when ``box`` touches one of the soft obstacles (route lines)."""
        if self._obstacles is None:
            return False
        return len(self._obstacles.query(_polygon(box), predicate="intersects")) > 0

    # -- bulk tests ----------------------------------------------------------------
    def static_free(self, boxes: Sequence[Box] | np.ndarray, *, lines: bool = True,
                    fixed: bool = True) -> np.ndarray:
        """Per box, True when it is clear of the fixed obstacles (one bulk query per tree).

        ``lines`` and ``fixed`` choose the trees: the drawing's linework and its text
        and symbol boxes.
        """
        return self._static_free(boxes, self._polys_of(boxes), lines=lines, fixed=fixed)

    def _polys_of(self, boxes: Sequence[Box] | np.ndarray) -> np.ndarray:
        """The boxes as polygons (:func:`box_polygons`), kept for the last few arrays."""
        if not isinstance(boxes, np.ndarray):
            return box_polygons(boxes)
        return self._polys_at(boxes, slice(0, len(boxes)))

    def _polys_at(self, boxes: np.ndarray, idx: np.ndarray | slice) -> np.ndarray:
        """Polygons of the rows ``idx`` of ``boxes``, each built once while the array is
        among the last :data:`POLY_MEMO` (row by row the same as :func:`box_polygons`)."""
        entry = next((e for e in self._poly_memo if e[0] is boxes), None)
        if entry is None:
            entry = (boxes, np.empty(len(boxes), dtype=object), np.zeros(len(boxes), dtype=bool))
            self._poly_memo = [*self._poly_memo[-(POLY_MEMO - 1):], entry]
        _, polys, made = entry
        if isinstance(idx, slice) and not made[idx].any():
            polys[idx], made[idx] = box_polygons(boxes[idx]), True
            return polys[idx]
        rows = np.arange(len(boxes))[idx] if isinstance(idx, slice) else idx
        missing = rows[~made[rows]]
        if len(missing):
            polys[missing] = box_polygons(boxes[missing])
            made[missing] = True
        return polys[rows]

    def _tested(self, boxes: np.ndarray, lines: bool, fixed: bool) -> _Tested:
        """The remembered bulk result of a candidate array (by its first six columns)."""
        digest = hashlib.blake2b(np.ascontiguousarray(boxes[:, :6]).tobytes(), digest_size=20)
        key = (lines, fixed, digest.digest())
        memo = self._static_memo.get(key)
        if memo is None:
            memo = self._static_memo[key] = _Tested(np.ones(len(boxes), dtype=bool))
        return memo

    def _static_ok(self, boxes: Sequence[Box] | np.ndarray, memo: _Tested | None, start: int,
                   stop: int, *, lines: bool, fixed: bool) -> np.ndarray:
        """:meth:`static_free` of the boxes ``start:stop``, remembered in ``memo`` (an array
        of boxes' :meth:`_tested`; None for a sequence) for the boxes tested so far."""
        if memo is None:
            part = boxes[start:stop]
            return self._static_free(part, box_polygons(part), lines=lines, fixed=fixed)
        if memo.done < stop:
            new = slice(memo.done, stop)
            memo.ok[new] = self._static_free(boxes[new], self._polys_at(boxes, new),  # type: ignore[arg-type]
                                             lines=lines, fixed=fixed)
            memo.done = stop
        return memo.ok[start:stop]

    def _static_free(self, boxes: Sequence[Box] | np.ndarray, polys: np.ndarray, *,
                     lines: bool, fixed: bool) -> np.ndarray:
        ok = np.ones(len(boxes), dtype=bool)
        if len(boxes) == 0:
            return ok
        # text and symbol boxes first: they refuse over half the spots of a crowded drawing,
        # cheaper than the lines near a route (either order, same result; RESULTS.md stop 27)
        if fixed and self._fixed_tree is not None:
            # exact for two rectangles (a shared edge counts as a hit: on the safe side)
            ok[self._fixed_tree.query(polys, predicate="intersects")[0]] = False
        if lines and self._lines is not None:
            rest = np.flatnonzero(ok)
            if len(rest):
                hit = self._lines.query(polys[rest], predicate="intersects")
                ok[rest[hit[0]]] = False
        return ok

    def leader_free(self, a: Sequence[float], b: Sequence[float], *, shorten_a: float,
                    lines: bool = True, from_symbol: bool = False, graze: float = 0.0) -> bool:
        """True when a leader from ``a`` to ``b`` (its first ``shorten_a`` left out, where it
        leaves the route) crosses no text, symbol or mark of ours and, with ``lines``, none
        of the drawing's lines; ``from_symbol`` lets it leave the symbol box holding ``a``;
        ``graze``: how far it may run into a text or symbol box of the drawing (its margin)."""
        thin = thin_box(a, b, shorten_a)
        if thin is None:
            return True
        if not self.free_of_boxes(thin):
            return False
        poly = _polygon(thin)
        if lines and self._lines is not None and len(self._lines.query(poly, predicate="intersects")):
            return False
        if self._fixed_tree is None:
            return True
        start = None  # made only when a symbol box may hold it
        for j in map(int, self._fixed_tree.query(poly, predicate="intersects")):
            start = Point(a[0], a[1]) if from_symbol and start is None else start
            if from_symbol and self._fixed_polys[j].covers(start):
                continue
            if boxes_overlap(thin, self._fixed[j], max(self._eps, graze)):
                return False
        return True

    def first_free(self, boxes: Sequence[Box] | np.ndarray, *, lines: bool = True, fixed: bool = True,
                   accept=None, refused=None) -> int | None:
        """Index of the first box (in the given order of preference) clear of everything.

        The fixed obstacles and the tree of our marks are tested in bulk, a chunk of
        boxes at a time (:data:`FIRST_CHUNK`, growing by :data:`CHUNK_GROWTH`; the first
        free box is the same as with every box tested at once); our marks added since the tree
        only for the boxes left, in order; ``accept(i)`` (optional) is a last test, e.g.
        of the leader; ``refused(rows)`` (optional, with ``accept``) names in bulk the rows
        whose ``accept`` is surely False (and without side effects): they are skipped.
        """
        as_rows = isinstance(boxes, np.ndarray)
        levels: list[MarkLevel] = []
        tree_taken = False
        memo = self._tested(boxes, lines, fixed) if as_rows and len(boxes) else None  # type: ignore[arg-type]
        start, size = 0, FIRST_CHUNK
        while start < len(boxes):
            stop = min(len(boxes), start + size)
            rest = start + np.flatnonzero(self._static_ok(boxes, memo, start, stop, lines=lines, fixed=fixed))
            start, size = stop, CHUNK_GROWTH * size
            if len(rest) == 0:
                continue
            if not tree_taken:  # taken (maybe rebuilt) once per call, as the first box is
                levels, tree_taken = self.mark_levels(), True
            if levels:
                polys = (self._polys_at(boxes, rest) if as_rows  # type: ignore[arg-type]
                         else box_polygons([boxes[int(j)] for j in rest]))
                keep = np.ones(len(rest), dtype=bool)
                for level in levels:  # the small tree only for the boxes the large one left
                    live = np.flatnonzero(keep)
                    if len(live) == 0:
                        break
                    hit = level.tree.query(polys if len(live) == len(keep) else polys[live],
                                           predicate="intersects")
                    keep[live[hit[0]]] = False
                rest = rest[keep]
            if refused is not None and accept is not None and len(rest) >= SCREEN_FROM:
                rest = rest[~refused(rest)]
            for j in rest:
                i = int(j)
                box = row_box(boxes, i) if as_rows else boxes[i]  # type: ignore[arg-type]
                if (self.free_of_marks(box, since_tree=True)
                        and (accept is None or accept(i))):
                    return i
        return None

    def leaders_crossing_marks(self, a: np.ndarray, b: np.ndarray, shorten_a: float) -> np.ndarray:
        """Per leader from ``a[i]`` to ``b[i]``: True when it surely crosses one of our placed
        boxes (:func:`.leader_screen.crossing_marks`); False: not sure, test it exactly."""
        return crossing_marks(self, a, b, shorten_a)

    def _since_tree(self, first: int) -> shapely.STRtree | None:
        """A tree of the boxes placed since the marks' tree (number ``first`` on)."""
        n = len(self._boxes)
        if self._since[:2] != (first, n):
            polys = box_polygons(self._box_rows[first:n])
            self._since = (first, n, shapely.STRtree(polys) if len(polys) else None)
        return self._since[2]

    def mark_levels(self) -> list[MarkLevel]:
        """The trees of our marks (:class:`.mark_trees.MarkLevel`, the large one first),
        rebuilt when :data:`REBUILD_AFTER` marks were added since (:class:`.mark_trees.MarkTrees`)."""
        if self._marks.rebuild():
            self._in_tree = (len(self._boxes), len(self._own_lines))
        return self._marks.levels
