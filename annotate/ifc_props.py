"""Typed property values and the standard cable property sets for the sized IFC copy.

:mod:`.ifc_writer` writes our property sets with plain values; :func:`type_properties`
then gives each value its IFC measure type and, where the name carries a unit,
that unit on the property itself (``IfcPropertySingleValue.Unit``), so a reader
never has to guess it from the name and the value does not depend on the
project's length unit:

==========================  =============================  ===================
property name ends with     measure type                   unit on the property
==========================  =============================  ===================
``_mm2``                    IfcAreaMeasure                 mm² (SI, MILLI SQUARE_METRE)
``_m``                      IfcPositiveLengthMeasure       m
``_A``                      IfcElectricCurrentMeasure      A
``_pct``, factors           IfcReal, IfcPositiveRatioMeasure
text                        IfcLabel (IfcText for Messages)
==========================  =============================  ===================

:func:`standard_psets` fills, where they fit, the property sets ISO 16739 defines
for a cable segment (IFC4 and later; read from ifcopenshell's property-set
templates): on the occurrence ``Pset_CableSegmentOccurrence`` (InstallationMethod,
UserCorrectionFactor, CurrentCarryingCapasity - spelled so in the schema), and on
an ``IfcCableSegmentType`` per cable kind ``Pset_CableSegmentTypeCableSegment``
(NumberOfCores, MaximumOperatingTemperature).  Our own sets stay beside them.

References
----------
.. [1] ISO 16739-1:2018 (IFC4 ADD2 TC1): IfcPropertySingleValue (NominalValue,
   Unit), IfcSIUnit (a prefix applies to the base unit: MILLI SQUARE_METRE is mm²),
   Pset_CableSegmentOccurrence, Pset_CableSegmentTypeCableSegment.
.. [2] IEC 60364-5-52:2009 Table 52.1 (maximum operating temperature: XLPE 90 °C,
   PVC 70 °C).
"""

from __future__ import annotations

from typing import Any

from cablewright.sizing.voltage_drop import MAX_CONDUCTOR_TEMPERATURE_C

from .model import CircuitOutcome
from .report_trace import check_result

__all__ = ["type_properties", "check_results", "standard_psets", "finish_cable", "WriteState",
           "OCCURRENCE_PSET", "TYPE_PSET"]

OCCURRENCE_PSET = "Pset_CableSegmentOccurrence"
TYPE_PSET = "Pset_CableSegmentTypeCableSegment"

#: Measure type and SI unit (unit type, prefix, name) by property-name suffix.
_SUFFIX = (
    ("_mm2", "IfcAreaMeasure", ("AREAUNIT", "MILLI", "SQUARE_METRE")),
    ("_m", "IfcPositiveLengthMeasure", ("LENGTHUNIT", None, "METRE")),
    ("_A", "IfcElectricCurrentMeasure", ("ELECTRICCURRENTUNIT", None, "AMPERE")),
    ("_pct", "IfcReal", None),
)
_RATIOS = {"CorrectionFactor", "GroupingFactor"}
#: Check units (``Check.unit``) -> measure type and SI unit.
_CHECK_UNITS = {
    "A": ("IfcElectricCurrentMeasure", ("ELECTRICCURRENTUNIT", None, "AMPERE")),
    "kA": ("IfcElectricCurrentMeasure", ("ELECTRICCURRENTUNIT", "KILO", "AMPERE")),
    "mm²": ("IfcAreaMeasure", ("AREAUNIT", "MILLI", "SQUARE_METRE")),
    "m": ("IfcLengthMeasure", ("LENGTHUNIT", None, "METRE")),
    "Ω": ("IfcElectricResistanceMeasure", ("ELECTRICRESISTANCEUNIT", None, "OHM")),
    "s": ("IfcTimeMeasure", ("TIMEUNIT", None, "SECOND")),
}


class _Units:
    """The SI units our properties name, created once per model."""

    def __init__(self, f: Any) -> None:
        self.f = f
        self.made: dict[tuple, Any] = {}

    def get(self, key: tuple | None) -> Any:
        if key is None:
            return None
        if key not in self.made:
            unit_type, prefix, name = key
            self.made[key] = self.f.create_entity("IfcSIUnit", UnitType=unit_type, Prefix=prefix, Name=name)
        return self.made[key]


def _kind(name: str, value: Any) -> tuple[str, tuple | None] | None:
    if isinstance(value, bool) or isinstance(value, int):
        return None  # IfcBoolean / IfcInteger already
    if isinstance(value, str):
        return ("IfcText" if name == "Messages" else "IfcLabel"), None
    if name in _RATIOS:
        return ("IfcPositiveRatioMeasure" if value > 0 else "IfcRatioMeasure"), None
    for suffix, measure, unit in _SUFFIX:
        if name.endswith(suffix):
            if measure == "IfcPositiveLengthMeasure" and not value > 0:
                measure = "IfcLengthMeasure"
            if measure == "IfcAreaMeasure" and value < 0:
                return "IfcReal", None
            return measure, unit
    return None


