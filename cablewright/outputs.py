"""Write every output of ``size`` into the output folder, all or nothing.

The output set is replaced as a whole (issue 18, item 8):

- before anything is read or written, :func:`output_session` refuses an
  output folder that is, holds or would overwrite an input (drawing, schedule,
  config), takes a lock beside the folder so two runs never write one folder
  at once, and clears staging folders a killed run left behind;
- :func:`write_outputs` writes every file into a new hidden folder beside the
  output folder, carries over what else the old folder held (hard links, so
  nothing is copied or moved), then swaps the new folder in with one atomic
  exchange of the two names; the old set is removed after.

Killed at any moment, the output folder holds either the whole old set or the
whole new one; a run that fails leaves it exactly as it was (and makes no
empty folder).

References
----------
.. [1] Linux man-pages, rename(2): ``renameat2`` with ``RENAME_EXCHANGE``
   "atomically exchange oldpath and newpath" (Linux 3.15, glibc 2.28).
.. [2] Linux man-pages, flock(2): the lock goes with the open file and ends
   when the process ends, also on ``kill -9``.
.. [3] contract.md, "Commands": outputs are written to a temporary name and
   renamed into place, so an interrupted run leaves no half-written file.
"""

from __future__ import annotations

import ctypes
import dataclasses
import errno
import logging
import os
import shutil
import sys
import tempfile
from collections.abc import Iterable, Iterator
from contextlib import contextmanager
from pathlib import Path

from cablewright.core.errors import DrawingReadError, OutputError
from cablewright.extract.model import UNIT_TO_M

from .config import Settings
from .console import CAUTION

__all__ = ["write_outputs", "output_names", "output_session", "check_inputs_not_outputs", "STAGE_TAG",
           "job_takeoff", "job_document", "changes_json", "drawing_entry", "drawing_facts", "report_config"]

log = logging.getLogger(__name__)

#: Infix of our hidden folders beside the output folder: ``.<out>.cablewright-stage-*``
#: (a run being written) and ``.<out>.cablewright-old-*`` (the set being replaced).
STAGE_TAG = ".cablewright-"


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

    takeoff = build_takeoff(job.outcomes, job.measurement.segments, job.per_segment, settings.sizing,
                            job.measurement.carrier_sizes)
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
    def plain(value):
        return dataclasses.asdict(value) if dataclasses.is_dataclass(value) else value

    values = {name: plain(getattr(settings, name)) for name in ("drawing", "sizing", "annotate", "ifc")}
    return document_header(job.outcomes, drawing, source, values)


def job_document(job, extras) -> dict:
    """The job's schedule.json as a dict (what :func:`.changes.compare_documents` reads)."""
    from cablewright.annotate.jsonout import document

    return {**document(job.outcomes, "size"), **extras}


# -- the folder: inputs, lock, stale staging -----------------------------------------


def _absolute(path: str | os.PathLike[str]) -> Path:
    return Path(os.path.realpath(os.path.abspath(os.fspath(path))))


def check_inputs_not_outputs(out_dir: str | os.PathLike[str], inputs: Iterable[tuple[str, str | os.PathLike[str] | None]]) -> None:
    """Refuse an output folder that equals, holds or would overwrite an input.

    Parameters
    ----------
    out_dir : path-like
        The output folder (``--out``), which the run replaces as a whole.
    inputs : iterable of (str, path-like or None)
        ``(role, path)`` of each input: ``("drawing", ...)``, ``("schedule", ...)``,
        ``("config", ...)``; ``None`` paths are skipped.

    Raises
    ------
    OutputError
        Naming the input, its role and what to do.
    """
    out = _absolute(out_dir)
    if out.parent == out:
        raise OutputError(file=out, problem="the output folder cannot be the root of the file system", fix="choose a folder of its own with --out")
    cwd = _absolute(os.getcwd())
    if out == cwd or out in cwd.parents:
        raise OutputError(file=out, problem="the output folder holds the current folder and would be replaced", fix="choose a folder of its own with --out")
    if out.exists() and not out.is_dir():
        raise OutputError(file=out, problem="--out names a file, not a folder", fix="choose a folder for the outputs")
    for role, path in inputs:
        if path is None:
            continue
        given = _absolute(path)
        if given == out or out in given.parents:
            raise OutputError(file=path, problem=f'the {role} is inside the output folder {out}, which this run replaces',
                              fix="choose another --out or move the input out of it")


def _lock_path(out: Path) -> Path:
    return out.parent / f".{out.name}.cablewright.lock"


