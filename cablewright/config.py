"""The settings model: every config section and key typed, validated once at start-up.

The model is derived from the stages' own config dataclasses, field by field,
with their type hints:

=================  ===========================================================
section            fields of
=================  ===========================================================
``[drawing]``      :class:`cablewright.extract.model.DrawingConfig` (all but
                   the ``[routes]`` keys and the ``recover`` switch)
``[routes]``       ``DrawingConfig``: :data:`ROUTES_FIELDS`
``[sizing]``       :class:`cablewright.sizing.config.SizingConfig` (all but
                   the ``[environment]`` keys)
``[environment]``  ``SizingConfig``: :data:`ENVIRONMENT_FIELDS`
``[annotate]``     :class:`cablewright.annotate.drawing.AnnotateConfig`
``[ifc]``          :class:`cablewright.extract.ifc_reader.IfcConfig`
=================  ===========================================================

A field added to one of these dataclasses becomes a valid, typed key of its
section with no change here: the type comes from its hint (``bool``, ``int``,
``float``, ``str``, ``Literal[...]``, ``X | None``, tuples and mappings of
these), the range from :data:`RANGES` or, failing that, from the unit its name
ends with (:data:`SUFFIX_RANGES`; every number must be finite).  Mapping
fields are TOML tables merged into the default; their keys are those of the
default unless the table is open (:data:`OPEN_TABLES`).

Every problem of a file is found in one pass and reported one line each,
naming the file, the section, the key and the nearest known key, or the value
and its allowed range (:class:`ConfigError` holds the lines).
``cablewright/default_config.toml`` documents every key with its default,
unit and source; ``tests/test_settings_model.py`` holds the two together.
"""

from __future__ import annotations

import dataclasses
import difflib
import math
import sys
import types
import typing
from collections.abc import Mapping
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from cablewright.core.errors import ConfigError
from cablewright.extract.model import CONTAINMENTS, UNIT_TO_M, DrawingConfig
from cablewright.sizing.config import SizingConfig

if sys.version_info >= (3, 11):
    import tomllib
else:  # pragma: no cover
    import tomli as tomllib  # type: ignore[import-not-found]  # installed on Python 3.10 only

__all__ = [
    "Settings",
    "load_settings",
    "validate",
    "settings_keys",
    "SettingKey",
    "Range",
    "DEFAULT_CONFIG",
    "ROUTES_FIELDS",
    "ENVIRONMENT_FIELDS",
]

DEFAULT_CONFIG = Path(__file__).with_name("default_config.toml")

#: ``DrawingConfig`` fields set in ``[routes]`` (those of contract.md, and any
#: of them that the dataclass has).
ROUTES_FIELDS = ("slack_fraction", "end_allowance_m", "join_crossings")
#: ``SizingConfig`` fields set in ``[environment]``.
ENVIRONMENT_FIELDS = ("ambient_air_c", "ground_c", "soil_resistivity_k_m_w", "depth_m")
#: Fields that are switches of the command line, not config keys.
_NOT_KEYS = {"drawing": {"recover"}}
#: TOML names that differ from the field name: (section, TOML key) -> field.
_RENAMED = {("drawing", "layer_patterns"): "extra_layer_patterns"}
#: Tables to which a user may add entries of their own (the others take only
#: the keys of their default).
OPEN_TABLES = {("drawing", "route_layers"), ("drawing", "layer_patterns"), ("drawing", "route_tiers"),
               ("sizing", "containment_mm"), ("sizing", "cable_od_mm")}
#: Tables keyed by load type (contract.md, "The circuit schedule", ``load_type``):
#: their entries are checked against these names even when the default is empty.
LOAD_TYPE_TABLES = {("sizing", "vd_limits_pct"), ("sizing", "device_margin_by_load_type"),
                    ("sizing", "third_harmonic_pct_by_load_type")}
LOAD_TYPES = ("general", "lighting", "motor", "feeder")

ABSOLUTE_ZERO_C = -273.15  # ISO 80000-5:2019, item 5-1 (0 K)


