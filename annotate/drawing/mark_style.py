"""Colours and linetype of our marks, chosen from the drawing's own layer table at run time.

A leader drawn in a route layer's colour reads on a plot as one more run of tray or
ladder, and someone may pull cable along it.  So every layer of ours gets a colour
that no route layer uses (neither the layer's colour nor a colour set on one of its
entities), and leaders get a linetype of our own (:data:`LEADER_LINETYPE`), which no
layer of the input can use since we define it.
"""

from __future__ import annotations

from collections.abc import Iterable, Mapping
from typing import Any

__all__ = ["LEADER_LINETYPE", "PREFERRED_ACI", "route_colors", "choose_colors",
           "ensure_leader_linetype"]

#: Our leader linetype: a long dash and two dots (a pattern of our own).
LEADER_LINETYPE = "CW-LEADER"
#: ACI colours tried, in order, when the configured one is taken by a route layer:
#: the fully saturated colours first (they plot darkest), then mid tones.
PREFERRED_ACI = (5, 6, 2, 4, 3, 1, 30, 40, 140, 200, 210, 150, 90, 50, 170, 230)
#: Leader pattern in text heights: dash 1.5 h, gap 0.4 h, dot, gap 0.4 h, dot, gap 0.4 h.
LEADER_PATTERN_H = (1.5, -0.4, 0.0, -0.4, 0.0, -0.4)


def route_colors(doc: Any, route_layers: Iterable[str]) -> set[int]:
    """ACI colours used by the route layers: the layers' own and their entities' explicit ones."""
    names = {n.upper() for n in route_layers}
    used: set[int] = set()
    for layer in doc.layers:
        if layer.dxf.name.upper() in names:
            used.add(abs(int(layer.dxf.get("color", 7))))
    for e in doc.modelspace():
        layer = str(e.dxf.get("layer", "0")).upper()
        if layer in names:
            color = int(e.dxf.get("color", 256))
            if 0 < color < 256:
                used.add(color)
    return used


def choose_colors(wanted: Mapping[str, int], taken: set[int]) -> dict[str, int]:
    """Each role's wanted colour, or the first of :data:`PREFERRED_ACI` no route layer uses.

    Examples
    --------
    >>> choose_colors({"label": 5, "group": 6}, {6, 1})
    {'label': 5, 'group': 2}
    """
    out: dict[str, int] = {}
    for role, color in wanted.items():
        if color not in taken:
            out[role] = color
            continue
        used_by_us = set(out.values())
        free = [c for c in PREFERRED_ACI if c not in taken and c not in used_by_us]
        free = free or [c for c in range(10, 250) if c not in taken]
        out[role] = free[0] if free else color
    return out


def ensure_leader_linetype(doc: Any, text_height: float) -> str:
    """Define our leader linetype (scaled to the text height) if missing; its name."""
    if not doc.linetypes.has_entry(LEADER_LINETYPE):
        pattern = [v * text_height for v in LEADER_PATTERN_H]
        total = sum(abs(v) for v in pattern)
        doc.linetypes.add(LEADER_LINETYPE, pattern=[total, *pattern],
                          description="cablewright leader __ . . __ . .")
    return LEADER_LINETYPE