@contextmanager
def _locked(out: Path) -> Iterator[None]:
    """Hold an exclusive lock beside ``out``; a second run fails at once [2]_."""
    path = _lock_path(out)
    try:
        import fcntl
    except ImportError:  # pragma: no cover - not POSIX: no lock, said once
        log.warning("%s: no file locking on this system; do not run two jobs on one --out", out)
        yield
        return
    try:
        fd = os.open(path, os.O_RDWR | os.O_CREAT, 0o644)
    except OSError as exc:
        raise OutputError(file=out, problem=f"cannot create the lock file {path} ({exc.strerror})", fix="choose another --out") from exc
    try:
        try:
            fcntl.flock(fd, fcntl.LOCK_EX | fcntl.LOCK_NB)
        except OSError as exc:
            if exc.errno not in (errno.EWOULDBLOCK, errno.EAGAIN, errno.EACCES):
                raise
            raise OutputError(file=out, problem=f'another cablewright run is writing this folder (lock {path})',
                              fix="wait for it to finish or choose another --out") from None
        try:  # the file may have been removed by the run that held it before us
            same = os.path.samestat(os.stat(path), os.fstat(fd))
        except FileNotFoundError:
            same = False
        if not same:
            raise OutputError(file=out, problem=f'another cablewright run has just taken this folder (lock {path})',
                              fix="wait for it to finish or choose another --out")
        os.write(fd, f"{os.getpid()}\n".encode())
        try:
            yield
        finally:
            try:  # removed while still held, so no run can take a stale file
                os.unlink(path)
            except OSError:
                pass
    finally:
        os.close(fd)


def _clean_stale(out: Path) -> None:
    """Remove what a killed run left: staging folders, an interrupted swap."""
    prefix = f".{out.name}{STAGE_TAG}"
    try:
        entries = sorted(out.parent.iterdir())
    except OSError:
        return
    for entry in entries:
        name = entry.name
        if not name.startswith(prefix) or not entry.is_dir():
            continue
        if name.startswith(prefix + "old-") and not out.exists():
            log.warning("%s: an earlier run was stopped while replacing the outputs; the previous set is put back", out)
            os.rename(entry, out)
            continue
        log.info("removing %s, left by a run that was stopped", entry)
        shutil.rmtree(entry, ignore_errors=True)
    if out.is_dir():  # staging folders of older versions, inside the output folder
        for entry in sorted(out.iterdir()):
            if entry.name.startswith(STAGE_TAG) and entry.is_dir():
                shutil.rmtree(entry, ignore_errors=True)


def make_parents(folder: Path) -> list[Path]:
    """Create ``folder`` and its missing parents; return those created (outermost first)."""
    missing = []
    probe = folder
    while not probe.exists():
        missing.append(probe)
        probe = probe.parent
    try:
        folder.mkdir(parents=True, exist_ok=True)
    except OSError as exc:
        raise OutputError(file=folder, problem=f"cannot create the output folder ({exc.strerror})", fix="choose another --out") from exc
    return list(reversed(missing))


@contextmanager
def output_session(out_dir: str | os.PathLike[str],
                   inputs: Iterable[tuple[str, str | os.PathLike[str] | None]] = ()) -> Iterator[Path]:
    """Claim ``out_dir`` for one run: inputs checked, lock held, stale staging cleared.

    Call before any input is read.  Yields the absolute output folder.  On
    leaving, the lock is released and removed; folders made only for the lock
    are removed again when the run wrote nothing (no empty folder is left).

    Raises
    ------
    OutputError
        The folder is or holds an input, another run holds it, it cannot be created.
    """
    out = _absolute(out_dir)
    check_inputs_not_outputs(out, inputs)
    created = make_parents(out.parent)
    try:
        with _locked(out):
            _clean_stale(out)
            yield out
    finally:
        for folder in reversed(created):
            try:
                folder.rmdir()  # only when empty: nothing of ours or anyone's in it
            except OSError:
                break


# -- writing and swapping ------------------------------------------------------------


def _annotate_config(settings: Settings):
    """The annotate stage's config (``[annotate]``, validated at start-up)."""
    return settings.annotate


def _umask() -> int:
    mask = os.umask(0)
    os.umask(mask)
    return mask


def report_config(settings: Settings):
    """The report's header keys of ``[annotate]`` (project, revision, date)."""
    from cablewright.annotate.report_trace import ReportConfig

    a = settings.annotate
    return ReportConfig(project=a.project, revision=a.revision, date=a.date)


