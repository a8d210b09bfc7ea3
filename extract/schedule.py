"""Read the circuit schedule (.csv or .xlsx), or build it from block attributes.

contract.md, "The circuit schedule": header names case-insensitive, columns in any
order, extra columns kept; required columns ``circuit``, ``from``, ``to``, ``load``.
Cell text is kept as written; parsing numbers is the sizing stage's job.

Hostile or broken files are refused with one line before they cost memory or
time (issue 18): CSV text in UTF-8, UTF-16 or UTF-32 (by its byte-order mark, or
UTF-16 by its zero bytes), else Windows-1252, said once; XLSX files whose parts
unpack beyond :data:`MAX_XLSX_UNPACKED_BYTES`, pack more than
:data:`MAX_XLSX_RATIO` to one, declare a document type (the entity-expansion
"billion laughs" attack) or claim more than :data:`MAX_XLSX_ROWS` rows or
:data:`MAX_XLSX_COLUMNS` columns are refused before openpyxl parses them.

References
----------
.. [1] The Unicode Standard 15.0, section 23.8 "Specials": byte order marks
   (U+FEFF) of UTF-8, UTF-16 and UTF-32.
.. [2] Python documentation, ``csv`` module: open the file with ``newline=""`` so
   line breaks inside quoted fields are kept.
.. [3] ECMA-376-1:2016 (Office Open XML), 18.3.1.35 ``dimension``, 18.3.1.40 ``f``
   (a formula and its cached value ``v``).
.. [4] Python documentation, "XML vulnerabilities" (billion laughs, quadratic
   blowup, decompression bomb).
"""

from __future__ import annotations

import codecs
import csv
import io
import logging
import os
import re
import zipfile
from collections.abc import Iterable, Sequence
from pathlib import Path

from cablewright.core.errors import ScheduleError

from .model import Equipment, ScheduleRow

__all__ = [
    "REQUIRED_COLUMNS",
    "KNOWN_COLUMNS",
    "MAX_XLSX_UNPACKED_BYTES",
    "MAX_XLSX_RATIO",
    "MAX_XLSX_ROWS",
    "MAX_XLSX_COLUMNS",
    "POSITION_COLUMNS",
    "read_schedule",
    "rows_from_equipment",
    "load_positions",
]

logger = logging.getLogger(__name__)

#: Required schedule columns (contract.md, "The circuit schedule").
REQUIRED_COLUMNS = ("circuit", "from", "to", "load")

#: Every column a schedule may have (contract.md, "The circuit schedule" and its
#: extensions, and the README's further columns; ``via`` is read by the routing).  A header close to one of these
#: but not equal is a misspelling and refused; others are extra and ignored.
KNOWN_COLUMNS = REQUIRED_COLUMNS + (
    "power_factor", "efficiency", "voltage", "phases", "load_type", "conductor",
    "insulation", "cores", "vd_limit_pct", "fault_ka", "third_harmonic_pct",
    "to_x", "to_y", "to_z", "via", "ze_ohm", "earthing", "curve", "starter",
    "clearing_time_s", "magnetic_a", "let_through_ka2s",
)

#: Largest total unpacked size of an XLSX's parts [bytes]: a 100,000-circuit
#: schedule is about 30 MB of sheet XML (common practice: a bound well above use).
MAX_XLSX_UNPACKED_BYTES = 256 * 1024 * 1024
#: Largest unpacked/packed ratio of one part larger than 1 MiB; sheet XML packs
#: 5 to 20 to one, zip bombs thousands (common practice).
MAX_XLSX_RATIO = 200
#: Largest extent a sheet may claim (rows, columns) before it is read.
MAX_XLSX_ROWS = 1_000_000
MAX_XLSX_COLUMNS = 1_000


def _cell_text(value: object) -> str:
    if value is None:
        return ""
    if isinstance(value, float) and value.is_integer():
        return str(int(value))
    return str(value).strip()


_BOMS = (
    (codecs.BOM_UTF32_LE, "utf-32"), (codecs.BOM_UTF32_BE, "utf-32"),
    (codecs.BOM_UTF8, "utf-8-sig"), (codecs.BOM_UTF16_LE, "utf-16"), (codecs.BOM_UTF16_BE, "utf-16"),
)


def _decode(path: Path, data: bytes) -> str:
    """The CSV's text: by byte-order mark, else UTF-16 by its zero bytes, UTF-8, Windows-1252 [1]_."""
    for bom, encoding in _BOMS:  # UTF-32 LE before UTF-16 LE: its mark begins the same way
        if data.startswith(bom):
            return data.decode(encoding)
    head = data[:4096]
    if head and head.count(0) * 4 >= len(head):  # ASCII text in UTF-16 is half zero bytes
        odd_zeros = head[1::2].count(0)
        encoding = "utf-16-le" if odd_zeros >= head[0::2].count(0) else "utf-16-be"
        logger.warning("%s: no byte-order mark; read as %s (it has zero bytes between letters)", path, encoding.upper())
        return data.decode(encoding)
    try:
        return data.decode("utf-8")
    except UnicodeDecodeError as exc:
        logger.warning("%s: not UTF-8 (byte %d); read as Windows-1252 - save it as UTF-8 "
                       "if names look wrong", path, exc.start)
        return data.decode("cp1252", errors="replace")


