"""Synthetic inventories for the benchmarks (invented data).

A realistic mix for a stores list: compounds repeated from a catalogue of
about sixty, hydrates, names in varied forms (legacy, British, grade words),
some organics and mixtures, and a few defects (a wrong molar mass, a formula
in capitals, a bad CAS check digit). Ten columns. Deterministic for a seed.

Workbooks are written by openpyxl in write-only mode, which stores every text
inline in the sheet. Excel and LibreOffice store texts in the shared-strings
table instead, so ``strings="shared"`` (the default) moves them there after
writing, as a spreadsheet program saving the file would: each text once in
``xl/sharedStrings.xml``, each cell a reference to it, no cell for an empty
text. ``write_csv`` writes the same lines as a UTF-8 CSV export.

    python benchmarks/generate.py 100000 /tmp/inventory-100000.xlsx [inline|shared]
    python benchmarks/generate.py 100000 /tmp/inventory-100000.csv
"""

from __future__ import annotations

import csv
import random
import re
import sys
import tempfile
import zipfile
from pathlib import Path

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE.parent / "workbooks"))


def _header() -> list[str]:
    import make_demos

    return [*make_demos.INVENTORY_HEADER, "Notes"]


VARIANTS = {
    "Copper(II) sulfate pentahydrate": ["Copper sulphate crystals", "Cupric sulfate 5-hydrate, AR"],
    "Iron(III) chloride hexahydrate": ["Ferric chloride hexahydrate", "Iron (III) chloride, 6-hydrate"],
    "Sodium hydrogencarbonate": ["Sodium bicarbonate", "Sodium hydrogen carbonate, GPR"],
    "Aluminium sulfate": ["Aluminum sulfate", "Aluminium sulphate"],
}
ORGANIC = [
    ("Glucose", "C6H12O6", 180.16, "50-99-7"),
    ("Ethanol, absolute", "C2H5OH", 46.07, "64-17-5"),
    ("Universal indicator solution", "", None, ""),
    ("Citric acid monohydrate", "C6H8O7·H2O", 210.14, "5949-29-1"),
]


def rows(count: int, seed: int = 1):
    import make_demos

    from cellchem import molar_mass

    rng = random.Random(seed)
    catalogue = [(n, f, round(float(molar_mass(f)), 2), c) for n, f, c in make_demos.CATALOGUE]
    for i in range(count):
        roll = rng.random()
        if roll < 0.06:
            name, formula, mass, cas = rng.choice(ORGANIC)
        else:
            name, formula, mass, cas = rng.choice(catalogue)
            if name in VARIANTS and rng.random() < 0.5:
                name = rng.choice(VARIANTS[name])
            if rng.random() < 0.3:
                formula = formula.replace("·", ".")
            defect = rng.random()
            if defect < 0.02:
                mass = round(mass * 1.1, 2)
            elif defect < 0.03:
                formula = formula.upper()
            elif defect < 0.04 and cas:
                cas = cas[:-1] + str((int(cas[-1]) + 1) % 10)
        yield [
            f"S-{i + 1:07d}",
            rng.choice(make_demos.LOCATIONS),
            name,
            formula,
            mass,
            cas,
            rng.choice(make_demos.SUPPLIERS),
            rng.choice([25, 100, 500, 1000]),
            "g",
            "",
        ]


def write(count: int, path: Path, seed: int = 1, strings: str = "shared") -> Path:
    """An inventory workbook of ``count`` lines; ``strings`` is "shared" (as spreadsheet
    programs store texts) or "inline" (as openpyxl's write-only mode does)."""
    from openpyxl import Workbook

    if strings not in ("shared", "inline"):
        raise ValueError(f"strings is shared or inline, not {strings!r}")
    wb = Workbook(write_only=True)
    ws = wb.create_sheet("Stock")
    ws.append(_header())
    for row in rows(count, seed):
        ws.append(row)
    if strings == "inline":
        wb.save(path)
        return path
    with tempfile.TemporaryDirectory() as tmp:
        inline = Path(tmp) / "inline.xlsx"
        wb.save(inline)
        _to_shared_strings(inline, path)
    return path


