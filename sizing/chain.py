"""Voltage drop along the supply chain, from the origin of the installation.

IEC 60364-5-52:2009 525 and Annex G (Table G.52.1) set the limit between the
origin of the installation and the equipment: a final circuit's own drop adds
to the drops of the feeders upstream of its board.  Each circuit is fed from a
source tag; a sub-board's tag is the load end of its feeder.

References
----------
.. [1] IEC 60364-5-52:2009, 525 and Annex G, G.52.1 and Table G.52.1.
"""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence
from dataclasses import dataclass, replace

from cablewright.core.errors import CableRouteError, IssueCode

from .conductor_resistance import STANDARD_CSA_MM2, resistance_ohm_per_km
from .model import Check, CheckResult, SizingResult, VoltageDrop
from .voltage_drop import MAX_CONDUCTOR_TEMPERATURE_C, REACTANCE_MOHM_PER_M

__all__ = [
    "SupplyCycleError",
    "ChainDrops",
    "chain_drops",
    "cumulative_drop_percent",
    "exceeding_limit",
    "ChainCable",
    "DropFix",
    "drop_after_resize_pct",
    "upstream_chain",
    "cheapest_drop_fix",
    "ORIGIN_DROP_CHECK",
    "ORIGIN_DROP_SOURCE",
    "origin_limit",
    "origin_drop_check",
    "origin_drop_not_checked",
    "with_origin_check",
]

#: Name of the check of the drop from the origin in ``checks`` (beside ``voltage_drop``,
#: the circuit's own drop).
ORIGIN_DROP_CHECK = "voltage_drop_origin"
#: The clause the check follows: the limit holds between the origin of the
#: installation and the equipment, IEC 60364-5-52:2009 525 and Annex G (G.52.1,
#: Table G.52.1).
ORIGIN_DROP_SOURCE = "IEC 60364-5-52:2009 525 and G.52.1, from the origin of the installation"


class SupplyCycleError(CableRouteError, ValueError):
    """The circuits feed each other in a loop.

    Attributes
    ----------
    circuit_ids : tuple of str
        The circuits of the loop, in supply order, each once.
    """

    default_code = IssueCode.SUPPLY_LOOP

    def __init__(self, circuit_ids: Sequence[str]) -> None:
        self.circuit_ids: tuple[str, ...] = tuple(circuit_ids)
        loop = list(self.circuit_ids) + list(self.circuit_ids[:1])
        super().__init__(
            problem="circuits feed each other in a loop: " + " -> ".join(loop),
            fix="check the 'from' and 'to' tags of these circuits in the schedule")

    def __reduce__(self) -> tuple[type[SupplyCycleError], tuple[tuple[str, ...]]]:
        # rebuilt from its circuit ids (the default would pass the message as the ids)
        return type(self), (self.circuit_ids,)


@dataclass(frozen=True)
class ChainDrops:
    """The drops from the origin, with the circuits whose chain has no origin.

    Attributes
    ----------
    cumulative_pct : dict circuit id -> float
        Drop from the origin [%] of every circuit neither in a loop nor fed
        through one, in input order.
    loops : tuple of SupplyCycleError
        One error per supply loop found, carrying the loop's circuit ids.
    fed_through_loop : dict circuit id -> SupplyCycleError
        Circuits outside a loop whose supply passes through it: the loop.
    """

    cumulative_pct: dict[str, float]
    loops: tuple[SupplyCycleError, ...]
    fed_through_loop: dict[str, SupplyCycleError]

    def loop_of(self, circuit_id: str) -> SupplyCycleError | None:
        """The loop ``circuit_id`` belongs to, or None."""
        for loop in self.loops:
            if circuit_id in loop.circuit_ids:
                return loop
        return None


