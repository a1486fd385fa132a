"""The benchmark table: cellchem against the floor its readers set, and
against reference libraries, as ratios measured in the same run.

    python benchmarks/run.py                  # 10,000 and 100,000 lines
    python benchmarks/run.py --sizes 1000000  # a million lines (long: openpyxl alone takes minutes)
    python benchmarks/run.py --sizes 10000 --forms xlsx,csv --strings shared,inline

Each file step runs in its own process; the time is wall-clock and the memory
the process's peak resident size. Ratios, not absolute times, are what to
compare: the machines are shared and noisy.

The inventory (benchmarks/generate.py) is written as a workbook with shared
strings (as Excel and LibreOffice store texts; --strings inline for the form
openpyxl's write-only mode writes), as the same workbook converted to .ods by
LibreOffice (skipped with a note when soffice is not installed), and as a CSV
export of the same lines. For each form:

- the floor: the least any reader must do, decompressing the sheet part and
  scanning it with expat, keeping only the role columns' cells (C to F: name,
  formula, molar mass, CAS RN), shared strings resolved; for a CSV, Python's
  csv module over every line;
- the references: openpyxl's read-only iteration (the audit's baseline) and
  openpyxl's load and save (fill's baseline) for .xlsx; python-calamine's read
  (the fast reader) for .xlsx and .ods;
- cellchem audit and cellchem fill, against their baselines (targets: audit
  at most 0.3 x openpyxl read-only, fill at most 0.4 x openpyxl load + save)
  and against the floor.
"""

from __future__ import annotations

import argparse
import os
import shutil
import subprocess
import sys
import tempfile
import time
from dataclasses import dataclass
from pathlib import Path

HERE = Path(__file__).resolve().parent
PY = sys.executable