@dataclass(frozen=True)
class Range:
    """Allowed values of a number: ``low`` .. ``high``, each bound open or closed.

    Parameters
    ----------
    low, high : float
        Bounds; ``-inf``/``inf`` for none.
    low_open, high_open : bool
        True when the bound itself is not allowed.
    why : str
        The reason or source of the range, shown in the message.
    """

    low: float = -math.inf
    high: float = math.inf
    low_open: bool = False
    high_open: bool = False
    why: str = ""

    def contains(self, value: float) -> bool:
        """Whether ``value`` is finite and within the range."""
        if not math.isfinite(value):
            return False
        above = value > self.low if self.low_open else value >= self.low
        below = value < self.high if self.high_open else value <= self.high
        return above and below

    def describe(self) -> str:
        """The range in words, e.g. ``"> 0 and <= 1"``."""
        parts = []
        if self.low > -math.inf:
            parts.append(f"{'>' if self.low_open else '>='} {self.low:g}")
        if self.high < math.inf:
            parts.append(f"{'<' if self.high_open else '<='} {self.high:g}")
        text = " and ".join(parts) or "a finite number"
        return f"{text} ({self.why})" if self.why else text


def _gt0(why: str, high: float = math.inf) -> Range:
    return Range(0.0, high, low_open=True, why=why)


_FINITE = Range(why="any finite number")
_TEMPERATURE = Range(ABSOLUTE_ZERO_C, low_open=True, why="above absolute zero")

#: Ranges by the unit a field's name ends with, for fields not in :data:`RANGES`.
SUFFIX_RANGES: tuple[tuple[str, Range], ...] = (
    ("_z_m", _FINITE),
    ("_c", _TEMPERATURE),
    ("_pct", Range(0.0, 100.0, why="a percentage")),
    ("_fraction", Range(0.0, 1.0, why="a fraction")),
    ("_k_m_w", _gt0("a thermal resistivity")),
    ("_ohm", Range(0.0, why="an impedance")),
    ("_ka2s", _gt0("a let-through energy")),
    ("_ka", _gt0("a fault current")),
    ("_mm2", _gt0("a cross-section")),
    ("_mm", _gt0("a length")),
    ("_m", Range(0.0, why="a length")),
    ("_a", _gt0("a current")),
    ("_v", _gt0("a voltage")),
    ("_s", _gt0("a time")),
    ("_factor", Range(0.0, why="a factor")),
)

_LV = "IEC 60364-1:2005 clause 11: low voltage, up to 1000 V a.c."

#: Ranges of named keys: (section, key) -> Range (for tables: each value).
RANGES: dict[tuple[str, str], Range] = {
    ("drawing", "snap_tolerance_m"): _gt0(
        "route ends more than 1 m apart are not one joint; a larger tolerance merges separate "
        "routes and changes the grouping (common practice)", 1.0),
    ("drawing", "max_tail_m"): _gt0("a tail from equipment to a route", 1000.0),
    ("drawing", "near_miss_factor"): Range(1.0, 1000.0, why="a multiple of the snap tolerance"),
    ("drawing", "route_tiers"): Range(1.0, 20.0, why="trays or ladders stacked on one route "
                                      "(IEC 60364-5-52:2009 Tables B.52.20/B.52.21 rows)"),
    ("drawing", "tag_text_max_m"): _gt0("a distance", 1000.0),
    ("routes", "slack_fraction"): Range(0.0, 1.0, why="0 to 100 %: the design length is never "
                                                     "shorter than the route"),
    ("routes", "end_allowance_m"): Range(0.0, 1000.0, why="a length added at each end"),
    ("sizing", "device_margin"): Range(1.0, 10.0, why="IEC 60364-4-43:2008 433.1: In >= Ib"),
    ("sizing", "standard_ratings_a"): _gt0("device ratings"),
    ("sizing", "voltage_3ph_v"): _gt0(_LV, 1000.0),
    ("sizing", "voltage_1ph_v"): _gt0(_LV, 1000.0),
    ("sizing", "power_factor"): _gt0("cos phi", 1.0),
    ("sizing", "max_parallel"): Range(1.0, 100.0, why="cables in parallel"),
    ("sizing", "vd_limits_pct"): Range(0.0, 100.0, low_open=True, why="a percentage"),
    ("sizing", "c_max"): Range(1.0, 1.1, why="IEC 60909-0:2016 Table 1, LV: 1.05 or 1.10"),
    ("sizing", "c_min"): Range(0.9, 1.0, why="IEC 60909-0:2016 Table 1, LV: 0.95 or 0.90"),
    ("sizing", "disconnection_voltage_factor"): _gt0("IEC 60364-4-41:2005 411.4.4, c <= 1", 1.0),
    ("sizing", "disconnection_upsize_max_steps"): Range(0.0, 30.0, why="standard sizes"),
    ("sizing", "motor_start_dip_pct"): Range(0.0, 100.0, low_open=True, why="a percentage"),
    ("sizing", "starters"): _gt0("starting current multiple and starting cos phi"),
    ("environment", "depth_m"): _gt0("depth of laying", 100.0),
    ("environment", "soil_resistivity_k_m_w"): _gt0("a thermal resistivity"),
    ("annotate", "text_height_m"): _gt0("a text height"),
    ("annotate", "min_text_height_m"): _gt0("a text height"),
    ("annotate", "max_text_height_m"): _gt0("a text height"),
    ("annotate", "sheet_mm"): _gt0("sheet width and height"),
    ("annotate", "colors"): Range(0.0, 256.0, why="a DXF colour index (ACI): 0 to 256"),
    ("annotate", "schedule_rows_per_panel"): Range(1.0, 10000.0, why="rows"),
    ("annotate", "ids_per_line"): Range(1.0, 1000.0, why="circuit ids"),
    ("annotate", "group_tag_max_ids"): Range(0.0, 10000.0, why="circuit ids"),
    ("annotate", "symbol_max_text_heights"): _gt0("text heights"),
    ("annotate", "crowd_fraction"): _gt0("a share of the extents", 1.0),
    ("ifc", "below_ground_z_m"): _FINITE,
}

