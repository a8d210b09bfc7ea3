"""Errors of cablewright, shared by every stage.

One base class, :class:`CableRouteError`, with specific subclasses; some also
subclass a builtin so callers may catch either.  Messages name the file, layer,
handle or circuit and say what to do.
"""

from __future__ import annotations

from dataclasses import dataclass

__all__ = [
    "CableRouteError",
    "DrawingReadError",
    "ScheduleError",
    "ConfigError",
    "NoRouteError",
    "OutOfRangeError",
    "UnknownKeyError",
    "NoCableLargeEnoughError",
    "CircuitInputError",
    "OutputError",
    "Issue",
]


class CableRouteError(Exception):
    """Base of every error cablewright raises on purpose."""


class DrawingReadError(CableRouteError):
    """The drawing or model cannot be used at all (exit code 2)."""


class ScheduleError(CableRouteError):
    """The circuit schedule cannot be used at all (exit code 2)."""


class ConfigError(CableRouteError, ValueError):
    """The configuration file is unreadable or holds an unknown key or bad value."""


class OutputError(CableRouteError):
    """The output folder cannot be used: it holds an input, another run holds it, or it cannot be written (exit code 2)."""


class NoRouteError(CableRouteError):
    """A circuit cannot be routed: a tag is missing, a tail too long, no path."""


class OutOfRangeError(CableRouteError, ValueError):
    """A value lies outside the range of a table or equation; no extrapolation."""


class UnknownKeyError(CableRouteError, KeyError):
    """An unknown name (method, conductor, insulation, ...); lists what is known."""

    def __str__(self) -> str:  # KeyError would quote the message
        return str(self.args[0]) if self.args else ""


class NoCableLargeEnoughError(CableRouteError):
    """No cross-section and parallel count satisfies the checks."""


class CircuitInputError(CableRouteError, ValueError):
    """One circuit's input is wrong (power factor, load, unparsable value)."""


@dataclass(frozen=True)
class Issue:
    """A recoverable problem found while reading input.

    Attributes
    ----------
    code : str
        Short machine-readable code, e.g. ``"near-miss"``.
    message : str
        One line for the user, naming the entity and what to do.
    source_id : str
        DXF handle or IFC GlobalId of the entity concerned ("" if none).
    """

    code: str
    message: str
    source_id: str = ""
