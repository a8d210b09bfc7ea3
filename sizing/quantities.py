"""Bill of quantities: cable to order per cable type, a drum plan, devices per rating.

Pure calculation, no I/O.  The cable to order for a circuit is its design
length (routed length plus the allowances of contract.md, "Lengths and
grouping") times its parallel cables; the drum plan packs those cut lengths
onto drums of the lengths the config lists (first-fit decreasing, then each
drum shrunk to the shortest listed length that still holds its cuts).

References
----------
.. [1] contract.md, "Extensions": ``quantities`` in ``schedule.json``, "sum of
   design length x parallel".
.. [2] D. S. Johnson, "Near-optimal bin packing algorithms", MIT (1973): first-fit
   decreasing.  G. Dósa, "The tight bound of First Fit Decreasing bin-packing
   algorithm is FFD(I) <= 11/9 OPT(I) + 6/9", ESCAPE 2007, LNCS 4614.
"""

from __future__ import annotations

from collections import defaultdict
from collections.abc import Iterable, Sequence
from dataclasses import dataclass

from cablewright.core.errors import OutOfRangeError

from .cable_text import cable_text

__all__ = [
    "CableType",
    "CableRun",
    "Cut",
    "Drum",
    "DrumPlan",
    "QuantityRow",
    "DeviceCount",
    "plan_drums",
    "bill_of_quantities",
    "device_counts",
]


@dataclass(frozen=True, order=True)
class CableType:
    """One cable as ordered: cores, size, conductor, insulation."""

    cores: int
    csa_mm2: float
    conductor: str
    insulation: str
    #: The size as the rule set writes it ("6 AWG"); "" writes the area in mm².
    size_label: str = ""

    def text(self) -> str:
        """The cable as written in the schedule, e.g. ``"4C 95 mm² Cu/XLPE"``."""
        return cable_text(self.cores, self.csa_mm2, self.conductor, self.insulation,
                          size_label=self.size_label)


@dataclass(frozen=True)
class CableRun:
    """The cable of one circuit: its type, design length [m] and parallel cables."""

    circuit_id: str
    cable: CableType
    design_length_m: float
    parallel: int = 1


@dataclass(frozen=True)
class Cut:
    """One length cut from a drum: one cable of one circuit [m]."""

    circuit_id: str
    length_m: float


@dataclass(frozen=True)
class Drum:
    """A drum of ``length_m`` and the cuts taken from it; ``waste_m`` is what is left."""

    length_m: float
    cuts: tuple[Cut, ...]

    @property
    def used_m(self) -> float:
        return sum(c.length_m for c in self.cuts)

    @property
    def waste_m(self) -> float:
        return self.length_m - self.used_m


@dataclass(frozen=True)
class DrumPlan:
    """Drums for one cable type.

    Attributes
    ----------
    drums : tuple of Drum
    too_long : tuple of Cut
        Cuts longer than the longest drum listed: each needs a drum of its own
        length ordered specially, or a joint; they are on no drum here.
    """

    drums: tuple[Drum, ...]
    too_long: tuple[Cut, ...] = ()

    @property
    def waste_m(self) -> float:
        return sum(d.waste_m for d in self.drums)


@dataclass(frozen=True)
class QuantityRow:
    """One row of the bill: a cable type, its circuits, cable runs and length to order.

    ``runs`` counts cables pulled: a circuit of n parallel cables is n runs.
    ``length_to_order_m`` is the sum of design length x parallel [m].
    """

    cable: CableType
    circuits: int
    runs: int
    length_to_order_m: float
    plan: DrumPlan


@dataclass(frozen=True)
class DeviceCount:
    """How many protective devices of one kind and rating."""

    kind: str
    rating_a: float
    count: int