def _read_csv(path: Path) -> list[tuple[int, list[str]]]:
    text = _decode(path, path.read_bytes())
    if "\x00" in text:
        raise ScheduleError(file=path, problem="the schedule holds zero bytes (a binary file?)",
                            fix="save it as CSV text")
    try:
        dialect: type[csv.Dialect] | csv.Dialect = csv.Sniffer().sniff(text[:4096], delimiters=",;\t")
    except csv.Error:
        dialect = csv.excel
    out = []
    # newline="" semantics: a line break inside a quoted field stays in the field [2]_
    reader = csv.reader(io.StringIO(text, newline=""), dialect)
    for n, cells in enumerate(reader, start=1):
        out.append((n, [c.strip() for c in cells]))
    return out


def _check_xlsx_package(path: Path) -> None:
    """Refuse a zip bomb, an XML document type or a huge claimed extent, before parsing [3]_ [4]_."""
    with zipfile.ZipFile(path) as archive:
        infos = archive.infolist()
        total = sum(i.file_size for i in infos)
        if total > MAX_XLSX_UNPACKED_BYTES:
            raise ScheduleError(file=path, value=total,
                                problem=f"the workbook unpacks to {total / 2**20:.0f} MiB, more than the "
                                f"{MAX_XLSX_UNPACKED_BYTES / 2**20:.0f} MiB a schedule needs",
                                fix="save it again from a spreadsheet program or as CSV")
        for info in infos:
            if info.file_size > 2**20 and info.file_size > MAX_XLSX_RATIO * max(info.compress_size, 1):
                raise ScheduleError(file=path, value=info.filename,
                                    problem=f"part {info.filename} unpacks {info.file_size // max(info.compress_size, 1)} "
                                    "times its packed size (a zip bomb?)", fix="save the schedule again or as CSV")
        for info in infos:
            if not info.filename.endswith((".xml", ".rels")):
                continue
            with archive.open(info) as part:
                head = part.read(65536)
            if b"<!DOCTYPE" in head or b"<!ENTITY" in head:
                raise ScheduleError(file=path, value=info.filename,
                                    problem=f"part {info.filename} declares an XML document type "
                                    "(entity expansion, which spreadsheet files never use)",
                                    fix="save the schedule again from a spreadsheet program or as CSV")
            if info.filename.startswith("xl/worksheets/"):
                match = re.search(rb'<dimension ref="([A-Z]*)(\d*):?([A-Z]*)(\d*)"', head)
                if match:
                    _check_extent(path, info.filename, match)
                _check_used_rows(path, archive, info)


_ROW_NUMBER = re.compile(rb'<row [^>]*?r="(\d+)"')
_CELL_COLUMN = re.compile(rb'<c [^>]*?r="([A-Z]+)\d+"')


def _check_used_rows(path: Path, archive: zipfile.ZipFile, info: zipfile.ZipInfo) -> None:
    """The highest row number the sheet uses, streamed (no dimension needed) [3]_.

    openpyxl fills the gap up to a far-out row with empty rows, so a sheet with
    one cell in row 1,048,576 would cost a million rows of work.
    """
    highest, widest, tail = 0, b"", b""
    with archive.open(info) as part:
        for chunk in iter(lambda: part.read(1 << 20), b""):
            text = tail + chunk
            for match in _ROW_NUMBER.finditer(text):
                highest = max(highest, int(match.group(1)))
            for match in _CELL_COLUMN.finditer(text):
                letters = match.group(1)
                if (len(letters), letters) > (len(widest), widest):
                    widest = letters
            tail = text[-64:]
    if highest > MAX_XLSX_ROWS or _column_number(widest) > MAX_XLSX_COLUMNS:
        raise ScheduleError(file=path, value=info.filename,
                            problem=f"sheet {info.filename} uses row {highest} and column "
                            f"{widest.decode() or '-'}, more than a schedule has ({MAX_XLSX_ROWS} rows, "
                            f"{MAX_XLSX_COLUMNS} columns)", fix="delete the far-out cells or save the schedule as CSV")


def _column_number(letters: bytes) -> int:
    number = 0
    for ch in letters:
        number = number * 26 + (ch - ord("A") + 1)
    return number