_KIND = ("containment", CONTAINMENTS)
#: Choices of string keys (a ``Literal`` hint gives them too); matched
#: case-insensitively and written as listed.
CHOICES: dict[tuple[str, str], tuple[str, ...]] = {
    ("drawing", "units"): tuple(UNIT_TO_M),
    ("sizing", "device_kind"): ("breaker", "fuse"),
    ("sizing", "conductor_temp_for_vd"): ("max", "operating"),
    ("sizing", "pe_rule"): ("table", "adiabatic"),
    ("sizing", "earthing"): ("TN", "TN-S", "TN-C", "TN-C-S", "TT", "IT"),
    ("sizing", "breaker_curve"): ("B", "C", "D"),
    ("sizing", "standard"): ("iec", "nec"),
}
#: Rule sets of ``[sizing] standard`` that are not written yet.
UNAVAILABLE_STANDARDS: tuple[str, ...] = ()  # rule sets named in the contract but not written
#: Pairs ``[containment, method]``: tables and fields whose value is one.
_KIND_KEYS = {("drawing", "route_layers"), ("drawing", "layer_patterns")}


def _methods() -> tuple[str, ...]:
    from cablewright.sizing.capacity_tables import METHODS

    return METHODS


@dataclass(frozen=True)
class SettingKey:
    """One key of the settings model.

    Attributes
    ----------
    section, name : str
        Where it is written: ``[section] name``.
    target : str
        Which config object it sets: ``drawing``, ``sizing``, ``annotate`` or ``ifc``.
    field : str
        The dataclass field.
    hint : Any
        The field's type hint.
    default : Any
        The field's default.
    """

    section: str
    name: str
    target: str
    field: str
    hint: Any
    default: Any

    @property
    def is_table(self) -> bool:
        """Whether the key is a TOML table (a mapping field)."""
        return _origin(_strip_optional(self.hint)) in (dict, Mapping)

    @property
    def where(self) -> str:
        """``[section] name``."""
        return f"[{self.section}] {self.name}"


def _targets() -> dict[str, type]:
    from cablewright.annotate.drawing import AnnotateConfig
    from cablewright.extract.ifc_reader import IfcConfig

    return {"drawing": DrawingConfig, "sizing": SizingConfig, "annotate": AnnotateConfig,
            "ifc": IfcConfig}


def _default(f: dataclasses.Field) -> Any:
    if f.default is not dataclasses.MISSING:
        return f.default
    if f.default_factory is not dataclasses.MISSING:
        return f.default_factory()
    return None


def settings_keys() -> dict[str, dict[str, SettingKey]]:
    """Every section and its keys, derived from the stages' config dataclasses.

    Returns
    -------
    dict
        Section name -> TOML key -> :class:`SettingKey`, in field order.
    """
    sections: dict[str, dict[str, SettingKey]] = {
        s: {} for s in ("drawing", "routes", "sizing", "environment", "annotate", "ifc")}
    renamed_back = {(s, f): k for (s, k), f in _RENAMED.items()}
    for target, cls in _targets().items():
        hints = typing.get_type_hints(cls)
        for f in dataclasses.fields(cls):
            if f.name.startswith("_") or f.name in _NOT_KEYS.get(target, ()):
                continue
            section = target
            if target == "drawing" and f.name in ROUTES_FIELDS:
                section = "routes"
            elif target == "sizing" and f.name in ENVIRONMENT_FIELDS:
                section = "environment"
            name = renamed_back.get((section, f.name), f.name)
            sections[section][name] = SettingKey(section, name, target, f.name, hints[f.name],
                                                 _default(f))
    return sections