def write_csv(count: int, path: Path, seed: int = 1) -> Path:
    """The same lines as ``write`` as a UTF-8 CSV export (comma-separated, CRLF as Excel writes)."""
    with open(path, "w", encoding="utf-8", newline="") as fh:
        out = csv.writer(fh)
        out.writerow(_header())
        for row in rows(count, seed):
            out.writerow("" if v is None else f"{v:.15g}" if isinstance(v, float) else v for v in row)
    return path


_SHEET = "xl/worksheets/sheet1.xml"
_INLINE_CELL = re.compile(
    rb'<c r="([A-Z]+[0-9]+)"((?: [a-z]+="[^"]*")*?) t="inlineStr"'
    rb"(?:/>|>(?:<is>(<t(?: [^>]*)?>)(.*?)</t></is>)?</c>)",
    re.DOTALL,
)
_MAIN_NS = "http://schemas.openxmlformats.org/spreadsheetml/2006/main"
_STRINGS_TYPE = "application/vnd.openxmlformats-officedocument.spreadsheetml.sharedStrings+xml"
_STRINGS_REL = "http://schemas.openxmlformats.org/officeDocument/2006/relationships/sharedStrings"


def _to_shared_strings(source: Path, path: Path) -> None:
    """Copy the workbook at ``source`` to ``path`` with the sheet's inline texts
    moved to a shared-strings part (the sheet streamed, one row batch at a time)."""
    index: dict[bytes, tuple[int, bytes]] = {}
    uses = 0

    def shared(match: re.Match) -> bytes:
        nonlocal uses
        text = match.group(4)
        if not text:
            return b""  # a spreadsheet program writes no cell for an empty text
        uses += 1
        number, _tag = index.setdefault(text, (len(index), match.group(3)))
        return b'<c r="%s"%s t="s"><v>%d</v></c>' % (match.group(1), match.group(2), number)

    with zipfile.ZipFile(source) as zin, zipfile.ZipFile(path, "w", zipfile.ZIP_DEFLATED) as zout:
        for info in zin.infolist():
            if info.filename == _SHEET:
                with zin.open(info) as src, zout.open(_SHEET, "w") as dst:
                    rest = b""
                    for block in iter(lambda: src.read(1 << 20), b""):
                        rest += block
                        cut = rest.rfind(b"</row>") + len(b"</row>")
                        if cut >= len(b"</row>"):
                            dst.write(_INLINE_CELL.sub(shared, rest[:cut]))
                            rest = rest[cut:]
                    dst.write(_INLINE_CELL.sub(shared, rest))
                continue
            data = zin.read(info)
            if info.filename == "[Content_Types].xml":
                override = f'<Override PartName="/xl/sharedStrings.xml" ContentType="{_STRINGS_TYPE}"/>'
                data = data.replace(b"</Types>", override.encode() + b"</Types>")
            elif info.filename == "xl/_rels/workbook.xml.rels":
                data = data.replace(
                    b"</Relationships>",
                    f'<Relationship Type="{_STRINGS_REL}" Target="sharedStrings.xml" Id="rIdStrings"/>'
                    "</Relationships>".encode(),
                )
            zout.writestr(info, data, zipfile.ZIP_DEFLATED)
        with zout.open("xl/sharedStrings.xml", "w") as dst:
            dst.write(
                b'<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n'
                b'<sst xmlns="%s" count="%d" uniqueCount="%d">' % (_MAIN_NS.encode(), uses, len(index))
            )
            batch = []
            for text, (_number, tag) in index.items():  # insertion order is the numbering
                batch.append(b"<si>%s%s</t></si>" % (tag, text))
                if len(batch) >= 10000:
                    dst.write(b"".join(batch))
                    batch.clear()
            dst.write(b"".join(batch) + b"</sst>")


if __name__ == "__main__":
    n = int(sys.argv[1]) if len(sys.argv) > 1 else 10000
    out = Path(sys.argv[2]) if len(sys.argv) > 2 else Path(f"inventory-{n}.xlsx")
    if out.suffix.lower() == ".csv":
        print(write_csv(n, out))
    else:
        print(write(n, out, strings=sys.argv[3] if len(sys.argv) > 3 else "shared"))