def chain_drops(
    own_drop_pct: Mapping[str, float],
    source_of: Mapping[str, str],
    feeder_of: Mapping[str, str],
) -> ChainDrops:
    """Voltage drop from the origin of the installation to each circuit's load.

    A circuit's drop from the origin is its own drop plus its feeder's drop
    from the origin, up the chain to a source that no circuit feeds.  Circuits
    that feed each other in a loop have no origin; they, and every circuit fed
    through them, are reported apart and the others computed as usual.

    Parameters
    ----------
    own_drop_pct : mapping circuit id -> float
        Each circuit's own drop [%].
    source_of : mapping circuit id -> str
        The source tag of each circuit (schedule column ``from``).
    feeder_of : mapping tag -> circuit id
        For each sub-board tag, the circuit that feeds it (its ``to``).  A tag
        with no feeder is an origin.

    Returns
    -------
    ChainDrops

    Examples
    --------
    P-10 and P-11 feed each other; P-12 is fed from P-11's board; P-1 has its
    own origin:

    >>> own = {"P-1": 1.0, "P-10": 2.0, "P-11": 1.5, "P-12": 0.5}
    >>> src = {"P-1": "MSB", "P-10": "DB11", "P-11": "DB10", "P-12": "DB11"}
    >>> d = chain_drops(own, src, {"DB10": "P-10", "DB11": "P-11"})
    >>> d.cumulative_pct, [e.circuit_ids for e in d.loops], sorted(d.fed_through_loop)
    ({'P-1': 1.0}, [('P-10', 'P-11')], ['P-12'])

    References
    ----------
    .. [1] IEC 60364-5-52:2009, Annex G, G.52.1 (drop from the origin).
    """
    result: dict[str, float] = {}
    blocked: dict[str, SupplyCycleError] = {}
    loops: list[SupplyCycleError] = []
    fed_through: dict[str, SupplyCycleError] = {}
    for start in own_drop_pct:
        path: list[str] = []
        circuit: str | None = start
        while circuit is not None and circuit not in result and circuit not in blocked:
            if circuit in path:
                break
            path.append(circuit)
            circuit = feeder_of.get(source_of.get(circuit, ""))
        if circuit is not None and circuit in path:  # a loop closes on this walk
            at = path.index(circuit)
            loop = SupplyCycleError(path[at:])
            loops.append(loop)
            for c in path[at:]:
                blocked[c] = loop
            path = path[:at]
        if circuit is not None and circuit in blocked:
            for c in path:
                blocked[c] = fed_through[c] = blocked[circuit]
            continue
        upstream = 0.0 if circuit is None else result[circuit]
        for c in reversed(path):
            result[c] = float(own_drop_pct.get(c, 0.0)) + upstream
            upstream = result[c]
    return ChainDrops(
        {cid: result[cid] for cid in own_drop_pct if cid in result},
        tuple(loops),
        {cid: fed_through[cid] for cid in own_drop_pct if cid in fed_through},
    )


def cumulative_drop_percent(
    own_drop_pct: Mapping[str, float],
    source_of: Mapping[str, str],
    feeder_of: Mapping[str, str],
) -> dict[str, float]:
    """Voltage drop from the origin of the installation to each circuit's load.

    The strict form of :func:`chain_drops`: a supply loop anywhere raises.

    Parameters
    ----------
    own_drop_pct : mapping circuit id -> float
        Each circuit's own drop [%].
    source_of : mapping circuit id -> str
        The source tag of each circuit (schedule column ``from``).
    feeder_of : mapping tag -> circuit id
        For each sub-board tag, the circuit that feeds it (its ``to``).  A tag
        with no feeder is an origin.

    Returns
    -------
    dict circuit id -> float
        Cumulative drop [%], own drop plus every feeder's upstream.

    Raises
    ------
    SupplyCycleError
        When feeders form a loop; carries the circuit ids of the first loop.

    Examples
    --------
    >>> own = {"F1": 1.5, "L1": 2.0, "L2": 1.0}
    >>> src = {"F1": "MSB", "L1": "DB1", "L2": "MSB"}
    >>> cumulative_drop_percent(own, src, {"DB1": "F1"})
    {'F1': 1.5, 'L1': 3.5, 'L2': 1.0}

    References
    ----------
    .. [1] IEC 60364-5-52:2009, Annex G, G.52.1 (drop from the origin).
    """
    drops = chain_drops(own_drop_pct, source_of, feeder_of)
    if drops.loops:
        raise drops.loops[0]
    return drops.cumulative_pct


