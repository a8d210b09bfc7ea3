"""``cablewright layers DRAWING [--json] [--write-config FILE]`` (contract.md, Extensions).

What a drawing holds, to write its config: layers with entity counts, line length
and a suggested containment; blocks with their attributes; texts that could be
tags; units, extents and whether they are plausible.  Exit 0, or 2 when the
drawing cannot be read.
"""

from __future__ import annotations

import argparse
import json
import sys
from pathlib import Path

from cablewright.annotate.atomic import write_text_atomic
from cablewright.core.errors import ConfigError
from cablewright.extract.survey import Survey, starting_config, survey_drawing

from .arguments import common_options, units_option
from .commands_drawing import settings_for
from .console import format_table
from .pipeline import drawing_config

__all__ = ["run_layers", "register"]

#: Most tag-like texts listed in the text output (all are in --json).
SHOWN_TEXTS = 20


def _same_file(a: Path, b: Path) -> bool:
    try:
        return a.resolve() == b.resolve()
    except OSError:
        return False


def _print_survey(survey: Survey) -> None:
    k = survey.metres_per_unit
    unit = "m" if k else "units"
    rows = []
    for layer in sorted(survey.layers.values(), key=lambda x: x.name.lower()):
        counts = ", ".join(f"{n} {t}" for t, n in sorted(layer.counts.items())) or "empty"
        kind = layer.route_kind or ((layer.suggestion.containment, layer.suggestion.method) if layer.suggestion else None)
        note = "route layer" if layer.route_kind else (f"suggested ({layer.suggestion.word!r})" if layer.suggestion else "")
        rows.append([layer.name, counts, f"{layer.line_length * (k or 1.0):.1f}",
                     f"{kind[0]} ({kind[1]})" if kind else "-", note])
    print(format_table(["layer", "entities", f"lines [{unit}]", "containment (method)", "why"], rows))
    blocks = [[b.name, ", ".join(sorted(b.attributes)) or "-", str(b.inserts)]
              for b in sorted(survey.blocks.values(), key=lambda x: x.name.lower())]
    if blocks:
        print()
        print(format_table(["block", "attributes", "inserts"], blocks))
    print()
    words = [t.word for t in survey.tag_texts]
    more = f" ... ({len(words)} in all)" if len(words) > SHOWN_TEXTS else ""
    print(f"texts that could be tags: {', '.join(words[:SHOWN_TEXTS]) + more if words else 'none'}")
    symbol_layers = survey.symbol_layers()
    if symbol_layers:
        print(f"circles/points with a tag-like text beside them (tag_symbol_layers): {', '.join(symbol_layers)}")
    print(f"blocks with a {survey.tag_attribute} attribute: {survey.tagged_inserts}"
          + (f"; {survey.suggested_tag_attribute()} reads as a tag on other blocks"
             if survey.suggested_tag_attribute() else ""))
    source = {"header": f"$INSUNITS={survey.header_code}", "config": "config or --units",
              "none": f"unitless, $INSUNITS={survey.header_code}"}[survey.units_source]
    print(f"units: {survey.units or 'none'} ({source})"
          + (f"; plausible in {', '.join(survey.likely_units)}" if survey.likely_units else ""))
    e = survey.extents_m
    if e is not None:
        w, d, h = e.size_m
        print(f"route extents: {w:.2f} x {d:.2f} x {h:.2f} {unit}, median piece {e.median_piece_m:.2f} {unit}")
    if survey.scale is not None:
        print("scale: plausible" if survey.scale.plausible else f"scale: NOT plausible: {survey.scale.reason}")


def run_layers(args: argparse.Namespace) -> int:
    """Survey the drawing; print it (or its JSON); write a starting config when asked."""
    settings = settings_for(args)
    config = drawing_config(settings, getattr(args, "recover", False))
    drawing = Path(args.drawing)
    target = Path(args.write_config) if args.write_config else None
    if target is not None:
        inputs = [drawing] + ([Path(args.config)] if args.config else [])
        if any(_same_file(target, p) for p in inputs):
            raise ConfigError(file=target, problem="is an input of this run",
                              fix="--write-config writes a new file, give another name")
    survey = survey_drawing(drawing, config)
    if target is not None:
        try:
            write_text_atomic(target, starting_config(survey), encoding="utf-8")
        except OSError as exc:
            raise ConfigError(file=target, problem=f"cannot write the config ({exc.strerror})", fix="choose another path") from exc
        print(f"cablewright: starting config written to {target}; check it, then run "
              f"'cablewright size {drawing} --config {target} --circuits FILE'", file=sys.stderr)
    if args.json:
        print(json.dumps(survey.as_dict(), indent=2, ensure_ascii=False))
    else:
        _print_survey(survey)
    return 0


def register(subparsers: argparse._SubParsersAction) -> None:
    """The ``layers`` parser: what a drawing holds, and a starting config."""
    layers = subparsers.add_parser(
        "layers", help="what a drawing holds: layers, blocks, texts, units; a starting config")
    layers.add_argument("drawing", help="the drawing (.dxf)")
    layers.add_argument("--write-config", metavar="FILE",
                        help="write a starting TOML config from the suggestions (never over an input file)")
    layers.add_argument("--recover", action="store_true", help="read what can be read of a damaged DXF")
    units_option(layers)
    common_options(layers)
    layers.set_defaults(handler=run_layers)
