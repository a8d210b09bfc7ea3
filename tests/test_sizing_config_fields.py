"""Every SizingConfig field is documented and read somewhere (issue 15).

A field that is documented but read nowhere promises a setting that does
nothing (``conductor_temp_for_vd`` was such a field).  The library is scanned
with :mod:`ast` for reads of the config object: ``config.<field>`` /
``cfg.<field>`` / ``settings.sizing.<field>``, ``self.<field>`` inside the
SizingConfig class, and ``getattr(config, "<field>")`` / ``_cfg(config, "<field>", ...)``.
"""

from __future__ import annotations

import ast
import dataclasses
import re
from pathlib import Path

import pytest
from cablewright.sizing.config import SizingConfig

ROOT = Path(__file__).resolve().parents[1]
PACKAGES = ("sizing", "cablewright", "extract", "annotate")
CONFIG_NAMES = {"config", "cfg", "sizing_config"}
FIELDS = [f.name for f in dataclasses.fields(SizingConfig)]

#: The fields of the capacity, grouping, voltage-drop and harmonics side, listed with
#: unit and source in cablewright/default_config.toml.
DOCUMENTED_IN_TOML = (
    "device_kind", "device_margin", "device_margin_by_load_type", "voltage_3ph_v",
    "voltage_1ph_v", "power_factor", "max_parallel", "standard_ratings_a", "vd_limits_pct",
    "min_csa_mm2", "conductor_temp_for_vd", "supply", "vd_long_run_allowance",
    "third_harmonic_pct_by_load_type", "harmonics_envelope", "ignore_lightly_loaded",
    "ambient_air_c", "ground_c", "soil_resistivity_k_m_w", "depth_m",
)


def _is_config(node: ast.AST, in_config_class: bool) -> bool:
    if isinstance(node, ast.Name):
        return node.id in CONFIG_NAMES or (in_config_class and node.id == "self")
    return isinstance(node, ast.Attribute) and node.attr == "sizing"


def _reads() -> set[str]:
    found: set[str] = set()
    for package in PACKAGES:
        for path in (ROOT / package).rglob("*.py"):
            tree = ast.parse(path.read_text(encoding="utf-8"))
            classes = [n for n in ast.walk(tree)
                       if isinstance(n, ast.ClassDef) and n.name == "SizingConfig"]
            inside = {id(n) for c in classes for n in ast.walk(c)}
            for node in ast.walk(tree):
                if isinstance(node, ast.Attribute) and isinstance(node.ctx, ast.Load):
                    if _is_config(node.value, id(node) in inside):
                        found.add(node.attr)
                elif (isinstance(node, ast.Call) and len(node.args) >= 2
                      and isinstance(node.args[1], ast.Constant)
                      and isinstance(node.args[1].value, str)
                      and _is_config(node.args[0], False)):
                    found.add(node.args[1].value)
    return found


READS = _reads()


@pytest.mark.parametrize("name", FIELDS)
def test_every_field_is_read(name):
    assert name in READS, f"SizingConfig.{name} is documented but read nowhere"


@pytest.mark.parametrize("name", FIELDS)
def test_every_field_is_documented(name):
    assert re.search(rf"\b{name}\b", SizingConfig.__doc__ or ""), name


@pytest.mark.parametrize("name", DOCUMENTED_IN_TOML)
def test_field_is_in_the_default_config(name):
    toml = (ROOT / "cablewright" / "default_config.toml").read_text(encoding="utf-8")
    assert re.search(rf"^\s*#?\s*\[?(sizing\.)?{name}\b", toml, re.M), name


def test_the_scan_finds_an_unread_field():
    # the scan itself must be able to fail: a name nobody reads is not found
    assert "no_such_setting_anywhere" not in READS