def exceeding_limit(
    cumulative_pct: Mapping[str, float], limit_pct: Mapping[str, float] | float
) -> list[str]:
    """Circuits whose drop from the origin exceeds their limit, in input order.

    Parameters
    ----------
    cumulative_pct : mapping circuit id -> float
        From :func:`cumulative_drop_percent` [%].
    limit_pct : float or mapping circuit id -> float
        One limit for all, or per circuit [%]; a circuit missing from the
        mapping is not checked.

    Examples
    --------
    >>> exceeding_limit({"F1": 1.5, "L1": 5.5}, 5.0)
    ['L1']
    """
    out = []
    for cid, value in cumulative_pct.items():
        limit = limit_pct if isinstance(limit_pct, (int, float)) else limit_pct.get(cid)
        if limit is not None and value > limit + 1e-9:
            out.append(cid)
    return out


@dataclass(frozen=True)
class ChainCable:
    """What the drop advice needs of one circuit's cable.

    Attributes
    ----------
    csa_mm2 : float
        Cross-section of each cable [mm²].
    parallel : int
        Cables in parallel.
    length_m : float
        Design length [m].
    conductor, insulation : str
    power_factor : float
        cos φ of the load.
    own_drop_pct : float
        The circuit's own drop at ``csa_mm2`` [%].
    """

    csa_mm2: float
    parallel: int
    length_m: float
    conductor: str
    insulation: str
    power_factor: float
    own_drop_pct: float


@dataclass(frozen=True)
class DropFix:
    """Enlarging one circuit of the chain so the drop from the origin meets the limit.

    ``added_copper_mm2_m`` (extra cross-section x parallel x length, a measure of
    the extra conductor material) ranks the fixes: the least is the cheapest.
    """

    circuit_id: str
    from_csa_mm2: float
    to_csa_mm2: float
    added_copper_mm2_m: float
    total_pct: float


def drop_after_resize_pct(cable: ChainCable, csa_mm2: float) -> float:
    """The circuit's own drop with ``csa_mm2`` instead of its cross-section [%].

    The Annex G drop is proportional to R cos φ + X sin φ at the same current,
    length and parallel count:

    .. math:: u' = u \\, \\frac{R(S') \\cos\\varphi + X \\sin\\varphi}{R(S) \\cos\\varphi + X \\sin\\varphi}

    with R from IEC 60228 at the insulation's maximum temperature and X
    0.08 mΩ/m (both as in :mod:`.voltage_drop`; the ratio hardly depends on
    the temperature chosen).

    Examples
    --------
    16 mm² -> 25 mm² copper at unity power factor: the drop scales with
    R20 0.727 / 1.15 (IEC 60228:2004 Table 2):

    >>> c = ChainCable(16, 1, 50, "Cu", "XLPE", 1.0, 4.0)
    >>> round(drop_after_resize_pct(c, 25), 3), round(4.0 * 0.727 / 1.15, 3)
    (2.529, 2.529)

    References
    ----------
    .. [1] IEC 60364-5-52:2009, Annex G, formula G.1.
    """
    temp = MAX_CONDUCTOR_TEMPERATURE_C[cable.insulation]
    sin_phi = math.sqrt(max(0.0, 1.0 - cable.power_factor ** 2))
    x = REACTANCE_MOHM_PER_M * sin_phi  # mΩ/m, same unit as Ω/km
    old = resistance_ohm_per_km(cable.csa_mm2, cable.conductor, temp) * cable.power_factor + x
    new = resistance_ohm_per_km(csa_mm2, cable.conductor, temp) * cable.power_factor + x
    return cable.own_drop_pct * new / old


