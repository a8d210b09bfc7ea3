"""Compare the schedule files of two ``cablewright size`` output folders (issue 13).

``schedule.json``, ``schedule.csv`` and ``report.html`` must be byte-identical;
``schedule.xlsx`` is read back with openpyxl and compared sheet by sheet and cell
by cell: sheet names, every cell's value, type, number format, fill, font,
alignment, border, protection and quote prefix, column widths, frozen panes,
auto-filter, print setup (orientation, fit to page, print titles).  Whether the
workbook's zip members are byte-identical too is reported beside (not required).

Usage::

    cablewright size sample_drawings/pumping_station.dxf \\
        --circuits sample_drawings/pumping_station_circuits.csv --out /tmp/before   # earlier code
    cablewright size sample_drawings/pumping_station.dxf \\
        --circuits sample_drawings/pumping_station_circuits.csv --out /tmp/after    # this code
    python benchmarks/compare_schedule_files.py /tmp/before /tmp/after

Exit 0 when everything required is equal, 1 otherwise (each difference printed).
"""

from __future__ import annotations

import argparse
import sys
import zipfile
from pathlib import Path
from typing import Any

__all__ = ["compare_folders", "compare_xlsx", "main"]

#: Files that must be byte-identical.
SAME_BYTES = ("schedule.json", "schedule.csv", "report.html")


def _style(cell: Any) -> tuple:
    """Everything that shows how a cell looks, as comparable values."""
    fill = cell.fill
    return (cell.number_format, fill.fill_type, fill.fgColor.rgb, fill.bgColor.rgb,
            repr(cell.font), repr(cell.alignment), repr(cell.border), repr(cell.protection),
            bool(cell.quotePrefix))


def _sheet_facts(ws: Any) -> dict[str, Any]:
    """The sheet settings the schedule writer sets."""
    widths = {key: dim.width for key, dim in sorted(ws.column_dimensions.items())}
    ps = ws.page_setup
    return {
        "dimensions": ws.dimensions,
        "freeze_panes": ws.freeze_panes,
        "auto_filter": ws.auto_filter.ref,
        "widths": widths,
        "orientation": ps.orientation,
        "fitToWidth": ps.fitToWidth,
        "fitToHeight": ps.fitToHeight,
        "fitToPage": ws.sheet_properties.pageSetUpPr.fitToPage if ws.sheet_properties.pageSetUpPr else None,
        "print_title_rows": ws.print_title_rows,
    }


def compare_xlsx(before: Path, after: Path, limit: int = 20) -> list[str]:
    """Differences between two workbooks read back with openpyxl (empty: the same)."""
    from openpyxl import load_workbook

    problems: list[str] = []
    a, b = load_workbook(before), load_workbook(after)
    if a.sheetnames != b.sheetnames:
        return [f"sheet names {a.sheetnames} != {b.sheetnames}"]
    cells = 0
    for name in a.sheetnames:
        wa, wb = a[name], b[name]
        fa, fb = _sheet_facts(wa), _sheet_facts(wb)
        for key in fa:
            if fa[key] != fb[key]:
                problems.append(f"{name}: {key} {fa[key]!r} != {fb[key]!r}")
        rows_a = list(wa.iter_rows())
        rows_b = list(wb.iter_rows())
        if len(rows_a) != len(rows_b):
            problems.append(f"{name}: {len(rows_a)} rows != {len(rows_b)}")
        for ra, rb in zip(rows_a, rows_b, strict=False):  # counts compared above
            if len(ra) != len(rb):
                problems.append(f"{name} row {ra[0].row}: {len(ra)} cells != {len(rb)}")
            for ca, cb in zip(ra, rb, strict=False):
                cells += 1
                va, vb = (ca.value, ca.data_type, _style(ca)), (cb.value, cb.data_type, _style(cb))
                if va != vb and len(problems) < limit:
                    problems.append(f"{name}!{ca.coordinate}: {va!r} != {vb!r}")
    print(f"  schedule.xlsx: {len(a.sheetnames)} sheets {a.sheetnames}, {cells} cells compared")
    return problems


def _zip_members_equal(before: Path, after: Path) -> bool:
    with zipfile.ZipFile(before) as za, zipfile.ZipFile(after) as zb:
        names = za.namelist()
        return names == zb.namelist() and all(za.read(n) == zb.read(n) for n in names)


def compare_folders(before: Path, after: Path) -> list[str]:
    """Every required difference between the schedule files of two output folders."""
    problems: list[str] = []
    for name in SAME_BYTES:
        da, db = (before / name).read_bytes(), (after / name).read_bytes()
        same = da == db
        print(f"  {name}: {len(da)} / {len(db)} bytes, {'identical' if same else 'DIFFERENT'}")
        if not same:
            problems.append(f"{name} differs")
    problems += compare_xlsx(before / "schedule.xlsx", after / "schedule.xlsx")
    same_zip = _zip_members_equal(before / "schedule.xlsx", after / "schedule.xlsx")
    whole = (before / "schedule.xlsx").read_bytes() == (after / "schedule.xlsx").read_bytes()
    print(f"  schedule.xlsx zip members byte-identical: {same_zip}; whole file byte-identical: {whole}")
    return problems


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("before", type=Path, help="output folder of the earlier code")
    parser.add_argument("after", type=Path, help="output folder of this code")
    args = parser.parse_args(argv)
    print(f"{args.before} vs {args.after}")
    problems = compare_folders(args.before, args.after)
    for p in problems:
        print("  DIFF", p)
    print("same content" if not problems else f"{len(problems)} difference(s)")
    return 0 if not problems else 1


if __name__ == "__main__":
    sys.exit(main())
