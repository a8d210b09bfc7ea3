"""Errors of cablewright, shared by every stage.

One base class, :class:`CableRouteError`, with specific subclasses; some also
subclass a builtin so callers may catch either.  Messages name the file, layer,
handle or circuit and say what to do.
"""

from __future__ import annotations

from dataclasses import dataclass
from enum import Enum

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
    "IssueCode",
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


class IssueCode(str, Enum):
    """The codes of recoverable problems found while reading input.

    A ``str`` enum (as ezdxf's ``AuditError`` codes are named constants): a
    code compares equal to its text and is written as its text in the outputs.
    """

    RECOVERED = "recovered"
    RECOVER_LOST = "recover-lost"
    RECOVER_FIXED = "recover-fixed"
    UNSUPPORTED_ENTITY = "unsupported-entity"
    UNREADABLE_ENTITY = "unreadable-entity"
    BLOCK_RECURSION = "block-recursion"
    MISSING_BLOCK = "missing-block"
    TAGS_FROM_TEXT = "tags-from-text"
    TAGS_FROM_TEXT_OFF = "tags-from-text-off"
    SCHEDULE_POSITION = "schedule-position"
    BAD_COORDINATE = "bad-coordinate"
    BAD_OVERRIDE = "bad-override"
    NO_PORTS = "no-ports"
    GEOMETRY = "geometry"
    NO_GEOMETRY = "no-geometry"
    CARRIER_TYPE = "carrier-type"
    UNITS_IMPLAUSIBLE = "units-implausible"
    UNITS_OVERRIDE = "units-override"
    ISOLATED = "isolated"
    NEAR_MISS = "near-miss"
    ZERO_LENGTH = "zero-length"
    DUPLICATE_TAG = "duplicate-tag"
    CROSSING = "crossing"
    ESTIMATED_ROUTES = "estimated-routes"

    def __str__(self) -> str:
        return str(self.value)


@dataclass(frozen=True)
class Issue:
    """A recoverable problem found while reading input.

    Attributes
    ----------
    code : IssueCode
        Short machine-readable code, e.g. ``IssueCode.NEAR_MISS`` (``"near-miss"``);
        the text of a code is accepted and turned into the enum member.
    message : str
        One line for the user, naming the entity and what to do.
    source_id : str
        DXF handle or IFC GlobalId of the entity concerned ("" if none).
    """

    code: IssueCode
    message: str
    source_id: str = ""

    def __post_init__(self) -> None:
        if not isinstance(self.code, IssueCode):
            try:
                object.__setattr__(self, "code", IssueCode(self.code))
            except ValueError:
                raise ValueError(f"unknown issue code {self.code!r}: add it to "
                                 "cablewright.core.errors.IssueCode") from None