# ------------------------------------------------------------------ types
def _origin(hint: Any) -> Any:
    origin = typing.get_origin(hint)
    if origin is None:
        return None
    if origin is Mapping or origin is dict or origin is typing.Mapping:
        return Mapping if origin is not dict else dict
    return origin


def _is_union(hint: Any) -> bool:
    return typing.get_origin(hint) in (typing.Union, types.UnionType)


def _strip_optional(hint: Any) -> Any:
    if _is_union(hint):
        args = [a for a in typing.get_args(hint) if a is not type(None)]
        if len(args) == 1:
            return args[0]
    return hint


class _Bad(Exception):
    """One problem with one value: what it must be."""


def _type_name(hint: Any) -> str:
    hint = _strip_optional(hint)
    if hint is bool:
        return "true or false"
    if hint is int:
        return "a whole number"
    if hint is float:
        return "a number"
    if hint is str:
        return "a text in quotes"
    origin = _origin(hint)
    if origin is tuple:
        args = typing.get_args(hint)
        if len(args) == 2 and args[1] is Ellipsis:
            return f"a list of {_plural(args[0])}"
        return f"a list of {len(args)} values ({', '.join(_type_name(a) for a in args)})"
    if origin in (dict, Mapping):
        return "a table"
    if typing.get_origin(hint) is typing.Literal:
        return "one of " + ", ".join(map(str, typing.get_args(hint)))
    return str(hint)


def _plural(hint: Any) -> str:
    return {float: "numbers", int: "whole numbers", str: "texts", bool: "true/false"}.get(
        hint, _type_name(hint))


def _convert(value: Any, hint: Any, rng: Range | None, choices: tuple[str, ...] | None) -> Any:
    """``value`` read from TOML as the type ``hint`` says, checked against range and choices."""
    hint = _strip_optional(hint)
    if hint is Any:
        return value
    if hint is bool:
        if not isinstance(value, bool):
            raise _Bad(f"must be {_type_name(hint)}")
        return value
    if hint in (int, float):
        if isinstance(value, bool) or not isinstance(value, (int, float)):
            raise _Bad(f"must be {_type_name(hint)}")
        if hint is int and (isinstance(value, float) and not value.is_integer()):
            raise _Bad(f"must be {_type_name(hint)}")
        if not math.isfinite(float(value)):
            raise _Bad(f"must be a finite number{_allowed(rng)}")
        number = int(value) if hint is int else float(value)
        if rng is not None and not rng.contains(float(number)):
            raise _Bad(f"out of range: allowed {rng.describe()}")
        return number
    if hint is str:
        if not isinstance(value, str):
            raise _Bad(f"must be {_type_name(hint)}")
        if choices:
            for choice in choices:
                if value.strip().lower() == choice.lower():
                    return choice
            raise _Bad(f"is not a known choice: use one of {', '.join(choices)}")
        return value
    if typing.get_origin(hint) is typing.Literal:
        allowed = tuple(str(a) for a in typing.get_args(hint))
        return _convert(value, str, None, allowed)
    origin = _origin(hint)
    if origin is tuple:
        args = typing.get_args(hint)
        if not isinstance(value, list):
            raise _Bad(f"must be {_type_name(hint)}")
        if len(args) == 2 and args[1] is Ellipsis:
            if not value:
                raise _Bad(f"must be a non-empty list of {_plural(args[0])}")
            return tuple(_convert(v, args[0], rng, choices) for v in value)
        if len(value) != len(args):
            raise _Bad(f"must be {_type_name(hint)}")
        return tuple(_convert(v, a, rng, choices) for v, a in zip(value, args, strict=True))
    if _is_union(hint):  # e.g. int | str: the first that fits
        problems = []
        for arg in typing.get_args(hint):
            if arg is type(None):
                continue
            try:
                return _convert(value, arg, rng, choices)
            except _Bad as bad:
                problems.append(str(bad))
        raise _Bad(" or ".join(problems))
    return value  # a hint of a kind the model does not know: the dataclass gets the TOML value