def type_properties(f: Any, pset: Any, check_units: dict[str, str] | None = None,
                    units: _Units | None = None) -> None:
    """Give every single value of ``pset`` its measure type and unit (see the module docstring).

    ``check_units`` maps a check's ``<Name>Value``/``<Name>Limit`` property to the
    check's unit (``A``, ``mm²``, ``Ω`` ...).
    """
    units = units or _Units(f)
    for prop in pset.HasProperties or ():
        if not prop.is_a("IfcPropertySingleValue") or prop.NominalValue is None:
            continue
        value = prop.NominalValue.wrappedValue
        kind: tuple[str, tuple[Any, ...] | None] | None = None
        if check_units and prop.Name in check_units and isinstance(value, float):
            kind = _CHECK_UNITS.get(check_units[prop.Name], ("IfcReal", None))
            if kind[0] == "IfcAreaMeasure" and value < 0:
                kind = ("IfcReal", None)
        else:
            kind = _kind(prop.Name, value)
        if kind is None:
            continue
        measure, unit = kind
        if prop.NominalValue.is_a() != measure:
            prop.NominalValue = f.create_entity(measure, value)
        if unit is not None:
            prop.Unit = units.get(unit)


def check_results(outcome: CircuitOutcome) -> tuple[dict[str, str], dict[str, str]]:
    """Per check, ``<Name>Result`` (pass / fail / not_checked / not_applicable), and the
    unit of its ``<Name>Value`` and ``<Name>Limit`` properties."""
    from .ifc_writer import _word

    results: dict[str, str] = {}
    units: dict[str, str] = {}
    for check in outcome.sizing.checks if outcome.sizing else ():
        w = _word(check.name)
        results[f"{w}Result"] = check_result(check)
        units[f"{w}Value"] = units[f"{w}Limit"] = check.unit
    return results, units


def _template(schema: str, name: str) -> Any:
    import ifcopenshell.util.pset as up

    try:
        return up.get_template(schema).get_by_name(name)
    except (KeyError, RuntimeError, ValueError):
        return None


def _temperature(f: Any, celsius: float) -> float:
    """A temperature in the project's unit: kelvin unless the project assigns °C."""
    import ifcopenshell.util.unit as uu

    unit = uu.get_project_unit(f, "THERMODYNAMICTEMPERATUREUNIT")
    if unit is not None and getattr(unit, "Name", "") == "DEGREE_CELSIUS":
        return celsius
    return celsius + 273.15


def standard_psets(f: Any, cable: Any, outcome: CircuitOutcome, types: dict[str, Any]) -> None:
    """Fill the standard cable-segment property sets that fit (IFC4 and later only).

    ``types`` caches the ``IfcCableSegmentType`` made for each cable kind.
    """
    import ifcopenshell.api.pset
    import ifcopenshell.api.root
    import ifcopenshell.api.type
    import ifcopenshell.util.element as ue

    s = outcome.sizing
    if s is None or s.cable is None or _template(f.schema, OCCURRENCE_PSET) is None:
        return
    c = s.cable
    props: dict[str, Any] = {"CurrentCarryingCapasity": float(c.capacity_a)}
    if s.method:
        props["InstallationMethod"] = f"IEC 60364-5-52 reference method {s.method}"
    if s.correction_factor is not None:
        props["UserCorrectionFactor"] = float(s.correction_factor)
    existing = ue.get_pset(cable, OCCURRENCE_PSET, should_inherit=False)
    pset = (f.by_id(existing["id"]) if existing
            else ifcopenshell.api.pset.add_pset(f, product=cable, name=OCCURRENCE_PSET))
    ifcopenshell.api.pset.edit_pset(f, pset=pset, properties=props)
    if _template(f.schema, TYPE_PSET) is None or ue.get_type(cable) is not None:
        return  # a type the designer assigned is kept as it is
    key = c.describe()
    cable_type = types.get(key)
    if cable_type is None:
        cable_type = ifcopenshell.api.root.create_entity(
            f, ifc_class="IfcCableSegmentType", name=key, predefined_type="CABLESEGMENT")
        type_props: dict[str, Any] = {"NumberOfCores": int(c.cores)}
        if c.insulation in MAX_CONDUCTOR_TEMPERATURE_C:
            type_props["MaximumOperatingTemperature"] = _temperature(
                f, float(MAX_CONDUCTOR_TEMPERATURE_C[c.insulation]))
        type_pset = ifcopenshell.api.pset.add_pset(f, product=cable_type, name=TYPE_PSET)
        ifcopenshell.api.pset.edit_pset(f, pset=type_pset, properties=type_props)
        types[key] = cable_type
    ifcopenshell.api.type.assign_type(f, related_objects=[cable], relating_type=cable_type)


class WriteState:
    """What one write of the copy shares across cables: SI units, cable types."""

    def __init__(self, f: Any) -> None:
        self.units = _Units(f)
        self.types: dict[str, Any] = {}


def finish_cable(f: Any, cable: Any, outcome: CircuitOutcome, state: WriteState) -> None:
    """After our property sets are written: check results, typed values, standard sets."""
    import ifcopenshell.api.pset
    import ifcopenshell.util.element as ue

    from .ifc_writer import CHECKS_PSET, SIZING_PSET

    results, check_units = check_results(outcome)
    checks = ue.get_pset(cable, CHECKS_PSET, should_inherit=False)
    if checks and results:
        ifcopenshell.api.pset.edit_pset(f, pset=f.by_id(checks["id"]), properties=results)
    for name, units in ((SIZING_PSET, None), (CHECKS_PSET, check_units)):
        found = ue.get_pset(cable, name, should_inherit=False)
        if found:
            type_properties(f, f.by_id(found["id"]), units, state.units)
    standard_psets(f, cable, outcome, state.types)
