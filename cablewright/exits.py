"""Exit codes and the one line for an internal error, shared by the commands and batch mode.

contract.md "Exit codes": 0 every circuit passes, 1 a circuit fails or could
not be sized/measured, 2 the input cannot be used.
"""

from __future__ import annotations

import argparse
import traceback
from types import SimpleNamespace

__all__ = ["EXIT_OK", "EXIT_CIRCUIT", "EXIT_INPUT", "exit_code_for", "internal_error_line"]

EXIT_OK, EXIT_CIRCUIT, EXIT_INPUT = 0, 1, 2

_INPUT_ERRORS = ("DrawingReadError", "ScheduleError", "ConfigError", "OutputError")

#: The stage an internal error arose in, from the module of the innermost of our
#: frames (first match of the module name's prefix wins).
_STAGE_OF_MODULE = (
    ("cablewright.extract.schedule", "reading the schedule"),
    ("cablewright.extract.network", "routing"),
    ("cablewright.extract.routing", "routing"),
    ("cablewright.extract.grouping", "grouping"),
    ("cablewright.extract", "reading"),
    ("cablewright.sizing", "sizing"),
    ("cablewright.annotate", "writing"),
    ("cablewright.outputs", "writing"),
    ("cablewright.config", "reading the settings"),
)


def exit_code_for(exc: BaseException) -> int:
    """The exit code of one of our errors: 2 for unusable input, else 1 (contract.md)."""
    return EXIT_INPUT if type(exc).__name__ in _INPUT_ERRORS or any(
        cls.__name__ in _INPUT_ERRORS for cls in type(exc).__mro__
    ) else EXIT_CIRCUIT


def _stage_and_module(exc: BaseException) -> tuple[str, str]:
    stage, module = "the command", ""
    for frame, _ in traceback.walk_tb(exc.__traceback__):
        name = str(frame.f_globals.get("__name__", ""))
        if name.startswith("cablewright."):
            module = name
    for prefix, label in _STAGE_OF_MODULE:
        if module.startswith(prefix):
            stage = label
            break
    return stage, module


def internal_error_line(exc: BaseException, args: argparse.Namespace | SimpleNamespace | None = None) -> str:
    """One line for an exception that is not ours: stage, file, what, and a plea to report it.

    The stage comes from the module the error arose in; the file is the input
    that stage was reading (the schedule, the config, else the drawing).

    Examples
    --------
    >>> internal_error_line(ZeroDivisionError("division by zero"))
    'internal error in the command on the command line: ZeroDivisionError: division by zero (please report)'
    """
    stage, module = _stage_and_module(exc)
    drawing = getattr(args, "drawing", None)
    if module.startswith("cablewright.extract.schedule") and getattr(args, "circuits", None):
        where = args.circuits  # type: ignore[union-attr]
    elif module.startswith("cablewright.config") and getattr(args, "config", None):
        where = args.config  # type: ignore[union-attr]
    else:
        where = drawing or "the command line"
    what = " ".join(f"{type(exc).__name__}: {exc}".split())
    if len(what) > 200:
        what = what[:199] + "…"
    return f"internal error in {stage} on {where}: {what} (please report)"