def _allowed(rng: Range | None) -> str:
    return f": allowed {rng.describe()}" if rng is not None else ""


def _range_for(key: SettingKey) -> Range | None:
    exact = RANGES.get((key.section, key.name))
    if exact is not None:
        return exact
    for suffix, rng in SUFFIX_RANGES:
        if key.name.endswith(suffix):
            return rng
    return _FINITE


def _nearest(name: str, known: list[str]) -> str:
    if not known:
        return ""
    close = difflib.get_close_matches(name, known, n=1, cutoff=0.0)
    if not close:
        close = [min(known)]
    return close[0]


# ------------------------------------------------------------------ settings
@dataclass(frozen=True)
class Settings:
    """All settings, typed: one config object per stage.

    Attributes
    ----------
    drawing : DrawingConfig
        ``[drawing]`` and ``[routes]``.
    sizing : SizingConfig
        ``[sizing]`` and ``[environment]``.
    annotate : AnnotateConfig
        ``[annotate]``.
    ifc : IfcConfig
        ``[ifc]``.
    source : str
        The file read, or ``"defaults"``.
    """

    drawing: Any = field(default_factory=DrawingConfig)
    sizing: SizingConfig = field(default_factory=SizingConfig)
    annotate: Any = None
    ifc: Any = None
    source: str = "defaults"

    def __post_init__(self) -> None:
        targets = _targets()
        if self.annotate is None:
            object.__setattr__(self, "annotate", targets["annotate"]())
        if self.ifc is None:
            object.__setattr__(self, "ifc", targets["ifc"]())


def _read_toml(path: Path) -> dict[str, Any]:
    try:
        return tomllib.loads(path.read_text(encoding="utf-8"))
    except OSError as exc:
        raise ConfigError(file=path, problem=f'cannot read the config file ({exc.strerror})',
                          fix="check the --config path") from exc
    except (tomllib.TOMLDecodeError, UnicodeDecodeError) as exc:
        raise ConfigError(file=path, problem=f"not valid TOML ({exc})", fix="fix the file") from exc


def load_settings(path: str | Path | None = None) -> Settings:
    """Read and validate a TOML config; keys left out keep their defaults.

    Every problem of the file is collected and reported at once, one line each.

    Parameters
    ----------
    path : str or Path, optional
        The config file; ``None`` gives the defaults.

    Returns
    -------
    Settings

    Raises
    ------
    ConfigError
        Unreadable file, bad TOML, unknown section or key (with the nearest
        known one), value of the wrong type or out of its range, or a rule set
        not available yet; ``ConfigError.problems`` holds the lines.

    Examples
    --------
    >>> load_settings().sizing.power_factor
    0.85
    """
    if path is None:
        return Settings()
    path = Path(path)
    data = _read_toml(path)
    values, problems = validate(data, str(path))
    if problems:
        raise ConfigError(problems=tuple(problems), file=path)
    targets = _targets()
    objects = {}
    for target, cls in targets.items():
        try:
            objects[target] = cls(**values[target])
        except (TypeError, ValueError) as exc:  # a dataclass's own __post_init__ check
            raise ConfigError(file=path, problem=f"[{target}] {exc}") from exc
    return Settings(objects["drawing"], objects["sizing"], objects["annotate"], objects["ifc"],
                    str(path))


def validate(data: Mapping[str, Any], source: str) -> tuple[dict[str, dict[str, Any]], list[str]]:
    """Check parsed TOML against the model.

    Parameters
    ----------
    data : mapping
        The parsed file.
    source : str
        The file name, for the messages.

    Returns
    -------
    (values, problems)
        ``values``: target -> field -> converted value (only the keys given);
        ``problems``: one line per problem.
    """
    model = settings_keys()
    values: dict[str, dict[str, Any]] = {t: {} for t in _targets()}
    problems: list[str] = []
    owner = {name: sec for sec, keys in model.items() for name in keys}
    for section, table in data.items():
        if section not in model:
            problems.append(f"{source}: unknown section [{section}] (nearest known: "
                            f"[{_nearest(section, list(model))}]); see cablewright/default_config.toml")
            continue
        if not isinstance(table, dict):
            problems.append(f"{source}: {section} must be a section [{section}], not a value")
            continue
        keys = model[section]
        for name, value in table.items():
            key = keys.get(name)
            if key is None:
                home = owner.get(name)
                hint = (f"it belongs in [{home}]" if home else
                        f"nearest known: {_nearest(name, list(keys))}")
                problems.append(f"{source}: [{section}] {name}: unknown key ({hint}); "
                                "see cablewright/default_config.toml")
                continue
            try:
                values[key.target][key.field] = _value(key, value, source, problems)
            except _Bad as bad:
                problems.append(f"{source}: [{section}] {name} = {_show(value)}: {bad}")
    _check_dependent(values, source, problems)
    return values, problems


