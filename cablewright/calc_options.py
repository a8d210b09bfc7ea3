"""The options of ``cablewright calc``: every schedule column, underscores as hyphens.

A value that does not parse, or is not one of its choices, is a usage error
(one line, exit code 2, contract.md "Commands"); a value that parses but is
out of range (a power factor of 1.2, a zero load) is the circuit's error
(exit code 1), as in a schedule.
"""

from __future__ import annotations

import argparse
import re
from collections.abc import Callable
from dataclasses import dataclass

from cablewright.sizing.capacity_tables import METHODS
from cablewright.sizing.fields import LOAD_TYPES, SCHEDULE_FIELDS
from cablewright.sizing.motor_start import STARTERS

__all__ = ["CALC_COLUMNS", "CalcOption", "add_calc_options", "calc_fields"]


def number(suffix: str = "", keep: bool = False) -> Callable[[str], str]:
    """An argparse type: text that reads as a number, a unit ``suffix`` allowed.

    Returns the number's text without the suffix, or the text as given when
    ``keep`` (the sizing reads the suffix, as ``%`` of an efficiency).
    """
    def parse(text: str) -> str:
        cleaned = str(text).strip().replace(",", ".")
        if suffix and cleaned.upper().endswith(suffix.upper()):
            cleaned = cleaned[: -len(suffix)].strip()
        try:
            value = float(cleaned)
        except ValueError:
            raise argparse.ArgumentTypeError(f"{text!r} is not a number") from None
        if value != value:
            raise argparse.ArgumentTypeError(f"{text!r} is not a number")
        return text if keep else cleaned

    parse.__name__ = "number"
    return parse


def choice(choices: tuple[str, ...], aliases: dict[str, str] | None = None) -> Callable[[str], str]:
    """An argparse type: one of ``choices`` (case-insensitive), or an alias of one."""
    table = {c.lower(): c for c in choices}
    table.update({k.lower(): v for k, v in (aliases or {}).items()})

    def parse(text: str) -> str:
        key = str(text).strip().lower()
        if key in table:
            return table[key]
        raise argparse.ArgumentTypeError(f"{text!r} is not a choice: use one of {', '.join(choices)}")

    parse.__name__ = "choice"
    parse.choices = choices  # type: ignore[attr-defined]
    return parse


_LOAD = re.compile(r"^\s*([-+]?(\d+([.,]\d*)?|[.,]\d+)([eE][-+]?\d+)?)\s*([A-Za-z]+)\s*$")


def load_text(text: str) -> str:
    """An argparse type: a load written as number and unit (``55 kW``, ``75 hp``, ``40 kVA``, ``32 A``)."""
    from cablewright.core.errors import CableRouteError
    from cablewright.sizing.load import parse_load

    if not (match := _LOAD.match(str(text))):
        raise argparse.ArgumentTypeError(f"{text!r} does not parse: write a number and a unit, e.g. '55 kW'")
    try:
        parse_load(text)
    except CableRouteError as exc:
        if float(match.group(1).replace(",", ".")) > 0:  # a unit we do not know
            raise argparse.ArgumentTypeError(str(exc)) from None
    return text  # a zero or negative load is the circuit's error (exit 1)


@dataclass(frozen=True)
class CalcOption:
    """One option of ``calc`` that stands for a schedule column.

    Attributes
    ----------
    column : str
        The schedule column (``ze_ohm``); the option is ``--ze-ohm``.
    help : str
        What it means, with its unit.
    parse : callable or None
        The argparse type; ``None`` takes the text as it is.
    flag : str
        The option when it is not the column's name (``--curve`` for ``curve``).
    """

    column: str
    help: str
    parse: Callable[[str], str] | None = None
    flag: str = ""

    @property
    def option(self) -> str:
        """The option string."""
        return self.flag or "--" + self.column.replace("_", "-")


_INSULATION_ALIASES = {"xlpe": "XLPE", "epr": "EPR", "pvc": "PVC"}