FLOOR_READ = """
import sys, openpyxl
wb = openpyxl.load_workbook(sys.argv[1], read_only=True, data_only=True)
for ws in wb.worksheets:
    for row in ws.iter_rows(values_only=True):
        pass
"""
CALAMINE = """
import sys, python_calamine
wb = python_calamine.CalamineWorkbook.from_path(sys.argv[1])
for name in wb.sheet_names:
    wb.get_sheet_by_name(name).to_python()
"""
FLOOR_SAVE = """
import sys, openpyxl
wb = openpyxl.load_workbook(sys.argv[1])
wb.save(sys.argv[2])
"""
# The floor of a workbook: the sheet part decompressed as a stream and scanned by
# expat, keeping the cells of the role columns (shared strings resolved).
SCAN_XLSX = r"""
import re, sys, zipfile
from xml.parsers import expat

KEEP = {"C", "D", "E", "F"}
zf = zipfile.ZipFile(sys.argv[1])
names = zf.namelist()
sheet = sorted(n for n in names if re.fullmatch(r"xl/worksheets/sheet[0-9]+\.xml", n))[0]


def scan(part, start, end, text):
    parser = expat.ParserCreate()
    parser.buffer_text = True
    parser.StartElementHandler, parser.EndElementHandler, parser.CharacterDataHandler = start, end, text
    with zf.open(part) as fh:
        parser.ParseFile(fh)


shared, parts = [], []
if "xl/sharedStrings.xml" in names:

    def s_start(tag, attrs):
        if tag == "si":
            parts.clear()

    def s_end(tag):
        if tag == "si":
            shared.append("".join(parts))

    scan("xl/sharedStrings.xml", s_start, s_end, parts.append)

state = {"keep": False, "type": None}
text, row, count = [], [], [0, 0]


def start(tag, attrs):
    if tag == "c":
        state["keep"] = attrs.get("r", "").rstrip("0123456789") in KEEP
        state["type"] = attrs.get("t")
        text.clear()


def end(tag):
    if tag == "c" and state["keep"]:
        value = "".join(text)
        row.append(shared[int(value)] if state["type"] == "s" else value)
        state["keep"] = False
    elif tag == "row":
        count[0] += 1
        count[1] += len(row)
        row.clear()


def chars(data):
    if state["keep"]:
        text.append(data)


scan(sheet, start, end, chars)
print(count[0], "rows", count[1], "cells kept")
"""
# The floor of an OpenDocument spreadsheet: content.xml streamed through expat,
# keeping the cells of columns C to F (repeated cells and rows counted, not expanded).
SCAN_ODS = r"""
import sys, zipfile
from xml.parsers import expat

TABLE = "urn:oasis:names:tc:opendocument:xmlns:table:1.0 "
OFFICE = "urn:oasis:names:tc:opendocument:xmlns:office:1.0 "
CELLS = (TABLE + "table-cell", TABLE + "covered-table-cell")
state = {"column": 0, "keep": False, "value": None, "tables": 0}
text, row, count = [], [], [0, 0]


def start(tag, attrs):
    if tag in CELLS:
        state["keep"] = 2 <= state["column"] <= 5
        state["column"] += int(attrs.get(TABLE + "number-columns-repeated", 1))
        state["value"] = attrs.get(OFFICE + "value")
        text.clear()
    elif tag == TABLE + "table-row":
        state["column"] = 0
        state["rows"] = int(attrs.get(TABLE + "number-rows-repeated", 1))


def end(tag):
    if tag in CELLS and state["keep"]:
        row.append(state["value"] if state["value"] is not None else "".join(text))
        state["keep"] = False
    elif tag == TABLE + "table-row":
        count[0] += state["rows"]
        count[1] += len(row)
        row.clear()


def chars(data):
    if state["keep"]:
        text.append(data)


parser = expat.ParserCreate(namespace_separator=" ")
parser.buffer_text = True
parser.StartElementHandler, parser.EndElementHandler, parser.CharacterDataHandler = start, end, chars
with zipfile.ZipFile(sys.argv[1]) as zf, zf.open("content.xml") as fh:
    parser.ParseFile(fh)
print(count[0], "rows", count[1], "cells kept")
"""
SCAN_CSV = """
import csv, sys
rows = kept = 0
with open(sys.argv[1], encoding="utf-8", newline="") as fh:
    for row in csv.reader(fh):
        rows += 1
        kept += len(row[2:6])
print(rows, "rows", kept, "cells kept")
"""
AUDIT_TARGET = 0.3  # x openpyxl read-only iteration
FILL_TARGET = 0.4  # x openpyxl load + save


@dataclass(frozen=True)
class Step:
    seconds: float
    mb: float
    code: int

    @property
    def ok(self) -> bool:
        return self.code in (0, 1)


def high_water_mb(pid: int) -> float | None:
    """A running process's peak resident size so far (VmHWM), in MB."""
    try:
        with open(f"/proc/{pid}/status", encoding="ascii") as fh:
            for line in fh:
                if line.startswith("VmHWM:"):
                    return int(line.split()[1]) / 1024
    except (OSError, ValueError, IndexError):
        return None
    return None