def upstream_chain(circuit_id: str, source_of: Mapping[str, str], feeder_of: Mapping[str, str]
                   ) -> list[str]:
    """The circuit and its feeders up to the origin, nearest first.

    Examples
    --------
    >>> upstream_chain("L1", {"F1": "MSB", "F2": "DB1", "L1": "DB2"}, {"DB1": "F1", "DB2": "F2"})
    ['L1', 'F2', 'F1']
    """
    chain = [circuit_id]
    feeder = feeder_of.get(source_of.get(circuit_id, ""))
    while feeder is not None and feeder not in chain:
        chain.append(feeder)
        feeder = feeder_of.get(source_of.get(feeder, ""))
    return chain


def cheapest_drop_fix(
    circuit_id: str,
    cumulative_pct: float,
    limit_pct: float,
    chain: Sequence[str],
    cables: Mapping[str, ChainCable],
    sizes_mm2: Sequence[float] = STANDARD_CSA_MM2,
) -> DropFix | None:
    """The least copper that brings a circuit's drop from the origin within its limit.

    For each circuit of ``chain`` (the circuit and its feeders, from
    :func:`upstream_chain`), the smallest standard size above its own that
    lowers the total enough by itself (:func:`drop_after_resize_pct`); of those,
    the one adding the least copper (extra mm² x parallel x length).  Advice
    only: a larger feeder also lowers the drop of every circuit it feeds.

    Parameters
    ----------
    circuit_id : str
        The failing final circuit.
    cumulative_pct, limit_pct : float
        Its drop from the origin and its limit [%].
    chain : sequence of str
        Circuit ids whose cables may be enlarged.
    cables : mapping circuit id -> ChainCable
    sizes_mm2 : sequence of float
        Standard sizes, ascending [mm²] (IEC 60228).

    Returns
    -------
    DropFix or None
        None when no single enlargement is enough.

    Examples
    --------
    A 6 % total against 5 %: the final circuit (4 mm², 30 m) or its feeder
    (16 mm², 60 m, 2 % own drop):

    >>> cables = {"L1": ChainCable(4, 1, 30, "Cu", "XLPE", 1.0, 4.0),
    ...           "F1": ChainCable(16, 1, 60, "Cu", "XLPE", 1.0, 2.0)}
    >>> fix = cheapest_drop_fix("L1", 6.0, 5.0, ["L1", "F1"], cables)
    >>> fix.circuit_id, fix.to_csa_mm2, fix.added_copper_mm2_m
    ('L1', 6.0, 60.0)

    References
    ----------
    .. [1] IEC 60364-5-52:2009, Annex G, G.52.1 (drop from the origin).
    """
    need = cumulative_pct - limit_pct
    best: DropFix | None = None
    for cid in chain:
        cable = cables.get(cid)
        if cable is None:
            continue
        for size in sizes_mm2:
            if size <= cable.csa_mm2 + 1e-9:
                continue
            try:
                gain = cable.own_drop_pct - drop_after_resize_pct(cable, size)
            except CableRouteError:
                break
            if gain >= need - 1e-9:
                added = (size - cable.csa_mm2) * cable.parallel * cable.length_m
                fix = DropFix(cid, cable.csa_mm2, size, added, cumulative_pct - gain)
                if best is None or added < best.added_copper_mm2_m - 1e-9:
                    best = fix
                break
    return best


def origin_limit(vd: VoltageDrop) -> tuple[float, str]:
    """The limit of the drop from the origin [%] and where it comes from.

    Examples
    --------
    >>> origin_limit(VoltageDrop(1.0, 0.5, 3.0, 0.0, 0.5, total_limit_percent=5.0,
    ...                          total_limit_source="NFPA 70:2023 215.2(A)(2)"))
    (5.0, 'NFPA 70:2023 215.2(A)(2)')

    The rule set's own total limit when it has one (NEC), else the circuit's
    limit: IEC 60364-5-52:2009 Table G.52.1 gives the limit from the origin.
    """
    if vd.total_limit_percent is not None:
        return vd.total_limit_percent, vd.total_limit_source
    return vd.limit_percent, vd.limit_source or "IEC 60364-5-52:2009 Table G.52.1"