def _check_extent(path: Path, part: str, match: re.Match[bytes]) -> None:
    last_col = match.group(3) or match.group(1)
    last_row = match.group(4) or match.group(2)
    rows = int(last_row) if last_row else 0
    cols = _column_number(last_col)
    if rows > MAX_XLSX_ROWS or cols > MAX_XLSX_COLUMNS:
        ref = match.group(0).decode(errors="replace")
        raise ScheduleError(file=path, value=ref,
                            problem=f"sheet {part} claims {rows} rows x {cols} columns ({ref}), more than a "
                            f"schedule has ({MAX_XLSX_ROWS} x {MAX_XLSX_COLUMNS})",
                            fix="delete the far-out cells or save the schedule as CSV")


def _read_xlsx(path: Path) -> list[tuple[int, list[str]]]:
    import openpyxl

    _check_xlsx_package(path)
    wb = openpyxl.load_workbook(path, read_only=True, data_only=True)
    try:
        names = {n.lower(): n for n in wb.sheetnames}
        sheet = names.get("circuits", wb.sheetnames[0])
        table = [
            (n, [_cell_text(v) for v in values])
            for n, values in enumerate(wb[sheet].iter_rows(values_only=True), start=1)
        ]
    finally:
        wb.close()
    if any(not cell for _, cells in table for cell in cells):
        _refuse_uncached_formulas(path, sheet, table)
    return table


def _refuse_uncached_formulas(path: Path, sheet: str, table: list[tuple[int, list[str]]]) -> None:
    """A blank cell that holds a formula with no saved value is named as such [3]_.

    Files written by programs that do not calculate (scripts, some exports)
    carry formulas without results; openpyxl reads those as blank, which would
    silently mean "the default".
    """
    import openpyxl
    from openpyxl.utils import get_column_letter

    wb = openpyxl.load_workbook(path, read_only=True, data_only=False)
    try:
        found = []
        rows = wb[sheet].iter_rows(values_only=True)
        for (n, cells), formulas in zip(table, rows, strict=False):
            for k, value in enumerate(formulas):
                if isinstance(value, str) and value.startswith("=") and (k >= len(cells) or not cells[k]):
                    found.append(f"{get_column_letter(k + 1)}{n} ({value[:40]})")
    finally:
        wb.close()
    if found:
        more = f" and {len(found) - 3} more" if len(found) > 3 else ""
        raise ScheduleError(file=path, value=found[0],
                            problem=f"cell {', '.join(found[:3])}{more} holds a formula with no saved value",
                            fix="open the file in a spreadsheet program and save it, or type the values")


def _normal(name: str) -> str:
    """A header as compared: lower case, spaces, hyphens and underscores as one ``_``."""
    return re.sub(r"[\s_-]+", "_", name.strip().lower()).strip("_")


def _edit_distance(a: str, b: str) -> int:
    """Levenshtein distance (insertions, deletions, substitutions), dynamic programming."""
    previous = list(range(len(b) + 1))
    for i, ca in enumerate(a, start=1):
        current = [i]
        for j, cb in enumerate(b, start=1):
            current.append(min(previous[j] + 1, current[j - 1] + 1, previous[j - 1] + (ca != cb)))
        previous = current
    return previous[-1]


def _intended(name: str) -> str | None:
    """The known column a header was meant to be, or None when it is extra.

    Equal but for case: the column itself (headers are case-insensitive).  Equal
    once spaces, hyphens and underscores are set aside (``load type``,
    ``powerfactor``), lacking only the unit (``vd_limit``), or within one edit
    (two for names over five letters): a misspelling of that column.

    Examples
    --------
    >>> _intended("Load Type"), _intended("powerfactor"), _intended("Phase"), _intended("notes")
    ('load_type', 'power_factor', 'phases', None)
    """
    normal = _normal(name)
    squashed = normal.replace("_", "")
    for known in KNOWN_COLUMNS:
        if squashed == known.replace("_", ""):
            return known
    if len(squashed) < 3:
        return None
    for known in KNOWN_COLUMNS:  # the unit left off: vd_limit, fault, clearing_time
        if len(normal) >= 4 and known.startswith(normal + "_"):
            return known
    best = min(KNOWN_COLUMNS, key=lambda k: (_edit_distance(normal, k), k))
    limit = 1 if len(normal) <= 5 else 2
    return best if _edit_distance(normal, best) <= limit else None


def _header_names(source: str, header_row: int, header: list[str]) -> list[str]:
    """Header cells as column names; misspelt known columns refused, extra ones listed once."""
    names = [h.strip().lower() for h in header]
    misspelt, extra = [], []
    for k, name in enumerate(names):
        if not name or name in KNOWN_COLUMNS:
            continue
        intended = _intended(name)
        if intended is not None and intended not in names:
            misspelt.append(f"column {k + 1} {header[k].strip()!r} (meant {intended!r}?)")
        else:
            extra.append(header[k].strip())
    if misspelt:
        raise ScheduleError(file=source, problem=f"row {header_row} (the header): {'; '.join(misspelt)}",
                            fix="rename it to the column's name (contract.md, \"The circuit schedule\")")
    if extra:
        logger.warning("%s: ignored (extra) columns, kept as they are: %s", source, ", ".join(extra))
    return names