def write_outputs(job, drawing: Path, out_dir: Path, settings: Settings, quiet: bool = False,
                  takeoff=None, extras=None, changes=None, previous_name: str = "") -> list[Path]:
    """Write the annotated DXF, schedule (csv, xlsx, json), preview and report.

    ``takeoff``/``extras`` come from :func:`job_takeoff` (computed when not
    given); ``changes`` (a :class:`.changes.ChangeReport` against the run in
    ``previous_name``) adds ``changes.json`` and a report section.

    Every file is written into a staging folder beside ``out_dir``, which then
    replaces ``out_dir`` as a whole (module docstring).  Returns the final
    paths.  Raises :class:`OutputError` when the folder cannot be written;
    nothing partial is left behind.
    """
    out = _absolute(out_dir)
    try:
        out.parent.mkdir(parents=True, exist_ok=True)
        stage = Path(tempfile.mkdtemp(prefix=f".{out.name}{STAGE_TAG}stage-", dir=out.parent))
    except OSError as exc:
        raise OutputError(file=out, problem=f"cannot create the output folder ({exc.strerror})", fix="choose another --out") from exc
    try:
        try:
            if takeoff is None or extras is None:
                takeoff, extras = job_takeoff(job, Path(drawing), settings)
            names = _write_all(job, Path(drawing), stage, settings, takeoff, extras, changes, previous_name)
            os.chmod(stage, (out.stat().st_mode & 0o7777) if out.is_dir() else 0o777 & ~_umask())
            if out.is_dir():
                _carry_over(out, stage, set(names.values()) | set(output_names(Path(drawing)).values()))
            _swap_in(stage, out)
        except OSError as exc:
            raise OutputError(file=out, problem=f'cannot write the outputs ({exc.strerror or exc})',
                              fix="free some space or choose another --out") from exc
        return [out / name for name in names.values()]
    finally:
        shutil.rmtree(stage, ignore_errors=True)


