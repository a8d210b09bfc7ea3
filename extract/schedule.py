"""Read the circuit schedule (.csv or .xlsx), or build it from block attributes.

contract.md, "The circuit schedule": header names case-insensitive, columns in any
order, extra columns kept; required columns ``circuit``, ``from``, ``to``, ``load``.
Cell text is kept as written; parsing numbers is the sizing stage's job.
"""

from __future__ import annotations

import csv
import logging
import os
import zipfile
from collections.abc import Iterable, Sequence
from pathlib import Path

from .errors import ScheduleError
from .model import Equipment, ScheduleRow

__all__ = ["REQUIRED_COLUMNS", "POSITION_COLUMNS", "read_schedule", "rows_from_equipment", "load_positions"]

logger = logging.getLogger(__name__)

#: Required schedule columns (contract.md, "The circuit schedule").
REQUIRED_COLUMNS = ("circuit", "from", "to", "load")


def _cell_text(value: object) -> str:
    if value is None:
        return ""
    if isinstance(value, float) and value.is_integer():
        return str(int(value))
    return str(value).strip()


def _read_csv(path: Path) -> list[tuple[int, list[str]]]:
    try:
        text = path.read_text(encoding="utf-8-sig")
    except UnicodeDecodeError:
        text = path.read_text(encoding="cp1252")
    try:
        dialect: type[csv.Dialect] | csv.Dialect = csv.Sniffer().sniff(text[:4096], delimiters=",;\t")
    except csv.Error:
        dialect = csv.excel
    out = []
    reader = csv.reader(text.splitlines(), dialect)
    for n, cells in enumerate(reader, start=1):
        out.append((n, [c.strip() for c in cells]))
    return out


def _read_xlsx(path: Path) -> list[tuple[int, list[str]]]:
    import openpyxl

    wb = openpyxl.load_workbook(path, read_only=True, data_only=True)
    try:
        names = {n.lower(): n for n in wb.sheetnames}
        ws = wb[names.get("circuits", wb.sheetnames[0])]
        return [
            (n, [_cell_text(v) for v in values])
            for n, values in enumerate(ws.iter_rows(values_only=True), start=1)
        ]
    finally:
        wb.close()


def _rows_to_schedule(source: str, table: Sequence[tuple[int, list[str]]]) -> list[ScheduleRow]:
    body = [(n, cells) for n, cells in table if any(c for c in cells)]
    if not body:
        raise ScheduleError(f"{source}: the schedule is empty; give a header row and one row per circuit")
    header_row, header = body[0]
    names = [h.strip().lower() for h in header]
    missing = [c for c in REQUIRED_COLUMNS if c not in names]
    if missing:
        raise ScheduleError(
            f"{source}: row {header_row} (the header) has no column {', '.join(missing)}; "
            f"required columns are {', '.join(REQUIRED_COLUMNS)}"
        )
    dup_cols = sorted({n for n in names if n and names.count(n) > 1})
    if dup_cols:
        raise ScheduleError(f"{source}: column {', '.join(dup_cols)} appears twice in the header; keep one")
    rows: list[ScheduleRow] = []
    seen: dict[str, int] = {}
    for n, cells in body[1:]:
        cells = cells + [""] * (len(names) - len(cells))
        fields = tuple((name, cells[k]) for k, name in enumerate(names) if name)
        values = dict(fields)
        cid = values["circuit"].strip()
        if not cid:
            raise ScheduleError(f"{source} row {n}: the circuit cell is blank; give every row a circuit id")
        if cid in seen:
            raise ScheduleError(
                f"{source}: circuit {cid} appears twice, rows {seen[cid]} and {n}; circuit ids must be unique"
            )
        seen[cid] = n
        rows.append(ScheduleRow(source, n, cid, values["from"].strip(), values["to"].strip(), fields))
    logger.info("%s: %d circuits", source, len(rows))
    return rows