def _one_line(source: str, n: int, column: str, value: str) -> str:
    if "\n" in value or "\r" in value:
        raise ScheduleError(file=source, row=n, column=column, value=value,
                            problem=f"the {column} cell holds a line break", fix="put it on one line")
    return value


def _rows_to_schedule(source: str, table: Sequence[tuple[int, list[str]]]) -> list[ScheduleRow]:
    body = [(n, cells) for n, cells in table if any(c for c in cells)]
    if not body:
        raise ScheduleError(file=source, problem="the schedule is empty",
                            fix="give a header row and one row per circuit")
    header_row, header = body[0]
    names = [h.strip().lower() for h in header]
    missing = [c for c in REQUIRED_COLUMNS if c not in names]
    if missing:
        near = [f"{h.strip()!r} (meant {_intended(h)!r}?)" for h in header if _intended(h) in missing]
        hint = f"; {', '.join(near)}" if near else ""
        raise ScheduleError(
            file=source, column=missing[0],
            problem=f"row {header_row} (the header) has no column {', '.join(missing)}{hint}",
            fix=f"required columns are {', '.join(REQUIRED_COLUMNS)}"
        )
    dup_cols = sorted({n for n in names if n and names.count(n) > 1})
    if dup_cols:
        raise ScheduleError(file=source, column=dup_cols[0],
                            problem=f"column {', '.join(dup_cols)} appears twice in the header", fix="keep one")
    names = _header_names(source, header_row, header)
    if len(body) == 1:
        raise ScheduleError(file=source, problem=f"the schedule has a header (row {header_row}) but no circuit rows",
                            fix="add one row per circuit")
    rows: list[ScheduleRow] = []
    seen: dict[str, tuple[int, str]] = {}
    for n, cells in body[1:]:
        cells = cells + [""] * (len(names) - len(cells))
        fields = tuple((name, cells[k]) for k, name in enumerate(names) if name)
        values = dict(fields)
        cid = _one_line(source, n, "circuit", values["circuit"].strip())
        if not cid:
            raise ScheduleError(file=source, row=n, column="circuit", problem="the circuit cell is blank",
                                fix="give every row a circuit id")
        key = cid.casefold()
        if key in seen:
            first_row, first_id = seen[key]
            if first_id == cid:
                raise ScheduleError(file=source, circuit_id=cid, column="circuit", value=cid,
                                    problem=f"circuit {cid} appears twice, rows {first_row} and {n}",
                                    fix="circuit ids must be unique")
            raise ScheduleError(file=source, circuit_id=cid, column="circuit", value=cid,
                                problem=f"circuits {first_id!r} (row {first_row}) and {cid!r} (row {n}) are one "
                                "id once spaces and case are set aside", fix="circuit ids must be unique")
        seen[key] = (n, cid)
        from_tag = _one_line(source, n, "from", values["from"].strip())
        to_tag = _one_line(source, n, "to", values["to"].strip())
        rows.append(ScheduleRow(source, n, cid, from_tag, to_tag, fields))
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
        raise ScheduleError(file=p, problem="schedule file not found", fix="check the --circuits path")
    try:
        if suffix == ".csv":
            table = _read_csv(p)
        elif suffix in (".xlsx", ".xlsm"):
            table = _read_xlsx(p)
        else:
            raise ScheduleError(file=p, value=suffix,
                                problem=f"schedule must be .csv or .xlsx, not {suffix or 'no suffix'}")
    except ScheduleError:
        raise
    except (OSError, csv.Error, UnicodeError, ValueError, KeyError, zipfile.BadZipFile,
            zipfile.LargeZipFile, EOFError, SyntaxError) as exc:
        # xml.etree.ElementTree.ParseError (malformed XML, or expat's guard against
        # entity expansion) is a SyntaxError; defusedxml's errors are ValueErrors
        what = " ".join(str(exc).split())[:200] or type(exc).__name__
        raise ScheduleError(file=p, problem=f"cannot read the schedule ({what})",
                            fix="save it again as .csv or .xlsx") from exc
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
        if cid.casefold() in seen:
            raise ScheduleError(
                file=source, circuit_id=cid, source_id=eq.source_id,
                problem=f"circuit {cid} is on two blocks, {seen[cid.casefold()]} and {eq.source_id} "
                "(ids compared without case)", fix="circuit ids must be unique"
            )
        seen[cid.casefold()] = eq.source_id
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
            file=source, problem="no --circuits schedule given and no equipment block carries a CIRCUIT "
            "attribute", fix="give a schedule file (.csv or .xlsx)"
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