def _show(value: Any) -> str:
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, str):
        return f'"{value}"'
    if isinstance(value, dict):
        return "{...}"
    return repr(value)


def _value(key: SettingKey, value: Any, source: str, problems: list[str]) -> Any:
    rng = _range_for(key)
    choices = CHOICES.get((key.section, key.name))
    if not key.is_table:
        if key.section == "ifc" and key.name.endswith("_kind"):
            return _kind(value)
        if value == [] and key.default == ():  # a list that is empty by default may be given empty
            return ()
        return _convert(value, key.hint, rng, choices)
    if not isinstance(value, dict):
        raise _Bad("must be a table")
    hint = _strip_optional(key.hint)
    value_hint = typing.get_args(hint)[1] if typing.get_args(hint) else Any
    default = dict(key.default or {})
    merged = dict(default)
    allowed = list(LOAD_TYPES) if (key.section, key.name) in LOAD_TYPE_TABLES else list(default)
    open_table = (key.section, key.name) in OPEN_TABLES or not allowed
    for entry, item in value.items():
        where = f"[{key.section}.{key.name}] {entry}"
        if not open_table and entry not in allowed:
            problems.append(f"{source}: {where}: unknown key (nearest known: "
                            f"{_nearest(entry, allowed)}); see cablewright/default_config.toml")
            continue
        try:
            if (key.section, key.name) in _KIND_KEYS:
                merged[entry.upper() if key.name == "route_layers" else entry] = _kind(item)
            else:
                merged[entry] = _convert(item, value_hint, rng, None)
        except _Bad as bad:
            problems.append(f"{source}: {where} = {_show(item)}: {bad}")
    return merged


def _kind(value: Any) -> tuple[str, str]:
    """A ``[containment, method]`` pair (contract.md, "Drawing conventions")."""
    methods = _methods()
    if not (isinstance(value, list) and len(value) == 2 and all(isinstance(v, str) for v in value)):
        raise _Bad(f"must be [containment, method], e.g. [\"tray\", \"E\"]; containment one of "
                   f"{', '.join(CONTAINMENTS)}")
    containment, method = value[0].strip().lower(), value[1].strip().upper()
    if containment not in CONTAINMENTS:
        raise _Bad(f"containment {value[0]!r} is unknown: use one of {', '.join(CONTAINMENTS)}")
    by_upper = {m.upper(): m for m in methods}
    if method not in by_upper:
        raise _Bad(f"method {value[1]!r} is unknown: use one of {', '.join(methods)} "
                   "(IEC 60364-5-52:2009 Table B.52.1)")
    return containment, by_upper[method]


def _check_dependent(values: dict[str, dict[str, Any]], source: str, problems: list[str]) -> None:
    """Checks that read two keys, or a key and a table."""
    sizing = values["sizing"]
    standard = sizing.get("standard")
    if standard in UNAVAILABLE_STANDARDS:
        problems.append(f"{source}: [sizing] standard = \"{standard}\": the {standard.upper()} "
                        "rule set is not available yet; use \"iec\"")
    starters = sizing.get("starters", SizingConfig().starters)
    starter = sizing.get("default_starter")
    if starter is not None and starter not in starters:
        problems.append(f"{source}: [sizing] default_starter = \"{starter}\": not a starter of "
                        f"[sizing.starters]: use one of {', '.join(starters)}")
    for name, pair in (sizing.get("starters") or {}).items():
        if len(pair) == 2 and not pair[1] <= 1.0:
            problems.append(f"{source}: [sizing.starters] {name} = {list(pair)}: the starting "
                            "cos phi must be > 0 and <= 1")
    low = values["annotate"].get("min_text_height_m")
    high = values["annotate"].get("max_text_height_m")
    if low is not None and high is not None and low > high:
        problems.append(f"{source}: [annotate] min_text_height_m = {low:g} is above "
                        f"max_text_height_m = {high:g}")
