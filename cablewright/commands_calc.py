"""``cablewright calc``: one circuit, no drawing."""

from __future__ import annotations

import argparse
import json
import sys

from cablewright.annotate.jsonout import document
from cablewright.annotate.model import CircuitOutcome
from cablewright.core.errors import CableRouteError, CircuitInputError
from cablewright.sizing.capacity_tables import canonical_method
from cablewright.sizing.chain import origin_drop_not_checked, with_origin_check
from cablewright.sizing.fields import spec_from_fields
from cablewright.sizing.model import SizingResult, Stretch
from cablewright.sizing.standards import size_for_standard

from .arguments import common_options
from .calc_options import add_calc_options, calc_fields
from .config import UNAVAILABLE_STANDARDS, load_settings
from .console import calc_steps

__all__ = ["run", "register"]


def _float(name: str, text: str | None) -> float | None:
    if text is None:
        return None
    try:
        return float(str(text).replace(",", "."))
    except ValueError:
        raise CircuitInputError(f"--{name} {text!r} is not a number") from None


def _result(args: argparse.Namespace) -> tuple[SizingResult, float]:
    settings = load_settings(args.config)
    length_m = 0.0
    try:
        length_m = _float("length", args.length) or 0.0
        group = _float("group", args.group)
        if group is None or group < 1 or group != int(group):
            raise CircuitInputError(f"--group {args.group!r} must be a whole number >= 1")
        method = canonical_method(str(args.method))  # F_flat, G_vertical keep their case
        stretch = Stretch(
            segment_id="", method=method, other_cables=int(group) - 1,
            ambient_c=_float("ambient", args.ambient),
            soil_resistivity_k_m_w=_float("soil", args.soil),
            length_m=length_m,
        )
        spec = spec_from_fields(args.id, calc_fields(args), settings.sizing, length_m, (stretch,))
    except CableRouteError as exc:
        if type(exc).__name__ == "ConfigError":
            raise
        return SizingResult(args.id, "error", (str(exc),)), length_m
    sizing = settings.sizing
    if getattr(args, "standard", None):  # --standard wins over the config's [sizing] standard
        from dataclasses import replace

        sizing = replace(sizing, standard=args.standard)
    result = size_for_standard(spec, sizing)
    if result.voltage_drop is not None:  # one circuit alone: its feeders are not known
        result = with_origin_check(result, origin_drop_not_checked(
            result.voltage_drop, "calc sizes one circuit alone, the feeders upstream are not "
            "known; size the schedule with its feeders (cablewright size)"))
    return result, length_m


def _length_unit(args: argparse.Namespace) -> str:
    """``[annotate] length_unit`` of the config ("" follows the rule set)."""
    return load_settings(args.config).annotate.length_unit


def run(args: argparse.Namespace) -> int:
    """Size the circuit described by the arguments; 0 pass, 1 fail or error, 2 bad config."""
    if args.standard in UNAVAILABLE_STANDARDS:
        print(f"cablewright: error: --standard {args.standard}: the {args.standard.upper()} rule set "
              "is not available yet; use --standard iec", file=sys.stderr)
        return 2
    result, length_m = _result(args)
    outcome = CircuitOutcome(args.id, "", "", result.status, result.messages, sizing=result)
    if args.json:
        print(json.dumps(document([outcome], kind="calc"), indent=2, ensure_ascii=False, allow_nan=False))
    else:
        print(calc_steps(result, length_m, _length_unit(args)))
    if result.status == "error":
        for message in result.messages:
            print(f"cablewright: error: {message}", file=sys.stderr)
        return 1
    return 0 if result.status in ("ok", "warning") else 1


def register(subparsers: argparse._SubParsersAction) -> None:
    """The ``calc`` parser: every schedule column an option (:mod:`calc_options`)."""
    calc = subparsers.add_parser("calc", help="size one circuit, no drawing; every schedule column is an option")
    add_calc_options(calc)
    common_options(calc)
    calc.set_defaults(handler=run)
