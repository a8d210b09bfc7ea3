"""Write every output of ``size`` into the output folder, all or nothing.

The files are first written into a hidden staging folder inside the output
folder, then renamed into place one by one (contract.md: an interrupted run
leaves no half-written file).
"""

from __future__ import annotations

import logging
import os
import shutil
import tempfile
from pathlib import Path

from cablewright.extract.errors import DrawingReadError
from cablewright.extract.model import UNIT_TO_M

from .config import Settings
from .console import CAUTION

__all__ = ["write_outputs", "output_names", "report_config", "job_takeoff", "job_document", "changes_json",
           "drawing_entry", "drawing_facts"]

log = logging.getLogger(__name__)


def output_names(drawing: Path) -> dict[str, str]:
    """File names of the outputs for ``drawing``."""
    return {
        "dxf": f"{drawing.stem}_annotated.dxf",
        "csv": "schedule.csv",
        "xlsx": "schedule.xlsx",
        "json": "schedule.json",
        "html": "report.html",
        "pdf": "report.pdf",
        "png": "preview.png",
        "changes": "changes.json",
    }


def job_takeoff(job, drawing: Path, settings: Settings):
    """The job's take-off (quantities, devices, fill) and the top-level keys of schedule.json."""
    from cablewright.annotate.takeoff import build_takeoff, document_extras

    takeoff = build_takeoff(job.outcomes, job.measurement.segments, job.per_segment, settings.sizing)
    extras = document_extras(takeoff, drawing, settings.sizing)
    entry = drawing_entry(job.measurement)
    if entry:
        extras["drawing"] = entry
    extras["header"] = _document_header(job, drawing, settings)
    return takeoff, extras


def _document_header(job, drawing: Path, settings: Settings) -> dict:
    """``header``: tool, input and its hash, config and its hash, date, standard editions."""
    import dataclasses

    from cablewright.annotate.doc_header import document_header

    source = None if settings.source == "defaults" else settings.source
    values = {"drawing": settings.drawing, "routes": settings.routes, "annotate": settings.annotate,
              "ifc": settings.ifc, "sizing": dataclasses.asdict(settings.sizing)}
    return document_header(job.outcomes, drawing, source, values)


def job_document(job, extras) -> dict:
    """The job's schedule.json as a dict (what :func:`.changes.compare_documents` reads)."""
    from cablewright.annotate.jsonout import document

    return {**document(job.outcomes, "size"), **extras}


def _annotate_config(settings: Settings):
    from dataclasses import fields, replace

    from cablewright.annotate.dxf_writer import AnnotateConfig
    from cablewright.annotate.report_trace import ReportConfig
    from cablewright.extract.errors import ConfigError

    base = AnnotateConfig()
    known = {f.name for f in fields(AnnotateConfig)}
    report_keys = {f.name for f in fields(ReportConfig)}
    for key in settings.annotate:
        if key not in known | report_keys:
            raise ConfigError(f"{settings.source}: unknown key {key!r} in [annotate]; "
                              f"known: {', '.join(sorted(known | report_keys))}")
    return replace(base, **{k: v for k, v in settings.annotate.items() if k in known})


def report_config(settings: Settings):
    """The report's ``[annotate]`` keys (project, revision, date), each a string."""
    from dataclasses import fields

    from cablewright.annotate.report_trace import ReportConfig
    from cablewright.extract.errors import ConfigError

    values = {}
    for f in fields(ReportConfig):
        if f.name in settings.annotate:
            value = settings.annotate[f.name]
            if not isinstance(value, (str, int, float)) or isinstance(value, bool):
                raise ConfigError(f"{settings.source}: [annotate] {f.name} = {value!r} must be text")
            values[f.name] = str(value)
    return ReportConfig(**values)


