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

from collections.abc import Mapping

from cablewright.extract.errors import CableRouteError

__all__ = ["SupplyCycleError", "cumulative_drop_percent", "exceeding_limit"]


class SupplyCycleError(CableRouteError, ValueError):
    """The circuits feed each other in a loop; the message names them."""


def cumulative_drop_percent(
    own_drop_pct: Mapping[str, float],
    source_of: Mapping[str, str],
    feeder_of: Mapping[str, str],
) -> dict[str, float]:
    """Voltage drop from the origin of the installation to each circuit's load.

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
        When feeders form a loop; names the circuits of the loop.

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
    result: dict[str, float] = {}

    def total(circuit: str, path: list[str]) -> float:
        if circuit in result:
            return result[circuit]
        if circuit in path:
            loop = path[path.index(circuit):] + [circuit]
            raise SupplyCycleError(
                "circuits feed each other in a loop: " + " -> ".join(loop)
                + "; check the 'from' and 'to' tags of these circuits in the schedule")
        feeder = feeder_of.get(source_of.get(circuit, ""))
        upstream = 0.0
        if feeder is not None:
            upstream = total(feeder, path + [circuit])
        result[circuit] = float(own_drop_pct.get(circuit, 0.0)) + upstream
        return result[circuit]

    for cid in own_drop_pct:
        total(cid, [])
    return {cid: result[cid] for cid in own_drop_pct}


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
