"""The ``cablewright`` command line (contract.md, "Commands").

Each sub-command only parses its arguments, calls the library, prints a
summary and maps errors to exit codes: 0 every circuit passes, 1 a circuit
fails or could not be sized/measured, 2 the input cannot be used.
"""

from __future__ import annotations

import argparse
import logging
import sys
import typing
from collections.abc import Sequence
from pathlib import Path

from cablewright.extract.errors import CableRouteError

__all__ = ["main", "EXIT_OK", "EXIT_CIRCUIT", "EXIT_INPUT"]

EXIT_OK, EXIT_CIRCUIT, EXIT_INPUT = 0, 1, 2
log = logging.getLogger("cablewright")

_INPUT_ERRORS = ("DrawingReadError", "ScheduleError", "ConfigError")


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


def _common(parser: argparse.ArgumentParser) -> None:
    parser.add_argument("--config", metavar="FILE", help="TOML config (see cablewright/default_config.toml)")
    parser.add_argument("--json", action="store_true", help="print the JSON document on stdout, nothing else")
    parser.add_argument("--debug", action="store_true", help="show Python tracebacks")


def _drawing_args(parser: argparse.ArgumentParser) -> None:
    parser.add_argument("drawing", help="the drawing (.dxf) or model (.ifc)")
    parser.add_argument("--circuits", metavar="FILE", help="circuit schedule (.csv or .xlsx)")
    parser.add_argument("--recover", action="store_true",
                        help="use what can be read of a damaged DXF and list what was lost")
    _common(parser)


def build_parser() -> argparse.ArgumentParser:
    """The ``cablewright`` argument parser with its sub-commands (contract.md, "Commands")."""
    parser = _Parser(
        prog="cablewright",
        description="Route, group and size low-voltage cables from a drawing (IEC 60364). "
        "Results are a design aid, to be checked by a qualified person.",
    )
    parser.add_argument("--version", action="version", version=f"cablewright {_version()}")
    sub = parser.add_subparsers(dest="command", required=True, parser_class=_Parser)

    size = sub.add_parser("size", help="the whole job: routes, grouping, sizing, annotated DXF, schedule, report")
    _drawing_args(size)
    size.add_argument("more_drawings", nargs="*", metavar="DRAWING",
                      help="further drawings or folders: batch mode, each drawing's outputs in its own folder")
    size.add_argument("--out", metavar="DIR", help="output folder (default: beside the drawing)")
    size.add_argument("--jobs", type=int, default=1, metavar="N",
                      help="batch mode: drawings processed in parallel worker processes (default 1)")

    routes = sub.add_parser("routes", help="measure routed lengths and grouping only")
    _drawing_args(routes)

    from .calc_options import add_calc_options

    calc = sub.add_parser("calc", help="size one circuit, no drawing; every schedule column is an option")
    add_calc_options(calc)
    _common(calc)

    demo = sub.add_parser("demo", help="run 'size' on the bundled sample drawing")
    demo.add_argument("--out", metavar="DIR", help="output folder (default: ./cablewright-demo)")
    demo.add_argument("--json", action="store_true", help=argparse.SUPPRESS)
    demo.add_argument("--debug", action="store_true", help="show Python tracebacks")
    return parser


def _exit_code_for(exc: BaseException) -> int:
    return EXIT_INPUT if type(exc).__name__ in _INPUT_ERRORS or any(
        cls.__name__ in _INPUT_ERRORS for cls in type(exc).__mro__
    ) else EXIT_CIRCUIT


def main(argv: Sequence[str] | None = None) -> int:
    """Entry point of the ``cablewright`` console script; returns the exit code."""
    parser = build_parser()
    try:
        args = parser.parse_args(argv)
    except SystemExit as exc:  # --help, --version, or a usage error (one line, exit 2)
        return int(exc.code or 0) if not isinstance(exc.code, str) else EXIT_INPUT
    logging.basicConfig(level=logging.DEBUG if args.debug else logging.WARNING,
                        format="cablewright: %(message)s", stream=sys.stderr)
    try:
        if args.command == "calc":
            from . import commands_calc
            return commands_calc.run(args)
        from . import commands_drawing
        if args.command == "size":
            return commands_drawing.run_size(args)
        if args.command == "routes":
            return commands_drawing.run_routes(args)
        if args.command == "demo":
            return commands_drawing.run_demo(args)
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
    except Exception as exc:  # a bug: one line unless --debug
        if args.debug:
            raise
        print(f"cablewright: internal error: {type(exc).__name__}: {exc} "
              "(run again with --debug and report it)", file=sys.stderr)
        return EXIT_INPUT
    parser.error(f"unknown command {args.command}")
    return EXIT_INPUT


def _cli_path(text: str) -> Path:
    return Path(text).expanduser()


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
