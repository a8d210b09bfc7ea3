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

__all__ = ["write_outputs", "output_names"]

log = logging.getLogger(__name__)


def output_names(drawing: Path) -> dict[str, str]:
    """File names of the outputs for ``drawing``."""
    return {
        "dxf": f"{drawing.stem}_annotated.dxf",
        "csv": "schedule.csv",
        "xlsx": "schedule.xlsx",
        "json": "schedule.json",
        "html": "report.html",
        "png": "preview.png",
    }


def _annotate_config(settings: Settings):
    """The annotate stage's config (``[annotate]``, validated at start-up)."""
    return settings.annotate


def write_outputs(job, drawing: Path, out_dir: Path, settings: Settings, quiet: bool = False) -> list[Path]:
    """Write the annotated DXF, schedule (csv, xlsx, json), preview and report.

    Returns the final paths.  Raises :class:`DrawingReadError` when the folder
    cannot be written; nothing partial is left behind.
    """
    from cablewright.annotate.dxf_writer import write_annotated_dxf
    from cablewright.annotate.preview import render_preview_png
    from cablewright.annotate.report import write_report_html
    from cablewright.annotate.schedule_files import (
        write_schedule_csv,
        write_schedule_json,
        write_schedule_xlsx,
    )

    names = output_names(drawing)
    measurement = job.measurement
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
        # our marks are added to the document in memory and it is saved under the
        # output name only; the preview is drawn from the same annotated document
        summary = write_annotated_dxf(dxf_input, stage / names["dxf"], job.outcomes,
                                      measurement.segments, job.per_segment,
                                      measurement.equipment, units_per_m, config,
                                      document=document)
        write_schedule_csv(stage / names["csv"], job.outcomes)
        write_schedule_xlsx(stage / names["xlsx"], job.outcomes)
        write_schedule_json(stage / names["json"], job.outcomes)
        ours = dict(summary.layers)
        schedule_layer = ours.pop("schedule", config.schedule_layer)
        png = render_preview_png(document, lean_skip_layers=(schedule_layer,),
                                 keep_layers=tuple(ours.values()))
        (stage / names["png"]).write_bytes(png)
        write_report_html(stage / names["html"], job.outcomes, title=f"Cable sizing: {drawing.name}",
                          drawing_name=drawing.name, preview_png=png, cautions=CAUTION)
        keys = ["dxf", "csv", "xlsx", "json", "png", "html"]
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


def _plan_view_for(measurement, stage: Path) -> Path:
    """A plan-view DXF of the route network, for models that are not DXF (IFC)."""
    from cablewright.annotate.plan_view import write_plan_view

    path = stage / "_plan_view.dxf"
    write_plan_view(measurement, path)
    return path
