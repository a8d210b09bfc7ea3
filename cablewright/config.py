"""Read the TOML configuration into each stage's config dataclass."""

from __future__ import annotations

import dataclasses
import difflib
import sys
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from cablewright.extract.errors import ConfigError
from cablewright.sizing.config import SizingConfig

if sys.version_info >= (3, 11):
    import tomllib
else:  # pragma: no cover
    import tomli as tomllib

__all__ = ["Settings", "load_settings"]

DEFAULT_CONFIG = Path(__file__).with_name("default_config.toml")


@dataclass
class Settings:
    """All settings: raw sections for extract/annotate, and the sizing config."""

    drawing: dict[str, Any] = field(default_factory=dict)
    routes: dict[str, Any] = field(default_factory=dict)
    sizing: SizingConfig = field(default_factory=SizingConfig)
    annotate: dict[str, Any] = field(default_factory=dict)
    ifc: dict[str, Any] = field(default_factory=dict)
    source: str = "defaults"


_SIZING_KEYS = {f.name for f in dataclasses.fields(SizingConfig)}
_ENV_KEYS = {"ambient_air_c", "ground_c", "soil_resistivity_k_m_w", "depth_m"}
_SECTIONS = {"drawing", "routes", "sizing", "environment", "annotate", "ifc"}


_DEFAULTS = {f.name: getattr(SizingConfig(), f.name) for f in dataclasses.fields(SizingConfig)}


def _check_type(path: Path, key: str, value: Any, default: Any) -> None:
    """A value must have the type of its default (numbers may be int or float)."""
    if default is None or isinstance(default, (dict, tuple)):
        if isinstance(value, str) and default is None and key not in ("earthing", "breaker_curve",
                                                                       "default_starter", "pe_rule"):
            raise ConfigError(f"{path}: {key} = {value!r} must be a number; see cablewright/default_config.toml")
        return
    if isinstance(default, bool):
        ok = isinstance(value, bool)
    elif isinstance(default, (int, float)):
        ok = isinstance(value, (int, float)) and not isinstance(value, bool)
    else:
        ok = isinstance(value, type(default))
    if not ok:
        raise ConfigError(
            f"{path}: {key} = {value!r} must be a {type(default).__name__}; "
            "see cablewright/default_config.toml"
        )


def _unknown(kind: str, key: str, known, path: str) -> ConfigError:
    close = difflib.get_close_matches(key, list(known), n=3)
    hint = f" (did you mean {', '.join(close)}?)" if close else ""
    return ConfigError(f"{path}: unknown {kind} {key!r}{hint}; see cablewright/default_config.toml")


def load_settings(path: str | Path | None = None) -> Settings:
    """Read a TOML config; keys left out keep their defaults.

    Raises
    ------
    ConfigError
        Unreadable file, bad TOML, unknown section or key, wrong value type.
    """
    settings = Settings()
    if path is None:
        return settings
    path = Path(path)
    try:
        data = tomllib.loads(path.read_text(encoding="utf-8"))
    except OSError as exc:
        raise ConfigError(f"{path}: cannot read the config file ({exc.strerror})") from exc
    except (tomllib.TOMLDecodeError, UnicodeDecodeError) as exc:
        raise ConfigError(f"{path}: not valid TOML ({exc}); fix the file") from exc
    for section in data:
        if section not in _SECTIONS:
            raise _unknown("section", section, _SECTIONS, str(path))
    sizing_values: dict[str, Any] = {}
    for key, value in data.get("sizing", {}).items():
        if key not in _SIZING_KEYS:
            raise _unknown("key in [sizing]", key, _SIZING_KEYS, str(path))
        sizing_values[key] = value
    for key, value in data.get("environment", {}).items():
        if key not in _ENV_KEYS:
            raise _unknown("key in [environment]", key, _ENV_KEYS, str(path))
        sizing_values[key] = value
    if "standard_ratings_a" in sizing_values:
        sizing_values["standard_ratings_a"] = tuple(sorted(float(v) for v in sizing_values["standard_ratings_a"]))
    for key in ("vd_limits_pct", "min_csa_mm2"):
        if key in sizing_values:
            merged = dict(getattr(SizingConfig(), key))
            merged.update({k: float(v) for k, v in sizing_values[key].items()})
            sizing_values[key] = merged
    for key, value in sizing_values.items():
        _check_type(path, key, value, _DEFAULTS.get(key))
    try:
        settings.sizing = SizingConfig(**sizing_values)
    except TypeError as exc:
        raise ConfigError(f"{path}: {exc}") from exc
    if settings.sizing.device_kind not in ("breaker", "fuse"):
        raise ConfigError(f"{path}: [sizing] device_kind must be 'breaker' or 'fuse'")
    if settings.sizing.standard not in ("iec", "nec"):
        raise ConfigError(f"{path}: [sizing] standard must be 'iec' or 'nec'")
    settings.drawing = dict(data.get("drawing", {}))
    settings.routes = dict(data.get("routes", {}))
    settings.annotate = dict(data.get("annotate", {}))
    settings.ifc = dict(data.get("ifc", {}))
    settings.source = str(path)
    return settings