def measure(args: list[str]) -> Step:
    """The wall-clock seconds, peak MB and exit code of a child process.

    The peak is the child's VmHWM, read every 10 ms while it runs: the
    rusage that wait4 gives counts the parent's resident size at the fork
    as the child's, which would put a floor of this script's size under
    every figure. Without /proc, that rusage is used.
    """
    start = time.perf_counter()
    proc = subprocess.Popen(args, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    peak = None
    while True:
        pid, status, usage = os.wait4(proc.pid, os.WNOHANG)
        if pid:
            break
        mark = high_water_mb(proc.pid)
        if mark is not None:
            peak = max(peak or 0.0, mark)
        time.sleep(0.01)
    elapsed = time.perf_counter() - start
    code = os.waitstatus_to_exitcode(status)
    proc.returncode = code
    return Step(elapsed, peak if peak is not None else usage.ru_maxrss / 1024, code)


def _ratio(step: Step, base: Step | None, name: str, target: float | None = None) -> str:
    if not step.ok:
        return "refused (exit 2)" if step.code == 2 else f"failed (exit {step.code})"
    if base is None or not base.ok:
        return ""
    text = f"{step.seconds / base.seconds:.2f} x {name}"
    return f"{text} (target <= {target})" if target is not None else text


def _row(n: int, form: str, label: str, step: Step, ratio: str = "", floor: str = "") -> str:
    if step.ok:
        return f"| {n:,} | {form} | {label} | {step.seconds:.1f} | {step.mb:.0f} | {ratio} | {floor} |"
    return f"| {n:,} | {form} | {label} | {step.seconds:.1f} | {step.mb:.0f} | {_ratio(step, None, '')} | |"


def to_ods(source: Path) -> tuple[Path | None, str]:
    """``source`` converted to .ods beside it by LibreOffice (a private profile), or a note why not."""
    target = source.with_suffix(".ods")
    if target.exists():
        return target, ""
    soffice = shutil.which("soffice") or shutil.which("libreoffice")
    if soffice is None:
        return None, "LibreOffice (soffice) is not installed: the .ods rows were skipped"
    with tempfile.TemporaryDirectory() as profile:
        command = [
            soffice,
            f"-env:UserInstallation={Path(profile).as_uri()}",
            "--headless",
            "--convert-to",
            "ods",
            "--outdir",
            str(source.parent),
            str(source),
        ]
        start = time.perf_counter()
        try:
            subprocess.run(
                command, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL, timeout=3600, check=False
            )
        except subprocess.TimeoutExpired:
            return (
                None,
                f"LibreOffice did not convert {source.name} within an hour: the .ods rows were skipped",
            )
        took = time.perf_counter() - start
    if not target.exists():
        return None, f"LibreOffice did not convert {source.name}: the .ods rows were skipped"
    return target, f"{source.name} converted to .ods by LibreOffice in {took:.0f} s"


def _commands(path: Path, folder: Path) -> tuple[list[str], list[str]]:
    filled = folder / f"filled-{path.stem}{path.suffix}"
    filled.unlink(missing_ok=True)
    audit = [PY, "-m", "cellchem", "audit", str(path), "--show", "0"]
    return audit, [PY, "-m", "cellchem", "fill", str(path), "-o", str(filled)]


def xlsx_rows(n: int, path: Path, folder: Path, form: str, max_save: int) -> list[str]:
    read = measure([PY, "-c", FLOOR_READ, str(path)])
    cal = measure([PY, "-c", CALAMINE, str(path)])
    floor = measure([PY, "-c", SCAN_XLSX, str(path)])
    audit_cmd, fill_cmd = _commands(path, folder)
    audit = measure(audit_cmd)
    save = measure([PY, "-c", FLOOR_SAVE, str(path), str(folder / "resaved.xlsx")]) if n <= max_save else None
    fill = measure(fill_cmd)
    ro = "openpyxl read-only"
    out = [
        _row(n, form, "openpyxl read-only iteration (audit's baseline)", read, "1.00"),
        _row(n, form, "python-calamine read", cal, _ratio(cal, read, ro), _ratio(cal, floor, "floor")),
        _row(n, form, "the floor: expat scan of the role columns", floor, _ratio(floor, read, ro), "1.00"),
        _row(
            n,
            form,
            "cellchem audit",
            audit,
            _ratio(audit, read, ro, AUDIT_TARGET),
            _ratio(audit, floor, "floor"),
        ),
    ]
    if save is None:
        skipped = f"not run above {max_save:,} lines"
        out.append(f"| {n:,} | {form} | openpyxl load + save (fill's baseline) | | | {skipped} | |")
    else:
        out.append(_row(n, form, "openpyxl load + save (fill's baseline)", save, "1.00"))
    out.append(
        _row(
            n,
            form,
            "cellchem fill",
            fill,
            _ratio(fill, save, "openpyxl load + save", FILL_TARGET),
            _ratio(fill, floor, "floor"),
        )
    )
    return out


def ods_rows(n: int, path: Path, folder: Path) -> list[str]:
    cal = measure([PY, "-c", CALAMINE, str(path)])
    floor = measure([PY, "-c", SCAN_ODS, str(path)])
    audit_cmd, fill_cmd = _commands(path, folder)
    audit, fill = measure(audit_cmd), measure(fill_cmd)
    return [
        _row(n, "ods", "python-calamine read", cal, "1.00", _ratio(cal, floor, "floor")),
        _row(
            n,
            "ods",
            "the floor: expat scan of the role columns",
            floor,
            _ratio(floor, cal, "calamine"),
            "1.00",
        ),
        _row(
            n, "ods", "cellchem audit", audit, _ratio(audit, cal, "calamine"), _ratio(audit, floor, "floor")
        ),
        _row(n, "ods", "cellchem fill", fill, _ratio(fill, cal, "calamine"), _ratio(fill, floor, "floor")),
    ]


def csv_rows(n: int, path: Path, folder: Path) -> list[str]:
    floor = measure([PY, "-c", SCAN_CSV, str(path)])
    audit_cmd, fill_cmd = _commands(path, folder)
    audit, fill = measure(audit_cmd), measure(fill_cmd)
    return [
        _row(n, "csv", "the floor: csv module over every line", floor, "", "1.00"),
        _row(n, "csv", "cellchem audit", audit, "", _ratio(audit, floor, "floor")),
        _row(n, "csv", "cellchem fill", fill, "", _ratio(fill, floor, "floor")),
    ]


def files_table(
    sizes: list[int], folder: Path, forms: set[str], strings: list[str], max_save: int
) -> tuple[list[str], list[str]]:
    sys.path.insert(0, str(HERE))
    import generate

    out = [
        "| lines | file | step | seconds | peak MB | ratio | against the floor |",
        "| ---: | --- | --- | ---: | ---: | --- | --- |",
    ]
    notes: list[str] = []
    for n in sizes:
        shared = folder / f"inventory-{n}.xlsx"
        if "xlsx" in forms or "ods" in forms:
            if not shared.exists():
                generate.write(n, shared, strings="shared")
        if "xlsx" in forms:
            for kind in strings:
                path = shared if kind == "shared" else folder / f"inventory-{n}-inline.xlsx"
                if not path.exists():
                    generate.write(n, path, strings=kind)
                out += xlsx_rows(n, path, folder, f"xlsx, {kind} strings", max_save)
        if "ods" in forms:
            ods, note = to_ods(shared)
            if note:
                notes.append(note)
            if ods is not None:
                out += ods_rows(n, ods, folder)
        if "csv" in forms:
            path = folder / f"inventory-{n}.csv"
            if not path.exists():
                generate.write_csv(n, path)
            out += csv_rows(n, path, folder)
    return out, notes


def per_call(fn, n: int) -> float:
    start = time.perf_counter()
    for _ in range(n):
        fn()
    return (time.perf_counter() - start) / n * 1e6


def formulas_table() -> list[str]:
    import molmass
    import periodictable

    from cellchem import molar_mass

    def first_sight(items):
        timings = []
        for fn in (molar_mass, lambda f: periodictable.formula(f).mass, lambda f: molmass.Formula(f).mass):
            start = time.perf_counter()
            for f in items:
                fn(f)
            timings.append((time.perf_counter() - start) / len(items) * 1e6)
        return timings

    def best_first_sight(make):  # three fresh sets (never seen before), the best of each library
        runs = [first_sight([make(i) for i in range(k * 3000 + 1, k * 3000 + 3001)]) for k in range(3)]
        return [min(r[j] for r in runs) for j in range(3)]

    ours_first, pt_first, mm_first = best_first_sight(lambda i: f"C{i}H{2 * i + 2}")  # alkanes
    ours_b, pt_b, mm_b = best_first_sight(lambda i: f"Al2(SO4)3(H2O){i}")  # with brackets
    ours_again = per_call(lambda: molar_mass("CuSO4·5H2O"), 200_000)
    pt_again = per_call(lambda: periodictable.formula("CuSO4(H2O)5").mass, 5_000)
    mm_again = per_call(lambda: molmass.Formula("CuSO4(H2O)5").mass, 20_000)
    faster = min(pt_first, mm_first)
    return [
        "| formula parse + molar mass | cellchem us | periodictable us | molmass us | ratio |",
        "| --- | ---: | ---: | ---: | --- |",
        f"| first sight, simple (3,000 alkanes) | {ours_first:.1f} | {pt_first:.1f} | {mm_first:.1f} |"
        f" {ours_first / faster:.2f} x the faster |",
        f"| first sight, with brackets (3,000) | {ours_b:.1f} | {pt_b:.1f} | {mm_b:.1f} |"
        f" {ours_b / min(pt_b, mm_b):.2f} x the faster |",
        f"| repeated (CuSO4·5H2O) | {ours_again:.2f} | {pt_again:.1f} | {mm_again:.1f} |"
        f" {ours_again:.2f} us |",
    ]


def layer_table() -> list[str]:
    import gc

    from cellchem import molar_mass
    from cellchem.adapters.sheets.functions import FUNCTIONS

    molar_mass_cells = FUNCTIONS["MOLAR_MASS"].implementation

    grid = [["NaCl"], ["CuSO4·5H2O"], ["KCl"], ["Al2(SO4)3"]] * 2500
    molar_mass("NaCl")
    molar_mass_cells(grid)

    def best(fn) -> float:  # the best of five runs: the least disturbed by other work on the machine
        times = []
        for _ in range(5):
            gc.collect()
            start = time.perf_counter()
            fn()
            times.append((time.perf_counter() - start) / len(grid) * 1e6)
        return min(times)

    layer = best(lambda: molar_mass_cells(grid))
    core = best(lambda: [float(molar_mass(r[0])) for r in grid])
    return [
        "| worksheet layer (10,000-cell range, MOLAR_MASS) | us per cell |",
        "| --- | ---: |",
        f"| core call | {core:.2f} |",
        f"| layer overhead over the core | {layer - core:.2f} |",
    ]


def main() -> None:
    parser = argparse.ArgumentParser(
        description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter
    )
    parser.add_argument("--sizes", default="10000,100000", help="comma-separated line counts")
    parser.add_argument("--forms", default="xlsx,ods,csv", help="file forms to measure: xlsx, ods, csv")
    parser.add_argument(
        "--strings", default="shared", help="how the .xlsx stores its texts: shared, inline or both (comma)"
    )
    parser.add_argument(
        "--max-save-lines",
        type=int,
        default=200_000,
        help="run openpyxl's load + save only up to this many lines (it needs over 4 GB at a million)",
    )
    parser.add_argument("--keep", metavar="DIR", help="keep the generated files in DIR")
    args = parser.parse_args()
    sizes = [int(s) for s in args.sizes.split(",") if s.strip()]
    forms = {f.strip() for f in args.forms.split(",") if f.strip()}
    strings = [s.strip() for s in args.strings.split(",") if s.strip()]
    if forms - {"xlsx", "ods", "csv"} or set(strings) - {"shared", "inline"}:
        parser.error("--forms takes xlsx, ods, csv; --strings takes shared, inline")
    with tempfile.TemporaryDirectory() as tmp:
        folder = Path(args.keep) if args.keep else Path(tmp)
        folder.mkdir(parents=True, exist_ok=True)
        lines, notes = files_table(sizes, folder, forms, strings, args.max_save_lines)
    lines += [f"- {note}" for note in notes]
    lines += [""] + formulas_table() + [""] + layer_table()
    lines += ["", f"({os.cpu_count()} cores; each file step in its own process, wall-clock time)"]
    print("\n".join(lines))


if __name__ == "__main__":
    main()