def origin_drop_check(vd: VoltageDrop, feeders: Sequence[tuple[str, float]],
                      cumulative_pct: float) -> Check:
    """The check of the drop from the origin of the installation to the load.

    :math:`u_{origin} = u_{own} + \\sum u_{feeder}` against the limit of
    Table G.52.1 (or the rule set's total limit).  A circuit fed at an origin
    (no feeder upstream in the schedule) is ``not_applicable``: its drop from
    the origin is its own drop, which the ``voltage_drop`` check already holds
    against the same limit, so one cause is counted once.

    Parameters
    ----------
    vd : VoltageDrop
        The circuit's own drop and its limit.
    feeders : sequence of (circuit id, own drop [%])
        The feeders upstream, nearest first (:func:`upstream_chain` without
        the circuit itself); empty when fed at an origin.
    cumulative_pct : float
        The drop from the origin [%] (:func:`chain_drops`).

    Returns
    -------
    Check
        ``voltage_drop_origin``: value the drop from the origin, limit, unit %.

    Examples
    --------
    A lighting circuit (own 2.83 %) fed through a feeder (0.32 %), against
    the 3 % of Table G.52.1 for lighting on a public supply:

    >>> vd = VoltageDrop(6.5, 2.83, 3.0, 0.0, 2.83, limit_source="Table G.52.1")
    >>> c = origin_drop_check(vd, [("F-DB2", 0.32)], 3.15)
    >>> c.result.value, c.value, c.limit
    ('fail', 3.15, 3.0)
    >>> origin_drop_check(vd, [], 2.83).result.value
    'not_applicable'

    References
    ----------
    .. [1] IEC 60364-5-52:2009, 525 and Annex G, G.52.1 and Table G.52.1.
    """
    limit, limit_source = origin_limit(vd)
    if not feeders:
        return Check(ORIGIN_DROP_CHECK, CheckResult.NOT_APPLICABLE, vd.percent, limit, "%", "",
                     "fed at the origin: the drop from the origin is this circuit's own drop "
                     "(check voltage_drop)")
    via = ", ".join(f"{cid} {pct:.2f} %" for cid, pct in feeders)
    passed = cumulative_pct <= limit + 1e-9
    message = "" if passed else (
        f"voltage drop from the origin {cumulative_pct:.2f} % (own {vd.percent:.2f} % plus "
        f"feeders upstream) exceeds the {limit:g} % limit")
    return Check(ORIGIN_DROP_CHECK, passed, cumulative_pct, limit, "%",
                 f"{ORIGIN_DROP_SOURCE}: own {vd.percent:.2f} % + {via}; limit {limit_source}",
                 message)


def origin_drop_not_checked(vd: VoltageDrop | None, why: str) -> Check:
    """The check of the drop from the origin, not made, saying why.

    Examples
    --------
    >>> origin_drop_not_checked(None, "in a supply loop").result.value
    'not_checked'
    """
    limit = 0.0 if vd is None else origin_limit(vd)[0]
    return Check(ORIGIN_DROP_CHECK, CheckResult.NOT_CHECKED, 0.0, limit, "%", ORIGIN_DROP_SOURCE,
                 f"not checked: {why}")


def with_origin_check(result: SizingResult, check: Check) -> SizingResult:
    """``result`` with ``check`` right after its ``voltage_drop`` check (replacing an earlier one).

    Examples
    --------
    >>> r = SizingResult("L-1", "ok", checks=(Check("voltage_drop", True, 1, 3, "%", ""),
    ...                                      Check("short_circuit", True, 1, 2, "mm²", "")))
    >>> c = origin_drop_not_checked(None, "no schedule")
    >>> [x.name for x in with_origin_check(with_origin_check(r, c), c).checks]
    ['voltage_drop', 'voltage_drop_origin', 'short_circuit']
    """
    checks = [c for c in result.checks if c.name != ORIGIN_DROP_CHECK]
    at = next((i + 1 for i, c in enumerate(checks) if c.name == "voltage_drop"), len(checks))
    checks.insert(at, check)
    return replace(result, checks=tuple(checks))
