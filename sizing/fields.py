"""Turn the schedule's text fields (contract.md, "The circuit schedule") into a CircuitSpec."""

from __future__ import annotations

import difflib
from collections.abc import Mapping

from cablewright.core.errors import CircuitInputError, UnknownKeyError

from .config import SizingConfig
from .load import parse_load
from .model import CircuitSpec, Stretch

__all__ = ["SCHEDULE_FIELDS", "LOAD_TYPES", "spec_from_fields"]

#: Columns of the schedule that the sizing reads (contract.md).
SCHEDULE_FIELDS = (
    "load", "power_factor", "efficiency", "voltage", "phases", "load_type",
    "conductor", "insulation", "cores", "vd_limit_pct", "fault_ka",
)
LOAD_TYPES = ("motor", "lighting", "general", "feeder")
_CONDUCTORS = {"cu": "Cu", "copper": "Cu", "al": "Al", "aluminium": "Al", "aluminum": "Al"}
_INSULATIONS = {"xlpe": "XLPE", "epr": "XLPE", "pvc": "PVC"}


def _number(name: str, text: str, circuit_id: str) -> float:
    try:
        value = float(str(text).strip().replace(",", "."))
    except ValueError:
        raise CircuitInputError(circuit_id=circuit_id, column=name, value=text,
                                problem=f"{name} {text!r} is not a number") from None
    if value != value:  # NaN
        raise CircuitInputError(circuit_id=circuit_id, column=name, value=text, problem=f"{name} is not a number")
    return value


def _choice(name: str, text: str, table: Mapping[str, str], circuit_id: str) -> str:
    key = str(text).strip().lower()
    if key in table:
        return table[key]
    close = difflib.get_close_matches(key, list(table), n=2)
    hint = f" (did you mean {' or '.join(close)}?)" if close else ""
    known = tuple(sorted(set(table.values())))
    raise UnknownKeyError(circuit_id=circuit_id, column=name, value=text, known=known,
                          problem=f"{name} {text!r} is unknown{hint}", fix=f"use one of {', '.join(known)}")


def spec_from_fields(
    circuit_id: str,
    fields: Mapping[str, str | None],
    config: SizingConfig,
    design_length_m: float = 0.0,
    stretches: tuple[Stretch, ...] = (Stretch(),),
) -> CircuitSpec:
    """Build a :class:`CircuitSpec` from schedule text; blank means the default.

    Raises
    ------
    CircuitInputError, UnknownKeyError
        A value that does not parse, is out of range, or is not a known choice;
        the message names the circuit and the field.

    Examples
    --------
    >>> spec = spec_from_fields("P-1", {"load": "30 hp", "phases": "3"}, SizingConfig())
    >>> spec.load, spec.voltage_v, spec.power_factor
    (Load(value=30.0, unit='hp'), 400.0, 0.85)
    """
    def get(name: str) -> str | None:
        value = fields.get(name)
        if value is None:
            return None
        value = str(value).strip()
        return value or None

    load_text = get("load")
    if load_text is None:
        raise CircuitInputError(circuit_id=circuit_id, column="load", problem="no load given",
                                fix="write e.g. '55 kW'")
    try:
        load = parse_load(load_text)
    except (CircuitInputError, UnknownKeyError) as exc:
        raise type(exc)(f"circuit {circuit_id}: {exc}") from None
    phases = 3
    if (text := get("phases")) is not None:
        phases_value = _number("phases", text, circuit_id)
        if phases_value not in (1, 3):
            raise CircuitInputError(circuit_id=circuit_id, column="phases", value=text,
                                    problem=f"phases must be 1 or 3, not {text}")
        phases = int(phases_value)
    voltage = config.voltage_3ph_v if phases == 3 else config.voltage_1ph_v
    if (text := get("voltage")) is not None:
        voltage = _number("voltage", text.upper().rstrip("V").strip(), circuit_id)
        if voltage <= 0:
            raise CircuitInputError(circuit_id=circuit_id, column="voltage", value=voltage,
                                    problem="voltage must be greater than zero")
    pf = config.power_factor
    if (text := get("power_factor")) is not None:
        pf = _number("power_factor", text, circuit_id)
    if not 0 < pf <= 1:
        raise CircuitInputError(circuit_id=circuit_id, column="power_factor", value=pf,
                                problem=f"power factor {pf:g} is outside (0, 1]")
    efficiency = 1.0
    if (text := get("efficiency")) is not None:
        efficiency = _number("efficiency", text.rstrip("%"), circuit_id)
        if efficiency > 1 and text.endswith("%"):
            efficiency /= 100.0
    if not 0 < efficiency <= 1:
        raise CircuitInputError(circuit_id=circuit_id, column="efficiency", value=efficiency,
                                problem=f"efficiency {efficiency:g} is outside (0, 1]")
    load_type = "general"
    if (text := get("load_type")) is not None:
        load_type = _choice("load_type", text, {t: t for t in LOAD_TYPES}, circuit_id)
    conductor = _choice("conductor", get("conductor") or "Cu", _CONDUCTORS, circuit_id)
    insulation = _choice("insulation", get("insulation") or "XLPE", _INSULATIONS, circuit_id)
    cores = None
    if (text := get("cores")) is not None:
        cores_value = _number("cores", text, circuit_id)
        if cores_value not in (1, 2, 3, 4, 5):
            raise CircuitInputError(circuit_id=circuit_id, column="cores", value=text,
                                    problem=f"cores must be 1 to 5, not {text}")
        cores = int(cores_value)
    vd_limit = None
    if (text := get("vd_limit_pct")) is not None:
        vd_limit = _number("vd_limit_pct", text.rstrip("%"), circuit_id)
        if not 0 < vd_limit <= 100:
            raise CircuitInputError(circuit_id=circuit_id, column="vd_limit_pct", value=vd_limit,
                                    problem=f"vd_limit_pct {vd_limit:g} is outside (0, 100]")
    fault = None
    if (text := get("fault_ka")) is not None:
        fault = _number("fault_ka", text, circuit_id)
        if fault <= 0:
            raise CircuitInputError(circuit_id=circuit_id, column="fault_ka", value=fault,
                                    problem="fault_ka must be greater than zero")
    extra = tuple(
        (key, str(value)) for key, value in fields.items()
        if key not in SCHEDULE_FIELDS and value is not None and str(value).strip()
    )
    return CircuitSpec(
        circuit_id=circuit_id, load=load, voltage_v=voltage, phases=phases, power_factor=pf,
        efficiency=efficiency, load_type=load_type, conductor=conductor, insulation=insulation,
        cores=cores, vd_limit_pct=vd_limit, fault_ka=fault, design_length_m=design_length_m,
        stretches=stretches, extra=extra,
    )
