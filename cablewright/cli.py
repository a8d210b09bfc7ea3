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
from collections.abc import Sequence

from cablewright.core.errors import CableRouteError

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


def _common(parser: argparse.ArgumentParser) -> None:
    parser.add_argument("--config", metavar="FILE", help="TOML config (see cablewright/default_config.toml)")
    parser.add_argument("--json", action="store_true", help="print the JSON document on stdout, nothing else")
    parser.add_argument("--debug", action="store_true", help="show Python tracebacks")


def _drawing_args(parser: argparse.ArgumentParser) -> None:
    parser.add_argument("drawing", help="the drawing (.dxf) or model (.ifc)")
    parser.add_argument("--circuits", metavar="FILE", help="circuit schedule (.csv or .xlsx)")
    parser.add_argument("--recover", action="store_true",
                        help="use what can be read of a damaged DXF and list what was lost")
    _units_arg(parser)
    _common(parser)


def _units_arg(parser: argparse.ArgumentParser) -> None:
    parser.add_argument("--units", metavar="UNITS",
                        help="drawing units (mm, cm, dm, m, in, ft, ...); overrides the drawing's $INSUNITS")


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
    size.add_argument("--scheduler", metavar="ADDRESS",
                      help="batch mode on a Dask cluster: the scheduler's address (e.g. tcp://host:8786); "
                           "needs cablewright[dask] and the paths shared by every worker")
    size.add_argument("--previous", metavar="DIR",
                      help="an earlier output folder: report what changed and write changes.json")
    size.add_argument("--watch", action="store_true",
                      help="run again whenever the drawing or the schedule is saved (Ctrl+C ends)")
    size.add_argument("--watch-poll", type=float, default=0.5, help=argparse.SUPPRESS)
    size.add_argument("--watch-runs", type=int, default=0, help=argparse.SUPPRESS)  # tests: stop after N runs

    compare = sub.add_parser("compare", help="what changed between two runs of 'size'")
    compare.add_argument("old", help="the earlier output folder of 'size', its schedule.json, or a drawing")
    compare.add_argument("new", help="the later output folder of 'size', or its schedule.json")
    compare.add_argument("--circuits", metavar="FILE",
                         help="schedule for OLD and NEW when they are drawings (.dxf or .ifc)")
    compare.add_argument("--config", metavar="FILE", help="TOML config for sizing drawings")
    compare.add_argument("--json", action="store_true", help="print the change document on stdout")
    compare.add_argument("--debug", action="store_true", help="show Python tracebacks")

    routes = sub.add_parser("routes", help="measure routed lengths and grouping only")
    _drawing_args(routes)

    from .calc_options import add_calc_options

    calc = sub.add_parser("calc", help="size one circuit, no drawing; every schedule column is an option")
    add_calc_options(calc)
    _common(calc)

    layers = sub.add_parser("layers", help="what a drawing holds: layers, blocks, texts, units; a starting config")
    layers.add_argument("drawing", help="the drawing (.dxf)")
    layers.add_argument("--write-config", metavar="FILE",
                        help="write a starting TOML config from the suggestions (never over an input file)")
    layers.add_argument("--recover", action="store_true", help="read what can be read of a damaged DXF")
    _units_arg(layers)
    _common(layers)

    demo = sub.add_parser("demo", help="run 'size' on the bundled sample drawing")
    demo.add_argument("--out", metavar="DIR", help="output folder (default: ./cablewright-demo)")
    demo.add_argument("--json", action="store_true", help=argparse.SUPPRESS)
    demo.add_argument("--debug", action="store_true", help="show Python tracebacks")
    return parser


def _one_line_warning(message, category, filename, lineno, file=None, line=None) -> None:
    text = " ".join(str(message).split())
    print(f"cablewright: warning: {category.__name__}: {text}", file=sys.stderr)


def _dispatch(args: argparse.Namespace) -> int | None:
    """Run the sub-command; None when it is not known."""
    if args.command == "calc":
        from . import commands_calc
        return commands_calc.run(args)
    if args.command == "compare":
        from . import commands_compare
        return commands_compare.run_compare(args)
    from . import commands_drawing
    if args.command == "size" and getattr(args, "watch", False):
        from . import watch
        return watch.run_watch(args)
    if args.command == "size":
        return commands_drawing.run_size(args)
    if args.command == "routes":
        return commands_drawing.run_routes(args)
    if args.command == "layers":
        from . import commands_layers
        return commands_layers.run_layers(args)
    if args.command == "demo":
        return commands_drawing.run_demo(args)
    return None


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
