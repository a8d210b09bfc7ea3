"""The ``cablewright`` command line (contract.md, "Commands").

Each sub-command only parses its arguments, calls the library, prints a
summary and maps errors to exit codes: 0 every circuit passes, 1 a circuit
fails or could not be sized/measured, 2 the input cannot be used.
"""

from __future__ import annotations

import argparse
import logging
import sys
import traceback
import typing
import warnings
from collections.abc import Callable, Sequence

from cablewright.core.errors import CableRouteError

from . import commands_calc, commands_compare, commands_drawing, commands_layers
from .exits import EXIT_CIRCUIT, EXIT_INPUT, EXIT_OK, internal_error_line
from .exits import exit_code_for as _exit_code_for

__all__ = ["main", "internal_error_line", "EXIT_OK", "EXIT_CIRCUIT", "EXIT_INPUT"]

log = logging.getLogger("cablewright")


class _Parser(argparse.ArgumentParser):
    """argparse with one-line errors: what is wrong and where to look (exit code 2)."""

    def error(self, message: str) -> typing.NoReturn:
        self.exit(EXIT_INPUT, f"{self.prog}: error: {message} (see {self.prog} --help)\n")


def _version() -> str:
    from importlib.metadata import PackageNotFoundError, version

    try:
        return version("cablewright")
    except PackageNotFoundError:  # pragma: no cover - run from a source tree
        return "unknown"


def build_parser() -> argparse.ArgumentParser:
    """The ``cablewright`` argument parser with its sub-commands (contract.md, "Commands").

    Each command's parser lives beside its handler (``register`` in its
    ``commands_*.py`` module, which sets ``handler``); here they are only
    assembled, in the order ``--help`` lists them.
    """
    parser = _Parser(
        prog="cablewright",
        description="Route, group and size low-voltage cables from a drawing (IEC 60364). "
        "Results are a design aid, to be checked by a qualified person.",
    )
    parser.add_argument("--version", action="version", version=f"cablewright {_version()}")
    sub = parser.add_subparsers(dest="command", required=True, parser_class=_Parser)
    for register in (commands_drawing.register_size, commands_compare.register,
                     commands_drawing.register_routes, commands_calc.register,
                     commands_layers.register, commands_drawing.register_demo):
        register(sub)
    return parser


def _one_line_warning(message, category, filename, lineno, file=None, line=None) -> None:
    text = " ".join(str(message).split())
    print(f"cablewright: warning: {category.__name__}: {text}", file=sys.stderr)


def _dispatch(args: argparse.Namespace) -> int | None:
    """Run the sub-command's handler (set by its ``register``); None when it has none."""
    handler: Callable[[argparse.Namespace], int] | None = getattr(args, "handler", None)
    return handler(args) if handler is not None else None


def main(argv: Sequence[str] | None = None) -> int:
    """Entry point of the ``cablewright`` console script; returns the exit code."""
    parser = build_parser()
    try:
        args = parser.parse_args(argv)
    except SystemExit as exc:  # --help, --version, or a usage error (one line, exit 2)
        return int(exc.code or 0) if not isinstance(exc.code, str) else EXIT_INPUT
    logging.basicConfig(level=logging.DEBUG if args.debug else logging.WARNING,
                        format="cablewright: %(message)s", stream=sys.stderr)
    if not args.debug:  # a library's warning is one line too, without its source line
        warnings.showwarning = _one_line_warning
    from .collector import tuned_collector

    try:
        with tuned_collector():  # collector thresholds raised for the run, restored after
            code = _dispatch(args)
        if code is not None:
            return code
    except CableRouteError as exc:
        if args.debug:
            raise
        for line in str(exc).splitlines() or [type(exc).__name__]:  # a config: one line per problem
            print(f"cablewright: error: {line}", file=sys.stderr)
        return _exit_code_for(exc)
    except BrokenPipeError:  # output piped into a program that stopped reading (e.g. head)
        sys.stderr.close()
        return EXIT_OK
    except KeyboardInterrupt:
        print("cablewright: interrupted; no output was left half-written", file=sys.stderr)
        return 130
    except Exception as exc:  # a bug: one line, the traceback only with --debug
        if args.debug:
            traceback.print_exc()
        print(f"cablewright: {internal_error_line(exc, args)}", file=sys.stderr)
        return EXIT_INPUT
    parser.error(f"unknown command {args.command}")
    return EXIT_INPUT


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
