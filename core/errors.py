"""Errors of cablewright, shared by every stage.

One base class, :class:`CableRouteError`, with specific subclasses; some also
subclass a builtin so callers may catch either.  Messages name the file, layer,
handle or circuit and say what to do.

Every error carries the data its message is built from (``file``, ``row``,
``column``, ``value``, ``source_id``, ``layer``, ``circuit_id``, ``problem``,
``fix``) and an :class:`IssueCode`, so code that handles an error reads its
fields, never its text.  Given as fields, the message is composed from them
(:meth:`CableRouteError.compose`); a message given whole is kept as written,
with whatever fields the raiser adds.
"""

from __future__ import annotations

from dataclasses import dataclass
from enum import Enum
from typing import Any, ClassVar

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


class IssueCode(str, Enum):
    """The codes of recoverable problems found while reading input, and of the errors.

    A ``str`` enum (as ezdxf's ``AuditError`` codes are named constants): a
    code compares equal to its text and is written as its text in the outputs.
    The members from ``ERROR`` on are the kinds of error, one per class of
    :class:`CableRouteError` (its ``default_code``).
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
    # the kinds of error
    ERROR = "error"
    DRAWING_UNUSABLE = "drawing-unusable"
    SCHEDULE_UNUSABLE = "schedule-unusable"
    CONFIG_INVALID = "config-invalid"
    OUTPUT_UNUSABLE = "output-unusable"
    NO_ROUTE = "no-route"
    OUT_OF_RANGE = "out-of-range"
    UNKNOWN_KEY = "unknown-key"
    NO_CABLE_LARGE_ENOUGH = "no-cable-large-enough"
    CIRCUIT_INPUT = "circuit-input"
    SUPPLY_LOOP = "supply-loop"

    def __str__(self) -> str:
        return str(self.value)


class CableRouteError(Exception):
    """Base of every error cablewright raises on purpose.

    Parameters
    ----------
    message : str, optional
        The whole message, kept as written; when not given it is composed from
        the fields by :meth:`compose`.
    file : str or path-like, optional
        The input (drawing, schedule, config) or output folder concerned.
    row : int, optional
        Row of the schedule, as the user counts them (the header is row 1).
    column : str, optional
        Schedule column, config key or option concerned.
    value : object, optional
        The value at fault, as given.
    source_id : str, optional
        DXF handle or IFC GlobalId of the entity concerned.
    layer : str, optional
        Drawing layer concerned.
    circuit_id : str, optional
        The circuit concerned.
    problem : str, optional
        What is wrong: the message without its place and its fix (the whole
        message when that was given whole).
    fix : str, optional
        What to do about it.
    code : IssueCode, optional
        The kind of error; the class's ``default_code`` when not given.

    Examples
    --------
    >>> e = ScheduleError(file="loads.csv", row=4, problem="the circuit cell is blank",
    ...                   fix="give every row a circuit id")
    >>> str(e)
    'loads.csv row 4: the circuit cell is blank; give every row a circuit id'
    >>> e.row, e.code.value
    (4, 'schedule-unusable')
    """

    default_code: ClassVar[IssueCode] = IssueCode.ERROR

    def __init__(
        self,
        message: str | None = None,
        *,
        file: object = None,
        row: int | None = None,
        column: str | None = None,
        value: object = None,
        source_id: str | None = None,
        layer: str | None = None,
        circuit_id: str | None = None,
        problem: str | None = None,
        fix: str | None = None,
        code: IssueCode | None = None,
    ) -> None:
        self.file: str | None = None if file is None else str(file)
        self.row = row
        self.column = column
        self.value = value
        self.source_id = source_id
        self.layer = layer
        self.circuit_id = circuit_id
        self.problem: str = problem if problem is not None else (message or "")
        self.fix = fix
        self.code: IssueCode = code if code is not None else type(self).default_code
        super().__init__(self.compose() if message is None else message)

    def compose(self) -> str:
        """The message from the fields: ``"{file}[ row {row}]: {problem}[; {fix}]"``.

        Without a file, the circuit stands in its place (``"circuit P-1: ..."``).
        """
        where: str | None = None
        if self.file is not None:
            where = self.file if self.row is None else f"{self.file} row {self.row}"
        elif self.row is not None:
            where = f"row {self.row}"
        elif self.circuit_id is not None:
            where = f"circuit {self.circuit_id}"
        text = self.problem if where is None else f"{where}: {self.problem}"
        return f"{text}; {self.fix}" if self.fix else text


class DrawingReadError(CableRouteError):
    """The drawing or model cannot be used at all (exit code 2)."""

    default_code = IssueCode.DRAWING_UNUSABLE


class ScheduleError(CableRouteError):
    """The circuit schedule cannot be used at all (exit code 2)."""

    default_code = IssueCode.SCHEDULE_UNUSABLE


class ConfigError(CableRouteError, ValueError):
    """The configuration file is unreadable or holds an unknown key or bad value.

    ``problems`` holds one line per problem when the settings model found
    several (the message is those lines, one per line).
    """

    default_code = IssueCode.CONFIG_INVALID

    def __init__(self, message: str | None = None, *, problems: tuple[str, ...] = (),
                 **fields: Any) -> None:
        self.problems: tuple[str, ...] = tuple(problems)
        if message is None and self.problems and "problem" not in fields:
            message = "\n".join(self.problems)
        super().__init__(message, **fields)


class OutputError(CableRouteError):
    """The output folder cannot be used: it holds an input, another run holds it, or it cannot be written (exit code 2)."""

    default_code = IssueCode.OUTPUT_UNUSABLE


class NoRouteError(CableRouteError):
    """A circuit cannot be routed: a tag is missing, a tail too long, no path."""

    default_code = IssueCode.NO_ROUTE


class OutOfRangeError(CableRouteError, ValueError):
    """A value lies outside the range of a table or equation; no extrapolation.

    ``value`` (the base's field) is the value, ``limit`` the end of the range it
    passed and ``source`` the table or equation, when the raiser gives them.
    """

    default_code = IssueCode.OUT_OF_RANGE

    def __init__(self, message: str | None = None, *, limit: object = None,
                 source: str | None = None, **fields: Any) -> None:
        self.limit = limit
        self.source = source
        super().__init__(message, **fields)


class UnknownKeyError(CableRouteError, KeyError):
    """An unknown name (method, conductor, insulation, ...); lists what is known.

    ``value`` (the base's field) is the name given, ``known`` the names known.
    """

    default_code = IssueCode.UNKNOWN_KEY

    def __init__(self, message: str | None = None, *, known: tuple[str, ...] = (),
                 **fields: Any) -> None:
        self.known: tuple[str, ...] = tuple(known)
        super().__init__(message, **fields)

    def __str__(self) -> str:  # KeyError would quote the message
        return str(self.args[0]) if self.args else ""


class NoCableLargeEnoughError(CableRouteError):
    """No cross-section and parallel count satisfies the checks."""

    default_code = IssueCode.NO_CABLE_LARGE_ENOUGH


class CircuitInputError(CableRouteError, ValueError):
    """One circuit's input is wrong (power factor, load, unparsable value)."""

    default_code = IssueCode.CIRCUIT_INPUT


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