def plan_drums(cuts: Sequence[Cut], drum_lengths_m: Sequence[float]) -> DrumPlan:
    """Pack cuts onto drums: first-fit decreasing, then each drum made as short as it can be.

    Every drum is first the longest listed length; cuts are taken longest first and
    each goes on the first drum with room left (first-fit decreasing [1]_); a cut
    that fits on no open drum opens a new one.  Then each drum is replaced by the
    shortest listed length that still holds its cuts, which lowers the waste.

    Parameters
    ----------
    cuts : sequence of Cut
        Lengths to cut [m], each > 0.
    drum_lengths_m : sequence of float
        Drum lengths available [m], each > 0.

    Returns
    -------
    DrumPlan

    Raises
    ------
    OutOfRangeError
        No drum length given, or a length <= 0.

    Examples
    --------
    >>> plan = plan_drums([Cut("A", 300.0), Cut("B", 250.0), Cut("C", 200.0)], [500.0, 1000.0])
    >>> [(d.length_m, [c.circuit_id for c in d.cuts]) for d in plan.drums]
    [(1000.0, ['A', 'B', 'C'])]
    >>> round(plan.waste_m, 1)
    250.0

    References
    ----------
    .. [1] D. S. Johnson, "Near-optimal bin packing algorithms", MIT (1973).
    """
    lengths = sorted(float(v) for v in drum_lengths_m)
    if not lengths or lengths[0] <= 0:
        raise OutOfRangeError(f"drum lengths {list(drum_lengths_m)} must be one or more lengths > 0 m; "
                              "set [sizing] drum_lengths_m in the config")
    longest = lengths[-1]
    too_long = tuple(c for c in cuts if c.length_m > longest)
    bins: list[list[Cut]] = []
    room: list[float] = []
    for cut in sorted((c for c in cuts if c.length_m <= longest), key=lambda c: (-c.length_m, c.circuit_id)):
        if cut.length_m <= 0:
            raise OutOfRangeError(f"circuit {cut.circuit_id}: cut length {cut.length_m} m must be > 0", value=cut.length_m)
        for i, left in enumerate(room):
            if cut.length_m <= left + 1e-9:
                bins[i].append(cut)
                room[i] = left - cut.length_m
                break
        else:
            bins.append([cut])
            room.append(longest - cut.length_m)
    drums = []
    for held in bins:
        used = sum(c.length_m for c in held)
        size = next(v for v in lengths if v >= used - 1e-9)
        drums.append(Drum(size, tuple(held)))
    return DrumPlan(tuple(drums), too_long)


def bill_of_quantities(runs: Iterable[CableRun], drum_lengths_m: Sequence[float]) -> tuple[QuantityRow, ...]:
    """Cable to order per cable type: design length x parallel, summed, and its drum plan.

    Parameters
    ----------
    runs : iterable of CableRun
        One per sized circuit.
    drum_lengths_m : sequence of float
        Drum lengths available [m].

    Returns
    -------
    tuple of QuantityRow
        Sorted by conductor, insulation, cores and size.

    Examples
    --------
    >>> t = CableType(4, 95.0, "Cu", "XLPE")
    >>> rows = bill_of_quantities([CableRun("P1", t, 40.0, 2), CableRun("P2", t, 30.0)], [500.0])
    >>> rows[0].cable.text(), rows[0].circuits, rows[0].runs, rows[0].length_to_order_m
    ('4C 95 mm² Cu/XLPE', 2, 3, 110.0)

    References
    ----------
    .. [1] contract.md, "Extensions": ``quantities``.
    """
    by_type: dict[CableType, list[CableRun]] = defaultdict(list)
    for run in runs:
        by_type[run.cable].append(run)
    rows = []
    for cable in sorted(by_type, key=lambda t: (t.conductor, t.insulation, t.cores, t.csa_mm2)):
        held = by_type[cable]
        cuts = [Cut(r.circuit_id, r.design_length_m) for r in held for _ in range(max(1, r.parallel))]
        total = sum(r.design_length_m * max(1, r.parallel) for r in held)
        rows.append(QuantityRow(cable, len(held), len(cuts), total, plan_drums(cuts, drum_lengths_m)))
    return tuple(rows)


def device_counts(devices: Iterable[tuple[str, float]]) -> tuple[DeviceCount, ...]:
    """Count protective devices per (kind, rating), sorted by kind then rating.

    Examples
    --------
    >>> [(d.kind, d.rating_a, d.count) for d in device_counts([("breaker", 16), ("breaker", 16), ("fuse", 63)])]
    [('breaker', 16, 2), ('fuse', 63, 1)]
    """
    counts: dict[tuple[str, float], int] = defaultdict(int)
    for kind, rating in devices:
        counts[(kind, rating)] += 1
    return tuple(DeviceCount(k, r, n) for (k, r), n in sorted(counts.items()))