def _write_all(job, drawing: Path, stage: Path, settings: Settings, takeoff, extras,
               changes=None, previous_name: str = "") -> dict[str, str]:
    """Every output file into ``stage``; returns key -> file name, in writing order."""
    from cablewright.annotate.drawing import AnnotationInput, write_annotated_dxf
    from cablewright.annotate.report import write_report_html
    from cablewright.annotate.report_pdf import write_report_pdf
    from cablewright.annotate.report_sections import changes_section, takeoff_sections
    from cablewright.annotate.reproducible import file_digest, seeded_ifc_guids
    from cablewright.annotate.rows import length_unit, rule_set_cautions
    from cablewright.annotate.schedule_files import (
        write_schedule_csv,
        write_schedule_json,
        write_schedule_xlsx,
    )
    from cablewright.annotate.takeoff import xlsx_sheets

    from .collector import release

    names = output_names(drawing)
    measurement = job.measurement
    standard = settings.sizing.standard
    # lengths in the rule set's unit unless [annotate] length_unit says (annotate/rows.py);
    # the NEC caution (authority having jurisdiction) on the drawing note and the report
    unit = length_unit(standard, settings.annotate.length_unit)
    config = dataclasses.replace(_annotate_config(settings),
                                 cautions=rule_set_cautions(settings.annotate.cautions, standard))
    cautions = rule_set_cautions(CAUTION, standard)
    units_per_m = 1.0 / UNIT_TO_M.get(measurement.units, 1.0)
    seed = file_digest(drawing)
    scratch = stage / ".scratch"
    dxf_input, document, stream, prepare = _writer_source(drawing, measurement, scratch, seed)
    # our marks are added to the document in memory and it is saved under the
    # output name only; the preview is drawn from the measurement and the marks placed
    from cablewright.annotate.revision import changed_circuit_ids, fill_marks

    marks = AnnotationInput(job.outcomes, measurement.segments, job.per_segment,
                            measurement.equipment, units_per_m,
                            changed=changed_circuit_ids(changes) if changes is not None else frozenset(),
                            revision=config.revision,
                            fill_marks=fill_marks(takeoff.segments) if takeoff is not None else ())
    request = None
    if stream is not None:
        from cablewright.annotate.drawing.append_writer import AppendRequest

        request = AppendRequest(stream, _appended_header(seed, measurement), prepare)
    summary = write_annotated_dxf(dxf_input, stage / names["dxf"], marks, config, document=document,
                                  stream=request)
    # the parsed drawing (the full writer's): the preview's background on a small drawing;
    # an appended copy has none (its scratch document holds the LINEs as shapely lines only)
    document = None if summary.appended else summary.document
    summary = dataclasses.replace(summary, document=None)  # its marks are written: let it go
    # how the marks were placed, the last resorts counted (issue 12: never silent)
    extras = {**extras, "drawing_marks": {"text_height": summary.text_height,
                                          "segment_ids": summary.segment_ids,
                                          **summary.placement}}
    write_schedule_csv(stage / names["csv"], job.outcomes, unit)
    write_schedule_xlsx(stage / names["xlsx"], job.outcomes, extra_sheets=xlsx_sheets(takeoff, unit), unit=unit)
    write_schedule_json(stage / names["json"], job.outcomes, extras)
    sections = takeoff_sections(takeoff, unit)
    if changes is not None:
        from cablewright.annotate.atomic import write_text_atomic

        write_text_atomic(stage / names["changes"], changes_json(changes, previous_name), encoding="utf-8")
        sections.insert(0, changes_section(changes, previous_name, unit))
    png = _preview(measurement, summary, document, units_per_m)
    (stage / names["png"]).write_bytes(png)
    document = None
    release()  # the drawing documents' cycles, before the reports (the run's memory peak)
    report_cfg = report_config(settings)
    version = extras.get("tool", {}).get("version", "")
    write_report_html(stage / names["html"], job.outcomes, title=f"Cable sizing: {drawing.name}",
                      drawing_name=drawing.name, preview_png=png, cautions=cautions,
                      extra_sections=sections, drawing_facts=drawing_facts(measurement),
                      config=report_cfg, tool_version=version, unit=unit)
    write_report_pdf(stage / names["pdf"], job.outcomes, title=f"Cable sizing: {drawing.name}",
                     drawing_name=drawing.name, cautions=cautions, config=report_cfg,
                     tool_version=version, unit=unit)
    if drawing.suffix.lower() == ".ifc":  # a copy of the model with the sized cables
        from cablewright.annotate.ifc_writer import write_ifc_copy

        names["ifc"] = f"{drawing.stem}_sized.ifc"
        with seeded_ifc_guids(seed):
            write_ifc_copy(drawing, stage / names["ifc"], job.outcomes)
    shutil.rmtree(scratch, ignore_errors=True)
    order = ["dxf", "csv", "xlsx", "json", "png", "html", "pdf"] + (["changes"] if changes is not None else []) + ["ifc"]
    return {key: names[key] for key in order if key in names}


def _preview(measurement, summary, document, units_per_m: float) -> bytes:
    """The preview PNG from the measurement's routes and the marks the writer placed.

    The drawing's own linework is a background where a parsed document is at
    hand (a small drawing); otherwise the equipment is drawn as squares.  On a
    large job (no background) our schedule table is left out: it is far larger
    than the plant and is in the schedule files and the report.
    """
    from cablewright.annotate.preview import render_preview_png, route_lines
    from cablewright.annotate.sketch import background_sketch

    ours = dict(summary.layers)
    route_layers = {str(s.layer) for s in measurement.segments.values()}
    background = None
    if document is not None:
        background = background_sketch(document, route_layers | set(ours.values()))
    equipment = () if background is not None else [
        (e.position_m[0] * units_per_m, e.position_m[1] * units_per_m)
        for e in measurement.equipment.values()]
    skip = () if background is not None else (ours.get("schedule", ""),)
    sketch = getattr(summary, "sketch", None)  # a writer that kept no sketch: routes alone
    layer_aci = sketch.layer_aci if sketch is not None else {}
    routes = route_lines(measurement.segments.values(), units_per_m, layer_aci)
    return render_preview_png(routes, sketch, background=background, equipment=equipment,
                              text_height=summary.text_height, skip_layers=skip)


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


def _link_or_copy(src: str, dst: str) -> str:
    try:
        os.link(src, dst, follow_symlinks=False)
    except OSError:
        shutil.copy2(src, dst, follow_symlinks=False)
    return dst


def _carry_over(old: Path, stage: Path, ours: set[str]) -> None:
    """Bring what else the old folder holds into the new one, as hard links.

    Files and folders of the user's (or of an earlier run for another drawing)
    stay in the output folder across the swap; our own file names are the new
    run's.  Hard links copy nothing and leave the old folder as it is.
    """
    for entry in sorted(old.iterdir()):
        if entry.name in ours or STAGE_TAG in entry.name or entry.name.endswith(".cablewright.lock"):
            continue  # ours, or another run's staging or lock (a batch writing inside this folder)
        target = stage / entry.name
        if entry.is_symlink() or not entry.is_dir():
            _link_or_copy(str(entry), str(target))
        else:
            shutil.copytree(entry, target, symlinks=True, copy_function=_link_or_copy)