#: Every schedule column ``calc`` takes (contract.md "The circuit schedule" and
#: its extensions, README "Further schedule columns").
CALC_COLUMNS: tuple[CalcOption, ...] = (
    CalcOption("load", "e.g. '55 kW', '75 hp' (shaft), '40 kVA', '32 A'", load_text),
    CalcOption("voltage", "line-to-line for 3 phases, line-to-neutral for 1 [V] "
               "(default 400 / 230 V from the config)", number("V")),
    CalcOption("phases", "3 (default) or 1", choice(("3", "1"))),
    CalcOption("power_factor", "cos phi in (0, 1] (default 0.85, from the config)", number()),
    CalcOption("efficiency", "in (0, 1] or %% (default 1: the kW is the electrical input)", number("%", keep=True)),
    CalcOption("load_type", "default general; sets the voltage-drop limit",
               choice(LOAD_TYPES)),
    CalcOption("conductor", "Cu (default) or Al",
               choice(("Cu", "Al"), {"copper": "Cu", "aluminium": "Al", "aluminum": "Al"})),
    CalcOption("insulation", "XLPE (default), EPR (the XLPE columns of IEC 60364-5-52:2009 "
               "Annex B) or PVC", choice(("XLPE", "EPR", "PVC"), _INSULATION_ALIASES)),
    CalcOption("cores", "cores of one cable (default 4 for 3 phases, 3 for 1)",
               choice(("1", "2", "3", "4", "5"))),
    CalcOption("vd_limit_pct", "voltage-drop limit [%%] (default from the config, per load type)",
               number("%", keep=True)),
    CalcOption("fault_ka", "prospective short-circuit current at the source [kA]", number("kA")),
    CalcOption("ze_ohm", "earth-fault loop impedance upstream [ohm] (default: 2 x ZQ from "
               "--fault-ka, else 0, said in the check)", number()),
    CalcOption("earthing", "TN (default), TN-S, TN-C, TN-C-S, TT or IT",
               choice(("TN", "TN-S", "TN-C", "TN-C-S", "TT", "IT"))),
    CalcOption("curve", "breaker characteristic B, C (default) or D (IEC 60898-1)",
               choice(("B", "C", "D"))),
    CalcOption("magnetic_a", "instantaneous setting of an adjustable breaker [A]", number("A")),
    CalcOption("starter", "motor starter: dol (default), star_delta, soft or drive",
               choice(STARTERS, {"direct-on-line": "dol", "direct": "dol", "star-delta": "star_delta",
                                 "y-d": "star_delta", "vsd": "drive", "vfd": "drive"})),
    CalcOption("clearing_time_s", "device clearing time for the adiabatic check [s]", number("s")),
    CalcOption("let_through_ka2s", "device let-through I²t, maker's data [kA²s]", number()),
    CalcOption("third_harmonic_pct", "third-harmonic content of the phase current [%%]", number("%")),
)


def add_calc_options(parser: argparse.ArgumentParser) -> None:
    """Add the options of ``calc`` to ``parser``: the circuit's environment and every column.

    A column of :data:`cablewright.sizing.fields.SCHEDULE_FIELDS` that
    :data:`CALC_COLUMNS` does not list yet is added as a plain text option.
    """
    for option in CALC_COLUMNS:
        choices = getattr(option.parse, "choices", None)
        metavar = "{" + ",".join(choices) + "}" if choices else option.column.upper()
        parser.add_argument(option.option, dest=option.column, type=option.parse,  # type: ignore[arg-type]  # None: argparse's plain text
                            help=option.help,
                            required=option.column == "load", metavar=metavar)
    listed = {o.column for o in CALC_COLUMNS}
    for column in SCHEDULE_FIELDS:
        if column not in listed:
            parser.add_argument("--" + column.replace("_", "-"), dest=column,
                                help=f"schedule column {column}")
    parser.add_argument("--length", default="0", type=number("m"),
                        help="route length [m] for voltage drop and impedance (default 0)")
    parser.add_argument("--method", default="E", type=choice(METHODS), metavar="METHOD",
                        help=f"IEC 60364-5-52 reference method: {', '.join(METHODS)} (default E)")
    parser.add_argument("--ambient", type=number("°C"),
                        help="air (or ground for D1/D2) temperature [°C]")
    parser.add_argument("--soil", type=number(), help="soil thermal resistivity for D1/D2 [K.m/W]")
    parser.add_argument("--group", default="1", type=number(),
                        help="circuits in the group, this one included (default 1)")
    parser.add_argument("--standard", default=None, type=choice(("iec", "nec")), metavar="{iec,nec}",
                        help="rule set: iec (default, IEC 60364) or nec (NFPA 70:2023, AWG/kcmil)")
    parser.add_argument("--id", default="CALC-1", help="circuit id shown in the output")


def calc_fields(args: argparse.Namespace) -> dict[str, str | None]:
    """The schedule fields of the parsed options (``None`` for those not given)."""
    names = [o.column for o in CALC_COLUMNS] + [c for c in SCHEDULE_FIELDS
                                                 if c not in {o.column for o in CALC_COLUMNS}]
    return {name: getattr(args, name, None) for name in names}