def write_outputs(job, drawing: Path, out_dir: Path, settings: Settings, quiet: bool = False,
                  takeoff=None, extras=None, changes=None, previous_name: str = "") -> list[Path]:
    """Write the annotated DXF, schedule (csv, xlsx, json), preview and report.

    ``takeoff``/``extras`` come from :func:`job_takeoff` (computed when not
    given); ``changes`` (a :class:`.changes.ChangeReport` against the run in
    ``previous_name``) adds ``changes.json`` and a report section.
    Returns the final paths.  Raises :class:`DrawingReadError` when the folder
    cannot be written; nothing partial is left behind.
    """
    from cablewright.annotate.dxf_writer import write_annotated_dxf
    from cablewright.annotate.preview import render_preview_png
    from cablewright.annotate.report import write_report_html
    from cablewright.annotate.report_pdf import write_report_pdf
    from cablewright.annotate.report_sections import changes_section, takeoff_sections
    from cablewright.annotate.schedule_files import (
        write_schedule_csv,
        write_schedule_json,
        write_schedule_xlsx,
    )
    from cablewright.annotate.takeoff import xlsx_sheets

    names = output_names(drawing)
    measurement = job.measurement
    if takeoff is None or extras is None:
        takeoff, extras = job_takeoff(job, drawing, settings)
    out_dir = Path(out_dir)
    try:
        out_dir.mkdir(parents=True, exist_ok=True)
        stage = Path(tempfile.mkdtemp(prefix=".cablewright-", dir=out_dir))
    except OSError as exc:
        raise DrawingReadError(f"{out_dir}: cannot create the output folder ({exc.strerror}); choose another --out") from exc
    try:
        config = _annotate_config(settings)
        units_per_m = 1.0 / UNIT_TO_M.get(measurement.units, 1.0)
        dxf_input = drawing
        document = None
        if drawing.suffix.lower() != ".dxf":  # IFC: a plan view drawn from the measurement
            dxf_input = _plan_view_for(measurement, stage)
        else:  # the drawing parsed by the extract stage, not read a second time
            document = getattr(measurement, "source_document", None)
        if document is None:
            import ezdxf

            try:
                document = ezdxf.readfile(dxf_input)
            except (OSError, ezdxf.DXFStructureError) as exc:
                raise DrawingReadError(f"{dxf_input}: cannot read the drawing ({exc}); "
                                       "check the path or re-export it") from exc
        _record_units(document, measurement)
        # our marks are added to the document in memory and it is saved under the
        # output name only; the preview is drawn from the same annotated document
        summary = write_annotated_dxf(dxf_input, stage / names["dxf"], job.outcomes,
                                      measurement.segments, job.per_segment,
                                      measurement.equipment, units_per_m, config,
                                      document=document)
        write_schedule_csv(stage / names["csv"], job.outcomes)
        write_schedule_xlsx(stage / names["xlsx"], job.outcomes, extra_sheets=xlsx_sheets(takeoff))
        write_schedule_json(stage / names["json"], job.outcomes, extras)
        sections = takeoff_sections(takeoff)
        if changes is not None:
            from cablewright.annotate.atomic import write_text_atomic

            write_text_atomic(stage / names["changes"], changes_json(changes, previous_name), encoding="utf-8")
            sections.insert(0, changes_section(changes, previous_name))
        ours = dict(summary.layers)
        schedule_layer = ours.pop("schedule", config.schedule_layer)
        png = render_preview_png(document, lean_skip_layers=(schedule_layer,),
                                 keep_layers=tuple(ours.values()))
        (stage / names["png"]).write_bytes(png)
        report_cfg = report_config(settings)
        version = extras.get("tool", {}).get("version", "")
        write_report_html(stage / names["html"], job.outcomes, title=f"Cable sizing: {drawing.name}",
                          drawing_name=drawing.name, preview_png=png, cautions=CAUTION,
                          extra_sections=sections, drawing_facts=drawing_facts(measurement),
                          config=report_cfg, tool_version=version)
        write_report_pdf(stage / names["pdf"], job.outcomes, title=f"Cable sizing: {drawing.name}",
                         drawing_name=drawing.name, cautions=CAUTION, config=report_cfg,
                         tool_version=version)
        keys = ["dxf", "csv", "xlsx", "json", "png", "html", "pdf"] + (["changes"] if changes is not None else [])
        if drawing.suffix.lower() == ".ifc":  # a copy of the model with the sized cables
            from cablewright.annotate.ifc_writer import write_ifc_copy

            names["ifc"] = f"{drawing.stem}_sized.ifc"
            write_ifc_copy(drawing, stage / names["ifc"], job.outcomes)
            keys.append("ifc")
        final = []
        for key in keys:
            target = out_dir / names[key]
            os.replace(stage / names[key], target)
            final.append(target)
        return final
    finally:
        shutil.rmtree(stage, ignore_errors=True)


def changes_json(changes, previous_name: str = "") -> str:
    """``changes.json`` / ``compare --json``: the contract's document, one circuit per line."""
    import json

    data = changes.to_dict()
    if previous_name:
        data["previous"] = previous_name
    encode = json.JSONEncoder(ensure_ascii=False, separators=(", ", ": ")).encode
    lines = []
    for key, value in data.items():
        if isinstance(value, list):
            body = ",\n".join("    " + encode(v) for v in value)
            lines.append(f"  {encode(key)}: [\n" + (body + "\n" if body else "") + "  ]")
        else:
            lines.append(f"  {encode(key)}: {encode(value)}")
    return "{\n" + ",\n".join(lines) + "\n}\n"


def _plan_view_for(measurement, stage: Path) -> Path:
    """A plan-view DXF of the route network, for models that are not DXF (IFC)."""
    from cablewright.annotate.plan_view import write_plan_view

    path = stage / "_plan_view.dxf"
    write_plan_view(measurement, path)
    return path


def _record_units(document, measurement) -> None:
    """The annotated copy's ``$INSUNITS`` says the units it was read in, when the config gave them."""
    from cablewright.extract.units import INSUNITS

    summary = getattr(measurement, "drawing_summary", None)
    if summary is None or summary.units_source != "config":
        return
    code = next((c for c, (name, _) in INSUNITS.items() if name == summary.units), None)
    if code is not None:
        document.header["$INSUNITS"] = code


def drawing_entry(measurement) -> dict | None:
    """The ``"drawing"`` key of ``schedule.json``: units, where they came from, extents [m]."""
    summary = getattr(measurement, "drawing_summary", None)
    return summary.as_dict() if summary is not None else None


def drawing_facts(measurement) -> list[tuple[str, str]]:
    """How the drawing was read, as (name, text) rows for the report."""
    summary = getattr(measurement, "drawing_summary", None)
    if summary is None:
        return []
    source = "from the config or --units" if summary.units_source == "config" else "from $INSUNITS"
    facts = [("units", f"{summary.units} ({source}; $INSUNITS = {summary.header_code})")]
    if summary.extents is not None:
        w, d, h = summary.extents.size_m
        facts.append(("route extents", f"{w:.2f} m x {d:.2f} m, {h:.2f} m high; "
                                       f"median route piece {summary.extents.median_piece_m:.2f} m"))
    if summary.scale is not None:
        if summary.scale.plausible:
            facts.append(("scale", "plausible for a building or plant"))
        else:
            likely = (f"; likely drawn in {' or '.join(summary.scale.likely_units[:2])}"
                      if summary.scale.likely_units else "")
            facts.append(("scale", f"NOT plausible: {summary.scale.reason}{likely} - check the units"))
    return facts