def _exchange(a: Path, b: Path) -> bool:
    """Swap two folder names in one step (Linux ``renameat2``, [1]_); False if not available."""
    if not sys.platform.startswith("linux"):
        return False
    try:
        libc = ctypes.CDLL(None, use_errno=True)
        renameat2 = libc.renameat2
    except (OSError, AttributeError):
        return False
    renameat2.argtypes = [ctypes.c_int, ctypes.c_char_p, ctypes.c_int, ctypes.c_char_p, ctypes.c_uint]
    renameat2.restype = ctypes.c_int
    at_fdcwd, rename_exchange = -100, 2  # <fcntl.h> AT_FDCWD, <linux/fs.h> RENAME_EXCHANGE
    if renameat2(at_fdcwd, os.fsencode(a), at_fdcwd, os.fsencode(b), rename_exchange) == 0:
        return True
    code = ctypes.get_errno()
    if code in (errno.EINVAL, errno.ENOSYS, errno.ENOTSUP, errno.EOPNOTSUPP):
        return False  # file system without exchange: the two-rename way
    raise OSError(code, os.strerror(code), str(b))


def _swap_in(stage: Path, out: Path) -> None:
    """Put the staged folder at ``out``; the old set (if any) ends up in ``stage``'s place."""
    if not out.exists():
        os.rename(stage, out)
        return
    if _exchange(stage, out):
        return
    # two renames; a run stopped between them is put right by the next (_clean_stale)
    old = out.parent / f".{out.name}{STAGE_TAG}old-{os.getpid()}"
    os.rename(out, old)
    os.rename(stage, out)
    os.rename(old, stage)


def _writer_source(drawing: Path, measurement, scratch: Path, seed: str):
    """What the DXF writer starts from: (input path, parsed document or None,
    streamed obstacles or None, the step pinning a parsed document's metadata)."""
    from cablewright.annotate.reproducible import pin_dxf_metadata

    dxf_input = drawing
    document = stream = None
    if drawing.suffix.lower() != ".dxf":  # IFC: a plan view drawn from the measurement,
        from cablewright.annotate.plan_view import plan_view_document

        scratch.mkdir()  # in memory (no file round trip); the name is for messages only
        dxf_input = scratch / "_plan_view.dxf"
        document = plan_view_document(measurement)
    else:  # the drawing parsed by the extract stage, not read a second time
        document = getattr(measurement, "source_document", None)
        if _is_streamed(document):  # streamed: the appending writer copies the bytes
            stream, document = document, None
    if document is None and stream is None:
        import ezdxf

        try:
            document = ezdxf.readfile(dxf_input)
        except (OSError, ezdxf.DXFStructureError) as exc:
            raise DrawingReadError(file=dxf_input, problem=f'cannot read the drawing ({exc})',
                                   fix="check the path or re-export it") from exc

    def prepare(doc) -> None:  # no run time and no random GUID in it (annotate.reproducible)
        pin_dxf_metadata(doc, seed, own_drawing=dxf_input is not drawing)
        _record_units(doc, measurement)

    if document is not None:
        prepare(document)
    return dxf_input, document, stream, prepare


def _is_streamed(document) -> bool:
    from cablewright.extract.dxf_stream_scan import StreamObstacles

    return isinstance(document, StreamObstacles)


def _units_code(measurement) -> int | None:
    """The ``$INSUNITS`` code of the units the config gave, or None (read from the drawing)."""
    from cablewright.extract.units import INSUNITS

    summary = getattr(measurement, "drawing_summary", None)
    if summary is None or summary.units_source != "config":
        return None
    return next((c for c, (name, _) in INSUNITS.items() if name == summary.units), None)


def _appended_header(seed: str, measurement) -> dict:
    """What the appending writer sets in the header: the version GUID as the full
    writer pins it, and ``$INSUNITS`` when the config gave the units."""
    from cablewright.annotate.reproducible import dxf_version_guid

    header = {"$VERSIONGUID": (2, dxf_version_guid(seed))}
    code = _units_code(measurement)
    if code is not None:
        header["$INSUNITS"] = (70, str(code))
    return header


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
