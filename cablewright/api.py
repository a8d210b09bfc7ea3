"""The Python API: measure a drawing, size its circuits, write the outputs.

Thin wrappers over :mod:`cablewright.pipeline` and :mod:`cablewright.outputs`,
the same path the ``size`` and ``routes`` commands take; ``import cablewright``
gives them.  Errors are :class:`cablewright.core.errors.CableRouteError`
subclasses, with the same one-line messages the command line prints.

Examples
--------
>>> import cablewright
>>> from cablewright.commands_drawing import SAMPLE_DIR
>>> m = cablewright.measure(SAMPLE_DIR / "pumping_station.dxf",
...                         SAMPLE_DIR / "pumping_station_circuits.csv")
>>> len(m.rows)
19
>>> job = cablewright.size(m)
>>> sorted({o.status for o in job.outcomes})
['fail', 'ok']
"""

from __future__ import annotations

from pathlib import Path
from typing import TYPE_CHECKING, Union

if TYPE_CHECKING:
    from cablewright.extract.model import Measurement

    from .config import Settings
    from .pipeline import JobResult

__all__ = ["settings", "measure", "size", "write_outputs"]

ConfigLike = Union["Settings", str, Path, None]


def settings(config: ConfigLike = None) -> Settings:
    """The validated settings of a TOML file (or the defaults).

    Parameters
    ----------
    config : Settings, str or Path, optional
        A config file (``cablewright/default_config.toml`` lists every key),
        settings already loaded, or ``None`` for the defaults.

    Returns
    -------
    Settings

    Raises
    ------
    ConfigError
        Unknown section or key, wrong type or value out of range, one line each.

    Examples
    --------
    >>> settings().sizing.disconnection_upsize
    True
    """
    from .config import Settings, load_settings

    if isinstance(config, Settings):
        return config
    return load_settings(config)


def measure(drawing: str | Path, circuits: str | Path | None = None, config: ConfigLike = None,
            recover: bool = False) -> Measurement:
    """Read a drawing (DXF or IFC), build the route network and route every circuit.

    Parameters
    ----------
    drawing : str or Path
        The ``.dxf`` drawing or ``.ifc`` model.
    circuits : str or Path, optional
        The circuit schedule (``.csv`` or ``.xlsx``); ``None`` reads the
        circuits from the equipment blocks' attributes.
    config : Settings, str or Path, optional
        See :func:`settings`.
    recover : bool
        Use what can be read of a damaged DXF and list what was lost.

    Returns
    -------
    Measurement
        Routes (routed and design lengths, segments), equipment, schedule rows,
        failures per circuit and the issues found (contract.md, "Lengths and grouping").

    Raises
    ------
    DrawingReadError, ScheduleError, ConfigError
        The input cannot be used.
    """
    from .pipeline import measure_drawing

    return measure_drawing(drawing, circuits, settings(config), recover)


def size(measurement: Measurement | str | Path, circuits: str | Path | None = None,
         config: ConfigLike = None) -> JobResult:
    """Size every circuit of a measurement (or of a drawing, measured first).

    Parameters
    ----------
    measurement : Measurement, str or Path
        What :func:`measure` returned, or a drawing to measure.
    circuits : str or Path, optional
        The schedule, when ``measurement`` is a drawing.
    config : Settings, str or Path, optional
        See :func:`settings`.

    Returns
    -------
    JobResult
        ``outcomes``: one :class:`cablewright.annotate.model.CircuitOutcome`
        per circuit (status, messages, route, grouping, sizing result with
        every check and its clause), in schedule order.
    """
    from .pipeline import size_measurement

    chosen = settings(config)
    if isinstance(measurement, (str, Path)):
        measurement = measure(measurement, circuits, chosen)
    return size_measurement(measurement, chosen)


def write_outputs(job: JobResult, drawing: str | Path, out_dir: str | Path,
                  config: ConfigLike = None) -> list[Path]:
    """Write the annotated DXF, the schedule (CSV, XLSX, JSON), preview and report.

    Parameters
    ----------
    job : JobResult
        What :func:`size` returned.
    drawing : str or Path
        The drawing it was measured from (the annotated copy starts from it;
        the input is never written to).
    out_dir : str or Path
        Output folder, created when missing; files are renamed into place
        only when all are written.
    config : Settings, str or Path, optional
        See :func:`settings` (``[annotate]`` sets layers and text).

    Returns
    -------
    list of Path
        The files written.
    """
    from .outputs import write_outputs as _write

    return _write(job, Path(drawing), Path(out_dir), settings(config), quiet=True)
