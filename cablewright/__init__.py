"""cablewright: route, group and size low-voltage power cables from DXF and IFC drawings.

The Python API (numpydoc in :mod:`cablewright.api`)::

    import cablewright

    measurement = cablewright.measure("plant.dxf", "circuits.csv")   # routes, lengths, grouping
    job = cablewright.size(measurement)                               # IEC 60364 sizing
    cablewright.write_outputs(job, "plant.dxf", "results/")           # DXF, schedule, report

Results are a design aid, to be checked by a qualified person against local
wiring rules, the cable maker's data and the installation as built.
"""

from __future__ import annotations

from .api import measure, settings, size, write_outputs

__all__ = ["measure", "settings", "size", "write_outputs", "__version__"]


def _version() -> str:
    from importlib.metadata import PackageNotFoundError, version

    try:
        return version("cablewright")
    except PackageNotFoundError:  # pragma: no cover - run from a source tree
        return "unknown"


__version__ = _version()