def read_schedule(path: str | os.PathLike[str]) -> list[ScheduleRow]:
    """Read a circuit schedule.

    Parameters
    ----------
    path : str or path-like
        A ``.csv`` (comma, semicolon or tab separated, UTF-8) or ``.xlsx`` file
        (sheet ``circuits`` if present, else the first sheet).

    Returns
    -------
    list of ScheduleRow
        One per circuit, in file order.

    Raises
    ------
    ScheduleError
        Unreadable file, unknown format, missing required column, blank or
        duplicate circuit id.

    References
    ----------
    .. [1] contract.md, "The circuit schedule".
    """
    p = Path(path)
    suffix = p.suffix.lower()
    if not p.is_file():
        raise ScheduleError(f"{p}: schedule file not found; check the --circuits path")
    try:
        if suffix == ".csv":
            table = _read_csv(p)
        elif suffix in (".xlsx", ".xlsm"):
            table = _read_xlsx(p)
        else:
            raise ScheduleError(f"{p}: schedule must be .csv or .xlsx, not {suffix or 'no suffix'}")
    except ScheduleError:
        raise
    except (OSError, csv.Error, UnicodeError, ValueError, KeyError, zipfile.BadZipFile) as exc:
        raise ScheduleError(f"{p}: cannot read the schedule ({exc}); save it again as .csv or .xlsx") from exc
    return _rows_to_schedule(str(p), table)


def rows_from_equipment(equipment: Iterable[Equipment], source: str = "drawing") -> list[ScheduleRow]:
    """Build the schedule from equipment attributes when no schedule file is given.

    A load's block carries attributes named like the schedule's columns
    (``CIRCUIT``, ``FROM``, ``LOAD``, ...); ``TO`` defaults to the block's own tag.

    Parameters
    ----------
    equipment : iterable of Equipment
        As read from the drawing.
    source : str
        The drawing's file name, for messages.

    Returns
    -------
    list of ScheduleRow
        ``source`` is ``"drawing block <handle>"``; rows ordered by circuit id.

    Raises
    ------
    ScheduleError
        No block carries a ``CIRCUIT`` attribute, or one circuit id is on two blocks.
    """
    rows: list[ScheduleRow] = []
    seen: dict[str, str] = {}
    for n, eq in enumerate(equipment, start=1):
        attrs = {k.lower(): v.strip() for k, v in eq.attributes}
        cid = attrs.get("circuit", "")
        if not cid:
            continue
        if cid in seen:
            raise ScheduleError(
                f"{source}: circuit {cid} is on two blocks, {seen[cid]} and {eq.source_id}; "
                "circuit ids must be unique"
            )
        seen[cid] = eq.source_id
        attrs.setdefault("to", eq.tag)
        if not attrs["to"]:
            attrs["to"] = eq.tag
        attrs.setdefault("from", "")
        fields = tuple(sorted(attrs.items()))
        rows.append(
            ScheduleRow(f"drawing block {eq.source_id}", n, cid, attrs["from"], attrs["to"], fields)
        )
    if not rows:
        raise ScheduleError(
            f"{source}: no --circuits schedule given and no equipment block carries a CIRCUIT "
            "attribute; give a schedule file (.csv or .xlsx)"
        )
    return sorted(rows, key=lambda r: r.circuit_id)


#: Columns giving a load's position instead of a tag in the drawing, in drawing
#: units (contract.md, Extensions: ``to_x``, ``to_y``, ``to_z``).
POSITION_COLUMNS = ("to_x", "to_y", "to_z")


def load_positions(rows: Iterable[ScheduleRow]) -> tuple[dict[str, tuple[float, float, float]], dict[str, str]]:
    """Load positions given in the schedule (``to_x``, ``to_y``, ``to_z``), drawing units.

    Parameters
    ----------
    rows : iterable of ScheduleRow
        The schedule.

    Returns
    -------
    (positions, errors)
        Circuit id -> (x, y, z) [drawing units] for rows that give ``to_x`` and
        ``to_y`` (``to_z`` blank is 0); circuit id -> message for rows whose
        position does not parse, or gives only one of x and y.
    """
    import math

    positions: dict[str, tuple[float, float, float]] = {}
    errors: dict[str, str] = {}
    for row in rows:
        cells = [row.get(c) for c in POSITION_COLUMNS]
        if not any(cells):
            continue
        if not (cells[0] and cells[1]):
            errors[row.circuit_id] = (f"{row.where}: give both to_x and to_y (and to_z if not 0) for the "
                                      "load's position, or neither")
            continue
        try:
            xyz = tuple(float(c.replace(",", ".")) if c else 0.0 for c in cells)
        except ValueError:
            errors[row.circuit_id] = (f"{row.where}: to_x/to_y/to_z {', '.join(c or '' for c in cells)} "
                                      "is not a position in drawing units; write numbers")
            continue
        if not all(math.isfinite(v) for v in xyz):
            errors[row.circuit_id] = f"{row.where}: to_x/to_y/to_z must be finite numbers"
            continue
        positions[row.circuit_id] = xyz  # type: ignore[assignment]
    return positions, errors
