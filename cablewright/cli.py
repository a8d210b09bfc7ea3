"""The ``cablewright`` command line (contract.md, "Commands").

Each sub-command only parses its arguments, calls the library, prints a
summary and maps errors to exit codes: 0 every circuit passes, 1 a circuit
fails or could not be sized/measured, 2 the input cannot be used.
"""

from __future__ import annotations

import argparse
import logging
import sys
from collections.abc import Sequence
from pathlib import Path

from cablewright.extract.errors import CableRouteError

__all__ = ["main", "EXIT_OK", "EXIT_CIRCUIT", "EXIT_INPUT"]

EXIT_OK, EXIT_CIRCUIT, EXIT_INPUT = 0, 1, 2
log = logging.getLogger("cablewright")

_INPUT_ERRORS = ("DrawingReadError", "ScheduleError", "ConfigError")


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
    parser = argparse.ArgumentParser(
        prog="cablewright",
        description="Route, group and size low-voltage cables from a drawing (IEC 60364). "
        "Results are a design aid, to be checked by a qualified person.",
    )
    sub = parser.add_subparsers(dest="command", required=True)

    size = sub.add_parser("size", help="the whole job: routes, grouping, sizing, annotated DXF, schedule, report")
    _drawing_args(size)
    size.add_argument("more_drawings", nargs="*", metavar="DRAWING",
                      help="further drawings or folders: batch mode, each drawing's outputs in its own folder")
    size.add_argument("--out", metavar="DIR", help="output folder (default: beside the drawing)")
    size.add_argument("--jobs", type=int, default=1, metavar="N",
                      help="batch mode: drawings processed in parallel worker processes (default 1)")
    size.add_argument("--previous", metavar="DIR",
                      help="an earlier output folder: report what changed and write changes.json")
    size.add_argument("--watch", action="store_true",
                      help="run again whenever the drawing or the schedule is saved (Ctrl+C ends)")
    size.add_argument("--watch-poll", type=float, default=0.5, help=argparse.SUPPRESS)
    size.add_argument("--watch-runs", type=int, default=0, help=argparse.SUPPRESS)  # tests: stop after N runs

    compare = sub.add_parser("compare", help="what changed between two runs of 'size'")
    compare.add_argument("old", help="the earlier output folder of 'size', or its schedule.json")
    compare.add_argument("new", help="the later output folder of 'size', or its schedule.json")
    compare.add_argument("--json", action="store_true", help="print the change document on stdout")
    compare.add_argument("--debug", action="store_true", help="show Python tracebacks")

    routes = sub.add_parser("routes", help="measure routed lengths and grouping only")
    _drawing_args(routes)

    calc = sub.add_parser("calc", help="size one circuit, no drawing")
    calc.add_argument("--load", required=True, help="e.g. '55 kW', '75 hp', '40 kVA', '32 A'")
    calc.add_argument("--voltage", help="line-to-line for 3 phases, line-to-neutral for 1 [V]")
    calc.add_argument("--phases", help="3 (default) or 1")
    calc.add_argument("--power-factor", help="cos phi in (0, 1] (default 0.85)")
    calc.add_argument("--efficiency", help="motor efficiency in (0, 1] (default 1)")
    calc.add_argument("--length", default="0", help="route length [m] used for voltage drop")
    calc.add_argument("--method", default="E", help="IEC 60364-5-52 reference method (A1 ... G, default E)")
    calc.add_argument("--ambient", help="air (or ground for D1/D2) temperature [°C]")
    calc.add_argument("--soil", help="soil thermal resistivity for D1/D2 [K.m/W]")
    calc.add_argument("--group", default="1", help="circuits in the group, this one included (default 1)")
    calc.add_argument("--load-type", help="motor, lighting, general (default) or feeder")
    calc.add_argument("--conductor", help="Cu (default) or Al")
    calc.add_argument("--insulation", help="XLPE (default) or PVC")
    calc.add_argument("--cores", help="cores of one cable (default 4 for 3 phases, 3 for 1)")
    calc.add_argument("--vd-limit-pct", help="voltage-drop limit [%%]")
    calc.add_argument("--fault-ka", help="prospective short-circuit current at the source [kA]")
    calc.add_argument("--id", default="CALC-1", help="circuit id shown in the output")
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


def _exit_code_for(exc: BaseException) -> int:
    return EXIT_INPUT if type(exc).__name__ in _INPUT_ERRORS or any(
        cls.__name__ in _INPUT_ERRORS for cls in type(exc).__mro__
    ) else EXIT_CIRCUIT


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
    args = parser.parse_args(argv)
    logging.basicConfig(level=logging.DEBUG if args.debug else logging.WARNING,
                        format="cablewright: %(message)s", stream=sys.stderr)
    from .collector import tuned_collector

    try:
        with tuned_collector():  # collector thresholds raised for the run, restored after
            code = _dispatch(args)
        if code is not None:
            return code
    except CableRouteError as exc:
        if args.debug:
            raise
        print(f"cablewright: error: {exc}", file=sys.stderr)
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
