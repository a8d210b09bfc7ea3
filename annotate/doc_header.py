"""The ``header`` object of ``schedule.json``: what the results were made from and with.

``{"tool": {...}, "input": {...}, "config": {...}, "date": ..., "standards": [...]}``:
the tool and its version, the input drawing with the SHA-256 of its bytes, the
config file with its hash and a hash of the settings in force (defaults
included), the date, and the standard editions the results cite.

The date is ``None`` unless ``SOURCE_DATE_EPOCH`` is set (then that instant, UTC,
ISO 8601), so that two runs on the same input give byte-identical files; the
input's hash already tells which drawing the results belong to.

References
----------
.. [1] FIPS 180-4, Secure Hash Standard (SHA-256).
.. [2] Reproducible Builds, "SOURCE_DATE_EPOCH" specification (the environment variable).
"""

from __future__ import annotations

import hashlib
import json
import os
import re
from collections.abc import Iterable, Mapping
from datetime import datetime, timezone
from pathlib import Path
from typing import Any

from .model import CircuitOutcome
from .takeoff import input_info, tool_info

__all__ = ["document_header", "standards_cited", "settings_sha256"]

#: A standard with its edition as the sources write it, e.g. "IEC 60364-5-52:2009".
_EDITION_RE = re.compile(r"\b(IEC|ISO|EN|IEEE) ?(\d{3,5}(?:-\d+)*):(\d{4})\b")


def standards_cited(outcomes: Iterable[CircuitOutcome]) -> list[str]:
    """Every standard edition named in the factors' and checks' sources, sorted."""
    found: set[str] = set()
    for o in outcomes:
        s = o.sizing
        if s is None:
            continue
        texts = [f.source for f in s.factors] + [c.source for c in s.checks]
        texts += [getattr(s, "capacity_table", ""), getattr(s, "device_source", "")]
        for text in texts:
            for body, number, year in _EDITION_RE.findall(text or ""):
                found.add(f"{body} {number}:{year}")
    return sorted(found)


def settings_sha256(values: Mapping[str, Any]) -> str:
    """SHA-256 of the settings in force, written as canonical JSON (sorted keys)."""
    text = json.dumps(values, sort_keys=True, separators=(",", ":"), default=str, ensure_ascii=False)
    return hashlib.sha256(text.encode("utf-8")).hexdigest()


def _file_sha256(path: Path) -> str | None:
    try:
        return hashlib.sha256(path.read_bytes()).hexdigest()
    except OSError:
        return None


def _date() -> str | None:
    epoch = os.environ.get("SOURCE_DATE_EPOCH", "").strip()
    if not epoch.isdigit():
        return None
    return datetime.fromtimestamp(int(epoch), tz=timezone.utc).strftime("%Y-%m-%dT%H:%M:%SZ")


def document_header(outcomes: Iterable[CircuitOutcome], drawing: str | os.PathLike[str],
                    config_file: str | os.PathLike[str] | None,
                    settings: Mapping[str, Any]) -> dict[str, Any]:
    """The ``header`` object (see the module docstring).

    Parameters
    ----------
    outcomes : iterable of CircuitOutcome
        The circuits; their sources name the standard editions.
    drawing : path-like
        The input drawing or model.
    config_file : path-like or None
        The config file given, ``None`` for the built-in defaults.
    settings : mapping
        The settings in force (every section, defaults filled in), hashed.
    """
    config: dict[str, Any] = {"file": None, "sha256": None, "settings_sha256": settings_sha256(settings)}
    if config_file is not None:
        path = Path(config_file)
        config.update(file=path.name, sha256=_file_sha256(path))
    return {
        "tool": tool_info(),
        "input": input_info(drawing),
        "config": config,
        "date": _date(),
        "standards": standards_cited(outcomes),
    }
