"""Argument groups shared by several sub-commands (contract.md, "Commands").

Each ``commands_*.py`` module registers its own parser beside its handler
(``register(subparsers)``) and takes the shared options from here; ``cli.py``
only assembles them.  This module imports nothing of the package, so no
command module reaches back into ``cli.py``.
"""

from __future__ import annotations

import argparse

__all__ = ["common_options", "drawing_arguments", "units_option"]


def common_options(parser: argparse.ArgumentParser) -> None:
    """``--config``, ``--json`` and ``--debug``, as every drawing command and ``calc`` take them."""
    parser.add_argument("--config", metavar="FILE", help="TOML config (see cablewright/default_config.toml)")
    parser.add_argument("--json", action="store_true", help="print the JSON document on stdout, nothing else")
    parser.add_argument("--debug", action="store_true", help="show Python tracebacks")


def drawing_arguments(parser: argparse.ArgumentParser) -> None:
    """The drawing, its schedule, ``--recover``, ``--units`` and the common options."""
    parser.add_argument("drawing", help="the drawing (.dxf) or model (.ifc)")
    parser.add_argument("--circuits", metavar="FILE", help="circuit schedule (.csv or .xlsx)")
    parser.add_argument("--recover", action="store_true",
                        help="use what can be read of a damaged DXF and list what was lost")
    units_option(parser)
    common_options(parser)


def units_option(parser: argparse.ArgumentParser) -> None:
    """``--units``: the drawing units, overriding the drawing's ``$INSUNITS``."""
    parser.add_argument("--units", metavar="UNITS",
                        help="drawing units (mm, cm, dm, m, in, ft, ...); overrides the drawing's $INSUNITS")
