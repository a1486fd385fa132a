"""Hostile and oversized input files, built on the fly, and a runner that runs
cellchem on them in a bounded child process.

Nothing here is a committed binary: every file is written into a folder the
caller gives, with the standard library only. Zip members are written by a
small raw writer (local headers, central directory) so that a member can be
streamed through zlib without being held whole, and so that a member can
declare a size its data does not have. Parts made of one unit repeated
(whitespace, identical rows, a long text) are compressed once with a full
flush and the compressed bytes repeated: a gigabyte of inflated XML costs
well under a second to build and about a megabyte on disk.

Each case (``CASES``) names its builder at full size and at a small size:
the small file is an ordinary file of the same shape, which cellchem must
read normally (it shows that the full-size file reaches the readers).

Used by ``tests/test_hostile_files.py`` and ``benchmarks/hostile.py``.
"""

from __future__ import annotations

import functools
import os
import resource
import signal
import struct
import subprocess
import sys
import tempfile
import time
import zlib
from collections.abc import Callable, Iterable, Iterator, Sequence
from dataclasses import dataclass
from pathlib import Path

# ---------------------------------------------------------------------------
# The data every file carries, so that the files reach the readers

HEADER = ("Name", "Formula", "Molar mass", "CAS No.")
# Lines as a stores list prints them. Molar masses: periodictable (PyPI) rounded to
# two decimals; CAS RNs as printed on supplier labels and safety data sheets (from
# memory; each passes the CAS check digit).
LINES = (
    ("Sodium chloride", "NaCl", 58.44, "7647-14-5"),
    ("Copper(II) sulfate pentahydrate", "CuSO4·5H2O", 249.68, "7758-99-8"),
    ("Potassium nitrate", "KNO3", 101.10, "7757-79-1"),
    ("Magnesium sulfate heptahydrate", "MgSO4·7H2O", 246.47, "10034-99-8"),
    ("Calcium carbonate", "CaCO3", 100.09, "471-34-1"),
    ("Iron(III) chloride hexahydrate", "FeCl3·6H2O", 270.29, "10025-77-1"),
)
# The formulas above as periodictable writes them (an oracle for the molar masses fill writes)
ORACLE_FORMULAS = {
    "NaCl": "NaCl",
    "CuSO4·5H2O": "CuSO4(H2O)5",
    "KNO3": "KNO3",
    "MgSO4·7H2O": "MgSO4(H2O)7",
    "CaCO3": "CaCO3",
    "FeCl3·6H2O": "FeCl3(H2O)6",
}
# The wider layout of the large text export (the benchmark inventory's columns)
WIDE_HEADER = (
    "Stock no.",
    "Location",
    "Name",
    "Formula",
    "Molar mass",
    "CAS No.",
    "Supplier",
    "Qty",
    "Unit",
    "Notes",
)
LOCATIONS = ("Prep room A, shelf {}", "Store 1, cabinet {}", "Acid cabinet {}", "Cold store, bay {}")
SUPPLIERS = ("Tarnhollow Scientific", "Quillbrook Reagents")
NOTES = (
    "Reorder at two units; keep the lid closed and away from acids and reducing agents; see the hazard file",
    "Checked at the annual stock take; label replaced, the certificate of analysis is on file in the office",
    "Used for the year 10 practical on salts; return to the prep room after each class and log the mass used",
)

# The limits cellchem documents for untrusted files: a part may declare up to 1 GiB
# inflated and a text export may be 1 GiB. The bombs stay just under them, so that
# the declared sizes alone do not refuse them and the readers have to cope.
GIB = 1 << 30
MIB = 1 << 20
BOMB_BYTES = GIB - MIB

# ---------------------------------------------------------------------------
# A raw zip writer with streamed deflate


@dataclass(frozen=True)
class Repeat:
    """``unit`` written ``times`` times over (compressed once, repeated compressed)."""

    unit: bytes
    times: int


Piece = bytes | Repeat


def repeated(unit: bytes, total: int, chunk: int = MIB) -> list[Piece]:
    """Pieces making ``total`` bytes of ``unit`` repeated (the last unit cut)."""
    per_chunk = max(1, chunk // len(unit))
    block = unit * per_chunk
    pieces: list[Piece] = []
    if total >= len(block):
        pieces.append(Repeat(block, total // len(block)))
    rest = total % len(block) if total >= len(block) else total
    if rest:
        pieces.append((unit * (rest // len(unit) + 1))[:rest])
    return pieces


def piece_size(pieces: Iterable[Piece]) -> int:
    return sum(len(p.unit) * p.times if isinstance(p, Repeat) else len(p) for p in pieces)


_LOCAL = struct.Struct("<4sHHHHHLLLHH")
_CENTRAL = struct.Struct("<4sHHHHHHLLLHHHHHLL")
_END = struct.Struct("<4sHHHHLLH")
_DOS_DATE = (2024 - 1980) << 9 | 3 << 5 | 1  # 1 March 2024
_DOS_TIME = 9 << 11  # 09:00


@dataclass(frozen=True)
class Member:
    """A zip member: its name and its uncompressed content as pieces.

    ``stored`` writes it without compression (an OpenDocument ``mimetype``).
    ``declare`` makes the local header and the central directory declare that
    many bytes (and the CRC of the first that many): the data inflates to more.
    ``level`` is zlib's level for the pieces that are not repeated.
    """

    name: str
    pieces: Sequence[Piece] | Iterable[Piece]
    stored: bool = False
    declare: int | None = None
    level: int = 6


def _deflate(pieces: Iterable[Piece], level: int, out, keep_head: int) -> tuple[int, int, bytes]:
    """Deflate ``pieces`` into ``out``; (crc, inflated size, the first ``keep_head`` bytes)."""
    co = zlib.compressobj(level, zlib.DEFLATED, -15)
    crc = size = 0
    head = bytearray()
    compressed_units: dict[int, bytes] = {}
    for piece in pieces:
        if isinstance(piece, Repeat):
            key = id(piece.unit)
            if key not in compressed_units:
                unit_co = zlib.compressobj(9, zlib.DEFLATED, -15)
                compressed_units[key] = unit_co.compress(piece.unit) + unit_co.flush(zlib.Z_FULL_FLUSH)
            out.write(co.flush(zlib.Z_FULL_FLUSH))  # byte-aligned, no reference back past this point
            data = compressed_units[key]
            for _ in range(piece.times):
                out.write(data)
                crc = zlib.crc32(piece.unit, crc)
                if len(head) < keep_head:
                    head += piece.unit[: keep_head - len(head)]
            size += len(piece.unit) * piece.times
        else:
            out.write(co.compress(piece))
            crc = zlib.crc32(piece, crc)
            size += len(piece)
            if len(head) < keep_head:
                head += piece[: keep_head - len(head)]
    out.write(co.flush())
    return crc, size, bytes(head)


def write_zip(path: Path, members: Sequence[Member]) -> Path:
    """Write the members as a zip archive at ``path``, streaming each through zlib."""
    entries = []
    with open(path, "wb") as fh:
        for member in members:
            name = member.name.encode("utf-8")
            offset = fh.tell()
            fh.write(b"\0" * (_LOCAL.size + len(name)))
            start = fh.tell()
            if member.stored:
                data = b"".join(p if isinstance(p, bytes) else p.unit * p.times for p in member.pieces)
                fh.write(data)
                crc, size, method = zlib.crc32(data), len(data), 0
            else:
                keep = member.declare or 0
                crc, size, head = _deflate(member.pieces, member.level, fh, keep)
                method = 8
                if member.declare is not None:
                    crc, size = zlib.crc32(head), member.declare
            end = fh.tell()
            csize = end - start
            fh.seek(offset)
            fh.write(
                _LOCAL.pack(
                    b"PK\x03\x04", 20, 0, method, _DOS_TIME, _DOS_DATE, crc, csize, size, len(name), 0
                )
            )
            fh.write(name)
            fh.seek(end)
            entries.append((name, method, crc, csize, size, offset))
        directory = fh.tell()
        for name, method, crc, csize, size, offset in entries:
            fh.write(
                _CENTRAL.pack(
                    b"PK\x01\x02",
                    0x031E,  # made by: Unix, zip 3.0
                    20,
                    0,
                    method,
                    _DOS_TIME,
                    _DOS_DATE,
                    crc,
                    csize,
                    size,
                    len(name),
                    0,
                    0,
                    0,
                    0,
                    0o100644 << 16,
                    offset,
                )
            )
            fh.write(name)
        length = fh.tell() - directory
        fh.write(_END.pack(b"PK\x05\x06", 0, 0, len(entries), len(entries), length, directory, 0))
    return path


# ---------------------------------------------------------------------------
# Office Open XML (.xlsx)

_MAIN = "http://schemas.openxmlformats.org/spreadsheetml/2006/main"
_DOC_RELS = "http://schemas.openxmlformats.org/officeDocument/2006/relationships"
_PKG_RELS = "http://schemas.openxmlformats.org/package/2006/relationships"
_CT = "application/vnd.openxmlformats-officedocument.spreadsheetml"
_XML_DECL = b'<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n'

_STYLES = (
    _XML_DECL
    + f'<styleSheet xmlns="{_MAIN}">'
    '<fonts count="1"><font><sz val="11"/><name val="Calibri"/><family val="2"/></font></fonts>'
    '<fills count="2"><fill><patternFill patternType="none"/></fill>'
    '<fill><patternFill patternType="gray125"/></fill></fills>'
    '<borders count="1"><border><left/><right/><top/><bottom/><diagonal/></border></borders>'
    '<cellStyleXfs count="1"><xf numFmtId="0" fontId="0" fillId="0" borderId="0"/></cellStyleXfs>'
    '<cellXfs count="1"><xf numFmtId="0" fontId="0" fillId="0" borderId="0" xfId="0"/></cellXfs>'
    '<cellStyles count="1"><cellStyle name="Normal" xfId="0" builtinId="0"/></cellStyles>'
    "</styleSheet>".encode()
)


def _xml_text(text: str) -> str:
    return text.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;")


def column_letter(index: int) -> str:
    """The letters of a 0-based column index (0 is A, 26 is AA)."""
    letters = ""
    index += 1
    while index:
        index, rest = divmod(index - 1, 26)
        letters = chr(65 + rest) + letters
    return letters


class SharedStrings:
    """The workbook's shared strings, in order of first use."""

    def __init__(self) -> None:
        self.index: dict[str, int] = {}
        self.uses = 0

    def __call__(self, text: str) -> int:
        self.uses += 1
        return self.index.setdefault(text, len(self.index))

    def part(self, extra: Sequence[Piece] = ()) -> list[Piece]:
        """The sharedStrings part; ``extra`` is the pieces of one more string's text, last."""
        count = len(self.index) + (1 if extra else 0)
        items = "".join(f"<si><t>{_xml_text(s)}</t></si>" for s in self.index)
        head = f'{_XML_DECL.decode()}<sst xmlns="{_MAIN}" count="{self.uses}" uniqueCount="{count}">{items}'
        if not extra:
            return [(head + "</sst>").encode()]
        return [(head + "<si><t>").encode(), *extra, b"</t></si></sst>"]


def xlsx_cell(value: object, ref: str | None, strings: SharedStrings | None) -> str:
    """One ``<c>`` element: a number, or text as a shared string (``strings``) or inline."""
    r = f' r="{ref}"' if ref else ""
    if value is None or value == "":
        return ""
    if isinstance(value, int | float):
        return f"<c{r}><v>{value}</v></c>"
    if strings is not None:
        return f'<c{r} t="s"><v>{strings(str(value))}</v></c>'
    return f'<c{r} t="inlineStr"><is><t>{_xml_text(str(value))}</t></is></c>'


def xlsx_row(
    values: Sequence[object],
    row: int | None,
    strings: SharedStrings | None,
    *,
    cell_refs: bool = True,
    first_column: int = 0,
) -> str:
    """One ``<row>``; ``row`` None leaves out its ``r``, ``cell_refs`` False the cells' ``r``."""
    cells = []
    for i, value in enumerate(values):
        if not cell_refs:  # each cell follows the one before: an empty one cannot be left out
            cells.append(xlsx_cell(value, None, strings) or "<c/>")
            continue
        ref = f"{column_letter(first_column + i)}{row}" if row is not None else None
        cells.append(xlsx_cell(value, ref, strings))
    attr = f' r="{row}"' if row is not None else ""
    return f"<row{attr}>{''.join(cells)}</row>"


def _sheet_head(dimension: str | None) -> bytes:
    dim = f'<dimension ref="{dimension}"/>' if dimension else ""
    return (
        _XML_DECL
        + f'<worksheet xmlns="{_MAIN}" xmlns:r="{_DOC_RELS}">{dim}'
        '<sheetViews><sheetView workbookViewId="0"/></sheetViews>'
        '<sheetFormatPr defaultRowHeight="15"/><sheetData>'.encode()
    )


_SHEET_TAIL = (
    b'</sheetData><pageMargins left="0.7" right="0.7" top="0.75" bottom="0.75" header="0.3" footer="0.3"/>'
    b"</worksheet>"
)


def write_xlsx(
    path: Path,
    sheet: Sequence[Piece] | Iterable[Piece],
    strings: SharedStrings | None = None,
    *,
    shared_extra: Sequence[Piece] = (),
    sheet_level: int = 6,
    declare_sheet: int | None = None,
    sheet_name: str = "Stock",
    strings_last: bool = False,
) -> Path:
    """A one-sheet workbook whose sheet part is ``sheet`` (the whole part, as pieces).

    ``strings_last`` writes the shared strings after the sheet, so that a sheet
    generated while it is written may add strings (the part is made at its turn).
    """
    has_strings = strings is not None and (strings.index or shared_extra or strings_last)
    overrides = [
        ("/xl/workbook.xml", f"{_CT}.sheet.main+xml"),
        ("/xl/worksheets/sheet1.xml", f"{_CT}.worksheet+xml"),
        ("/xl/styles.xml", f"{_CT}.styles+xml"),
    ]
    rels = [("rId1", "worksheet", "worksheets/sheet1.xml"), ("rId2", "styles", "styles.xml")]
    if has_strings:
        overrides.append(("/xl/sharedStrings.xml", f"{_CT}.sharedStrings+xml"))
        rels.append(("rId3", "sharedStrings", "sharedStrings.xml"))
    types = (
        _XML_DECL.decode() + '<Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types">'
        '<Default Extension="rels" ContentType="application/vnd.openxmlformats-package.relationships+xml"/>'
        '<Default Extension="xml" ContentType="application/xml"/>'
        + "".join(f'<Override PartName="{p}" ContentType="{t}"/>' for p, t in overrides)
        + "</Types>"
    )
    root_rels = (
        _XML_DECL.decode() + f'<Relationships xmlns="{_PKG_RELS}">'
        f'<Relationship Id="rId1" Type="{_DOC_RELS}/officeDocument" Target="xl/workbook.xml"/>'
        "</Relationships>"
    )
    book = (
        _XML_DECL.decode() + f'<workbook xmlns="{_MAIN}" xmlns:r="{_DOC_RELS}">'
        f'<sheets><sheet name="{sheet_name}" sheetId="1" r:id="rId1"/></sheets></workbook>'
    )
    book_rels = (
        _XML_DECL.decode()
        + f'<Relationships xmlns="{_PKG_RELS}">'
        + "".join(f'<Relationship Id="{i}" Type="{_DOC_RELS}/{t}" Target="{p}"/>' for i, t, p in rels)
        + "</Relationships>"
    )
    members = [
        Member("[Content_Types].xml", [types.encode()]),
        Member("_rels/.rels", [root_rels.encode()]),
        Member("xl/workbook.xml", [book.encode()]),
        Member("xl/_rels/workbook.xml.rels", [book_rels.encode()]),
        Member("xl/styles.xml", [_STYLES]),
    ]
    sheet_member = Member("xl/worksheets/sheet1.xml", sheet, level=sheet_level, declare=declare_sheet)
    if strings_last:
        members.append(sheet_member)
    if has_strings or strings_last:
        assert strings is not None

        def strings_part() -> Iterator[Piece]:  # made when written, after any sheet before it
            yield from strings.part(shared_extra)

        members.append(Member("xl/sharedStrings.xml", strings_part()))
    if not strings_last:  # the sheet last, after the parts a reader needs first
        members.append(sheet_member)
    return write_zip(path, members)


def _line_rows(lines: Sequence[Sequence[object]], first_row: int, strings: SharedStrings | None) -> str:
    return "".join(xlsx_row(line, first_row + i, strings) for i, line in enumerate(lines))


def xlsx_plain(folder: Path, lines: int = 6, *, shared: bool = True, name: str = "plain.xlsx") -> Path:
    """An ordinary workbook: the header and ``lines`` lines (the catalogue repeated)."""
    strings = SharedStrings() if shared else None
    body = [LINES[i % len(LINES)] for i in range(lines)]
    rows = xlsx_row(HEADER, 1, strings) + _line_rows(body, 2, strings)
    sheet = [_sheet_head(f"A1:D{lines + 1}"), rows.encode(), _SHEET_TAIL]
    return write_xlsx(folder / name, sheet, strings)


def xlsx_cell_bomb(folder: Path, inflated: int = BOMB_BYTES, cells_per_row: int = 64) -> Path:
    """A sheet inflating to ``inflated`` bytes of cells: the header, the catalogue's
    lines, then rows of ``cells_per_row`` numeric cells (E onwards, beside the table)
    until the size is reached. At full size: about 69 million ``<c>`` cells in
    1,079,237 rows (past the 1,048,576 rows a sheet has), 12 MB on disk. Rows carry
    ``r``; the filler cells after the first of each row do not (they follow it)."""
    strings = SharedStrings()
    head = xlsx_row(HEADER, 1, strings) + _line_rows(LINES, 2, strings)
    first = len(LINES) + 2
    filler = "<c><v>1</v></c>" * (cells_per_row - 1)
    budget = inflated - len(_SHEET_TAIL)

    def pieces() -> Iterator[bytes]:
        start = _sheet_head(None) + head.encode()
        yield start
        size = len(start)
        row = first
        while True:
            batch = []
            for _ in range(2000):
                text = f'<row r="{row}"><c r="E{row}"><v>1</v></c>{filler}</row>'.encode()
                if size + len(text) > budget:
                    break
                batch.append(text)
                size += len(text)
                row += 1
            else:
                yield b"".join(batch)
                continue
            yield b"".join(batch)
            break
        yield _SHEET_TAIL

    return write_xlsx(folder / "cell-bomb.xlsx", pieces(), strings, sheet_level=1)


_WHITESPACE = b"\n" + b" " * 127


def xlsx_whitespace_bomb(folder: Path, inflated: int = BOMB_BYTES) -> Path:
    """A sheet whose ``<sheetData>`` holds ``inflated`` bytes (less its few rows) of
    whitespace between the catalogue's lines and one last line."""
    strings = SharedStrings()
    head = _sheet_head(None) + (xlsx_row(HEADER, 1, strings) + _line_rows(LINES[:3], 2, strings)).encode()
    tail = _line_rows(LINES[3:], 5, strings).encode() + _SHEET_TAIL
    fill = inflated - len(head) - len(tail)
    return write_xlsx(folder / "whitespace-bomb.xlsx", [head, *repeated(_WHITESPACE, fill), tail], strings)


def xlsx_wide_row(folder: Path, cells: int = 9_500_000) -> Path:
    """Row 2 holds a line (A to D) and then ``cells`` more numeric cells, written without
    ``r`` (about 200 MiB inflated, about 0.2 MB on disk at full size); lines follow."""
    strings = SharedStrings()
    unit = b'<c t="n"><v>7</v></c>'
    head = (
        _sheet_head(None)
        + (xlsx_row(HEADER, 1, strings) + xlsx_row(LINES[0], 2, strings)[: -len("</row>")]).encode()
    )
    tail = ("</row>" + _line_rows(LINES[1:], 3, strings)).encode() + _SHEET_TAIL
    body = repeated(unit, cells * len(unit), chunk=len(unit) * 50_000)
    return write_xlsx(folder / "wide-row.xlsx", [head, *body, tail], strings)


_LONG_UNIT = b"Sodium chloride "


def xlsx_long_text(folder: Path, kind: str = "inline", size: int = 100_000_000) -> Path:
    """The name cell of row 2 holds a text of ``size`` bytes, as an inline string
    (``kind="inline"``) or as a shared string (``kind="shared"``); the formula cell
    beside it says NaCl, and the catalogue's lines follow."""
    strings = SharedStrings()
    header = xlsx_row(HEADER, 1, strings)
    rest = xlsx_row(["NaCl", 58.44, "7647-14-5"], 2, strings, first_column=1)
    rest = rest[len('<row r="2">') : -len("</row>")]
    lines = _line_rows(LINES, 3, strings)
    text = repeated(_LONG_UNIT, size)
    if kind == "inline":
        head = _sheet_head(None) + (header + '<row r="2"><c r="A2" t="inlineStr"><is><t>').encode()
        sheet = [head, *text, ("</t></is></c>" + rest + "</row>" + lines).encode() + _SHEET_TAIL]
        return write_xlsx(folder / "long-text-inline.xlsx", sheet, strings)
    if kind != "shared":
        raise ValueError(f"kind is inline or shared, not {kind!r}")
    long_index = len(strings.index)  # the long text is the last shared string
    row2 = f'<row r="2"><c r="A2" t="s"><v>{long_index}</v></c>{rest}</row>'
    sheet = [_sheet_head(None) + (header + row2 + lines).encode() + _SHEET_TAIL]
    strings.uses += 1
    return write_xlsx(folder / "long-text-shared.xlsx", sheet, strings, shared_extra=text)


_LETTERS = bytes((b"abcdefghijklmnopqrstuvwxyz     " * 9)[:256])  # each byte to a letter or a space


def random_text(size: int, seed: int = 17) -> bytes:
    """``size`` bytes of letters and spaces that do not compress much (about 60 %)."""
    import random

    return random.Random(seed).randbytes(size).translate(_LETTERS)


def xlsx_text_over_cell_limit(folder: Path, kind: str = "inline", size: int = 1_000_000) -> Path:
    """The name cell of row 2 holds ``size`` characters of random letters (the spreadsheet
    limit is 32,767), as an inline or a shared string; the formula cell beside it says
    NaCl and the catalogue's lines follow. The text hardly compresses: no ratio of
    inflated to stored bytes sets the file apart, so a reader has to cut the text as
    it streams."""
    strings = SharedStrings()
    header = xlsx_row(HEADER, 1, strings)
    rest = xlsx_row(["NaCl", 58.44, "7647-14-5"], 2, strings, first_column=1)
    rest = rest[len('<row r="2">') : -len("</row>")]
    lines = _line_rows(LINES, 3, strings)
    text = random_text(size)
    if kind == "inline":
        head = _sheet_head(None) + (header + '<row r="2"><c r="A2" t="inlineStr"><is><t>').encode()
        sheet = [head, text, ("</t></is></c>" + rest + "</row>" + lines).encode() + _SHEET_TAIL]
        return write_xlsx(folder / "text-over-limit-inline.xlsx", sheet, strings)
    if kind != "shared":
        raise ValueError(f"kind is inline or shared, not {kind!r}")
    row2 = f'<row r="2"><c r="A2" t="s"><v>{len(strings.index)}</v></c>{rest}</row>'
    strings.uses += 1
    sheet = [_sheet_head(None) + (header + row2 + lines).encode() + _SHEET_TAIL]
    return write_xlsx(folder / "text-over-limit-shared.xlsx", sheet, strings, shared_extra=[text])


def xlsx_full_width_row(folder: Path, cells: int = 16_384) -> Path:
    """Row 2 holds a line and then numbers in every column up to the ``cells``-th (16,384
    is XFD, the last column a spreadsheet has), each with its reference and a value
    that does not repeat; the catalogue's other lines follow."""
    import random

    rng = random.Random(5)
    strings = SharedStrings()
    line = xlsx_row(LINES[0], 2, strings)[: -len("</row>")]
    wide = "".join(
        f'<c r="{column_letter(i)}2"><v>{rng.randint(1, 999_999)}</v></c>' for i in range(len(HEADER), cells)
    )
    rows = xlsx_row(HEADER, 1, strings) + line + wide + "</row>" + _line_rows(LINES[1:], 3, strings)
    return write_xlsx(
        folder / "full-width-row.xlsx", [_sheet_head(None), rows.encode(), _SHEET_TAIL], strings
    )


# Two names of 6,800 characters: a catalogue description run on, and a run of ion
# names such as a careless export concatenates (names cellchem must read or refuse).
_DESCRIPTION = "Copper(II) sulfate pentahydrate, crystals, for analysis, ACS reagent, 99.5 %, 500 g; "
_IONS = "sodium potassium ammonium magnesium calcium copper(II) iron(III) chloride sulfate nitrate "


def long_names(chars: int = 6_800) -> tuple[str, str]:
    return (
        (_DESCRIPTION * (chars // len(_DESCRIPTION) + 1))[:chars].strip(),
        (_IONS * (chars // len(_IONS) + 1))[:chars].strip(),
    )


def xlsx_long_name(folder: Path, chars: int = 6_800) -> Path:
    """Two names of ``chars`` characters (one with its formula, one alone), among the catalogue's lines."""
    described, ions = long_names(chars)
    body = [*LINES[:3], (described, "CuSO4·5H2O", 249.68, "7758-99-8"), (ions, None, None, None), *LINES[3:]]
    strings = SharedStrings()
    rows = xlsx_row(HEADER, 1, strings) + _line_rows(body, 2, strings)
    return write_xlsx(
        folder / "long-name.xlsx", [_sheet_head(f"A1:D{len(body) + 1}"), rows.encode(), _SHEET_TAIL], strings
    )


def xlsx_underdeclared(
    folder: Path, declared: int = 1024, inflated: int = 500_000_000, *, honest: bool = False
) -> Path:
    """The sheet part's local header and central-directory entry declare ``declared``
    bytes (with the CRC of those bytes), but its data inflates to ``inflated``: the
    declared bytes hold the header and one line, the rest ever more lines.

    A reader that stops at the declared size sees at most that one line (and a
    sheet cut short); one that does not reads millions. ``honest`` declares the
    true size instead (an ordinary file of the same shape)."""
    strings = SharedStrings()
    head = _sheet_head(None) + (xlsx_row(HEADER, 1, strings) + xlsx_row(LINES[0], 2, strings)).encode()
    if len(head) > declared:
        raise ValueError(f"the declared size {declared} is smaller than the first line ({len(head)} bytes)")
    pad = b" " * (declared - len(head))
    more = "".join(xlsx_row(line, None, strings) for line in LINES[1:]).encode()
    fill = inflated - declared - len(_SHEET_TAIL)
    return write_xlsx(
        folder / "under-declared.xlsx",
        [head + pad, *repeated(more, fill - fill % len(more)), _SHEET_TAIL],
        strings,
        declare_sheet=None if honest else declared,
    )


DECLARED_ROWS = 1  # data rows inside the declared bytes of xlsx_underdeclared


def xlsx_rows_without_r(folder: Path, variant: str = "none") -> Path:
    """The header and the catalogue's lines written without ``r`` attributes:
    ``variant`` "none" (neither rows nor cells), "rows" (rows without, cells with)
    or "cells" (rows with, cells without). All three are valid SpreadsheetML."""
    strings = SharedStrings()
    out = []
    for i, values in enumerate([HEADER, *LINES]):
        number = i + 1
        if variant == "none":
            out.append(xlsx_row(values, None, strings, cell_refs=False))
        elif variant == "cells":
            out.append(xlsx_row(values, number, strings, cell_refs=False))
        elif variant == "rows":
            row = xlsx_row(values, number, strings)
            out.append(row.replace(f'<row r="{number}">', "<row>", 1))
        else:
            raise ValueError(f"variant is none, rows or cells, not {variant!r}")
    sheet = [_sheet_head(None), "".join(out).encode(), _SHEET_TAIL]
    return write_xlsx(folder / f"no-r-{variant}.xlsx", sheet, strings)


def _scramble(i: int) -> int:
    """A fixed pseudo-random number for line ``i`` (a multiplicative hash)."""
    return (i * 2654435761 + 12345) % 4294967296


def inventory_line(i: int) -> tuple:
    """Line ``i`` of a large, ordinary inventory (the wide layout). Shelf, quantity,
    lot number and date of receipt vary as in a real list, so that the file
    compresses about as one does (content.xml about 40 to 1 as .ods; LibreOffice's
    own file of the benchmark inventory: 34 to 1)."""
    name, formula, mass, cas = LINES[i % len(LINES)]
    h = _scramble(i)
    return (
        f"S-{i + 1:07d}",
        LOCATIONS[h % len(LOCATIONS)].format(h % 23 + 1),
        name,
        formula,
        mass,
        cas,
        SUPPLIERS[(h >> 3) % len(SUPPLIERS)],
        (25, 100, 250, 500, 1000)[(h >> 5) % 5],
        "g",
        f"{NOTES[(h >> 8) % len(NOTES)]}; lot {h % 90000 + 10000},"
        f" received 20{(h >> 12) % 10 + 15}-{(h >> 16) % 12 + 1:02d}-{(h >> 20) % 28 + 1:02d}",
    )


def xlsx_inventory(folder: Path, lines: int = 150_000, name: str = "inventory.xlsx") -> Path:
    """An ordinary, large workbook (shared strings, the wide layout): for writes that must fail."""
    strings = SharedStrings()

    def pieces() -> Iterator[bytes]:
        yield _sheet_head(f"A1:J{lines + 1}") + xlsx_row(WIDE_HEADER, 1, strings).encode()
        for start in range(0, lines, 5000):
            stop = min(lines, start + 5000)
            yield "".join(xlsx_row(inventory_line(i), i + 2, strings) for i in range(start, stop)).encode()
        yield _SHEET_TAIL

    return write_xlsx(folder / name, pieces(), strings, sheet_level=1, strings_last=True)


# ---------------------------------------------------------------------------
# Text exports (.csv): written as they are, so large on disk


def _csv_field(value: object) -> str:
    text = "" if value is None else str(value)
    if any(c in text for c in ',"\r\n'):
        return '"' + text.replace('"', '""') + '"'
    return text


def _csv_line(values: Sequence[object]) -> bytes:
    return (",".join(map(_csv_field, values)) + "\n").encode()


def _write_pieces(path: Path, pieces: Iterable[Piece]) -> Path:
    with open(path, "wb") as fh:
        for piece in pieces:
            if isinstance(piece, Repeat):
                for _ in range(piece.times):
                    fh.write(piece.unit)
            else:
                fh.write(piece)
    return path


def csv_plain(folder: Path, lines: int = 6, name: str = "plain.csv") -> Path:
    body = [LINES[i % len(LINES)] for i in range(lines)]
    return _write_pieces(folder / name, [_csv_line(HEADER), *map(_csv_line, body)])


def csv_long_line(folder: Path, size: int = 50_000_000) -> Path:
    """One line of ``size`` bytes (its name field) among the catalogue's lines."""
    head = _csv_line(HEADER) + b"".join(map(_csv_line, LINES[:3]))
    tail = b",NaCl,58.44,7647-14-5\n" + b"".join(map(_csv_line, LINES[3:]))
    return _write_pieces(folder / "long-line.csv", [head, *repeated(_LONG_UNIT, size), tail])


def csv_large(folder: Path, size: int = 200_000_000) -> Path:
    """An ordinary export of about ``size`` bytes (at full size about 840,000 lines of the
    wide layout, under the 1,048,576 rows a sheet has). Blocks of 20,000 different
    lines repeat with new stock numbers (formatted in one go, for speed)."""
    path = folder / "large.csv"
    block = max(1, min(20_000, size // 200))
    template = b"".join(
        _csv_line(inventory_line(j)).replace(b"%", b"%%").replace(b"S-%07d" % (j + 1), b"S-%07d", 1)
        for j in range(block)
    )
    with open(path, "wb") as fh:
        fh.write(_csv_line(WIDE_HEADER))
        written, start = 0, 0
        while written < size:
            fh.write(template % tuple(range(start + 1, start + block + 1)))
            written += len(template)
            start += block
    return path


def csv_unclosed_quote(folder: Path, size: int = BOMB_BYTES, *, closed: bool = False) -> Path:
    """A quote opened on the fourth line and never closed: the rest of the file, up to
    ``size`` bytes in all, is one field holding lines of the catalogue. ``closed``
    closes it at the end (an ordinary file with one long quoted name)."""
    head = _csv_line(HEADER) + b"".join(map(_csv_line, LINES[:2])) + b'"'
    unit = b"".join(map(_csv_line, LINES[2:]))
    end = b'",NaCl,58.44,7647-14-5\n' if closed else b""
    body = repeated(unit, size - len(head) - len(end))
    return _write_pieces(folder / "unclosed-quote.csv", [head, *body, end])


# ---------------------------------------------------------------------------
# OpenDocument spreadsheets (.ods)

ODS_MIMETYPE = b"application/vnd.oasis.opendocument.spreadsheet"
_NS_OFFICE = "urn:oasis:names:tc:opendocument:xmlns:office:1.0"
_NS_TABLE = "urn:oasis:names:tc:opendocument:xmlns:table:1.0"
_NS_TEXT = "urn:oasis:names:tc:opendocument:xmlns:text:1.0"
_NS_MANIFEST = "urn:oasis:names:tc:opendocument:xmlns:manifest:1.0"
_MANIFEST = (
    '<?xml version="1.0" encoding="UTF-8"?>\n'
    f'<manifest:manifest xmlns:manifest="{_NS_MANIFEST}" manifest:version="1.2">'
    '<manifest:file-entry manifest:full-path="/" manifest:version="1.2"'
    f' manifest:media-type="{ODS_MIMETYPE.decode()}"/>'
    '<manifest:file-entry manifest:full-path="content.xml" manifest:media-type="text/xml"/>'
    "</manifest:manifest>"
).encode()
_ODS_HEAD = (
    '<?xml version="1.0" encoding="UTF-8"?>\n'
    f'<office:document-content xmlns:office="{_NS_OFFICE}" xmlns:table="{_NS_TABLE}" xmlns:text="{_NS_TEXT}"'
    ' office:version="1.2"><office:body><office:spreadsheet><table:table table:name="Stock">'
    '<table:table-column table:number-columns-repeated="4"/>'
).encode()
_ODS_TAIL = b"</table:table></office:spreadsheet></office:body></office:document-content>"


def ods_cell(value: object, repeat: int = 1) -> str:
    rep = f' table:number-columns-repeated="{repeat}"' if repeat > 1 else ""
    if value is None or value == "":
        return f"<table:table-cell{rep}/>"
    if isinstance(value, int | float):
        return (
            f'<table:table-cell{rep} office:value-type="float" office:value="{value}">'
            f"<text:p>{value}</text:p></table:table-cell>"
        )
    text = _xml_text(str(value))
    return f'<table:table-cell{rep} office:value-type="string"><text:p>{text}</text:p></table:table-cell>'


def ods_row(values: Sequence[object], repeat: int = 1, after: str = "") -> str:
    rep = f' table:number-rows-repeated="{repeat}"' if repeat > 1 else ""
    return f"<table:table-row{rep}>{''.join(ods_cell(v) for v in values)}{after}</table:table-row>"


def write_ods(path: Path, content: Sequence[Piece] | Iterable[Piece]) -> Path:
    """An OpenDocument spreadsheet: ``mimetype`` stored first, the manifest, ``content.xml``."""
    return write_zip(
        path,
        [
            Member("mimetype", [ODS_MIMETYPE], stored=True),
            Member("META-INF/manifest.xml", [_MANIFEST]),
            Member("content.xml", content),
        ],
    )


def _ods_lines(lines: Sequence[Sequence[object]]) -> str:
    return "".join(ods_row(line) for line in lines)


def ods_plain(folder: Path, lines: int = 6, name: str = "plain.ods") -> Path:
    body = [LINES[i % len(LINES)] for i in range(lines)]
    return write_ods(folder / name, [_ODS_HEAD, (ods_row(HEADER) + _ods_lines(body)).encode(), _ODS_TAIL])


def ods_cell_bomb(folder: Path, inflated: int = BOMB_BYTES, cells_per_row: int = 64) -> Path:
    """content.xml inflating to ``inflated`` bytes of cells: the header, the catalogue's
    lines, then rows of four empty cells and ``cells_per_row`` numeric ones (about 17
    million cells at full size, about 1 MB on disk)."""
    cell = '<table:table-cell office:value-type="float" office:value="1"/>'
    skip = '<table:table-cell table:number-columns-repeated="4"/>'
    unit = f"<table:table-row>{skip}{cell * cells_per_row}</table:table-row>"
    head = _ODS_HEAD + (ods_row(HEADER) + _ods_lines(LINES)).encode()
    fill = inflated - len(head) - len(_ODS_TAIL)
    body = repeated(unit.encode(), fill - fill % len(unit))
    return write_ods(folder / "cell-bomb.ods", [head, *body, _ODS_TAIL])


def ods_whitespace_bomb(folder: Path, inflated: int = BOMB_BYTES) -> Path:
    """content.xml with ``inflated`` bytes (less its few rows) of whitespace between rows of the table."""
    head = _ODS_HEAD + (ods_row(HEADER) + _ods_lines(LINES[:3])).encode()
    tail = _ods_lines(LINES[3:]).encode() + _ODS_TAIL
    fill = inflated - len(head) - len(tail)
    return write_ods(folder / "whitespace-bomb.ods", [head, *repeated(_WHITESPACE, fill), tail])


def ods_repeated_rows(folder: Path, repeat: int = 1_000_000) -> Path:
    """A line written once with ``table:number-rows-repeated`` of ``repeat``, between other lines."""
    rows = ods_row(HEADER) + _ods_lines(LINES[:2]) + ods_row(LINES[2], repeat) + _ods_lines(LINES[3:])
    return write_ods(folder / "repeated-rows.ods", [_ODS_HEAD, rows.encode(), _ODS_TAIL])


def ods_repeated_cells(folder: Path, repeat: int = 16_384, rows: int = 1_000) -> Path:
    """``rows`` lines, each followed by one cell ``table:number-columns-repeated`` ``repeat`` times."""
    after = ods_cell("checked", repeat)
    body = "".join(ods_row(LINES[i % len(LINES)], after=after) for i in range(rows))
    return write_ods(folder / "repeated-cells.ods", [_ODS_HEAD, (ods_row(HEADER) + body).encode(), _ODS_TAIL])


def ods_inventory(folder: Path, lines: int = 150_000, name: str = "inventory.ods") -> Path:
    """An ordinary, large OpenDocument inventory (the wide layout): for writes that must fail."""

    def pieces() -> Iterator[bytes]:
        yield _ODS_HEAD + ods_row(WIDE_HEADER).encode()
        for start in range(0, lines, 5000):
            yield "".join(ods_row(inventory_line(i)) for i in range(start, min(lines, start + 5000))).encode()
        yield _ODS_TAIL

    return write_ods(folder / name, pieces())


# ---------------------------------------------------------------------------
# The cases: each hostile file, its small control, and the rule it is held to


@dataclass(frozen=True)
class Case:
    """One hostile file. ``seconds`` is the wall-clock limit of each command on it;
    ``annotate`` says whether ``audit --annotate`` is run too; ``rows_read`` is
    the number of data rows (below the header) a reader must report for the
    small control."""

    name: str
    build: Callable[[Path], Path]
    small: Callable[[Path], Path]
    seconds: float
    annotate: bool
    what: str
    rows_read: int


BOMB_SECONDS = 10.0  # the rule for cell and whitespace bombs
LIMIT_SECONDS = 30.0  # any other command on any file
MEMORY_BYTES = GIB  # address space of the child process

_p = functools.partial
CASES = (
    Case(
        "xlsx-cell-bomb",
        xlsx_cell_bomb,
        _p(xlsx_cell_bomb, inflated=200_000),
        BOMB_SECONDS,
        True,
        "~69 million cells in 1.08 million rows, 1 GiB inflated",
        -1,
    ),
    Case(
        "xlsx-whitespace-bomb",
        xlsx_whitespace_bomb,
        _p(xlsx_whitespace_bomb, inflated=200_000),
        BOMB_SECONDS,
        True,
        "1 GiB of whitespace inside <sheetData>",
        len(LINES),
    ),
    Case(
        "xlsx-wide-row",
        xlsx_wide_row,
        _p(xlsx_wide_row, cells=50),
        LIMIT_SECONDS,
        True,
        "one row of 9.5 million cells (~200 MiB inflated)",
        len(LINES),
    ),
    Case(
        "xlsx-long-text-inline",
        _p(xlsx_long_text, kind="inline"),
        _p(xlsx_long_text, kind="inline", size=64),
        LIMIT_SECONDS,
        True,
        "100 MB inline string in a name cell",
        len(LINES) + 1,
    ),
    Case(
        "xlsx-long-text-shared",
        _p(xlsx_long_text, kind="shared"),
        _p(xlsx_long_text, kind="shared", size=64),
        LIMIT_SECONDS,
        True,
        "100 MB shared string in a name cell",
        len(LINES) + 1,
    ),
    Case(
        "xlsx-text-over-limit-inline",
        _p(xlsx_text_over_cell_limit, kind="inline"),
        _p(xlsx_text_over_cell_limit, kind="inline", size=64),
        LIMIT_SECONDS,
        True,
        "1 MB inline string of random letters in a name cell",
        len(LINES) + 1,
    ),
    Case(
        "xlsx-text-over-limit-shared",
        _p(xlsx_text_over_cell_limit, kind="shared"),
        _p(xlsx_text_over_cell_limit, kind="shared", size=64),
        LIMIT_SECONDS,
        True,
        "1 MB shared string of random letters in a name cell",
        len(LINES) + 1,
    ),
    Case(
        "xlsx-full-width-row",
        xlsx_full_width_row,
        _p(xlsx_full_width_row, cells=40),
        LIMIT_SECONDS,
        True,
        "a row of 16,384 cells, one in every column",
        len(LINES),
    ),
    Case(
        "xlsx-long-name",
        xlsx_long_name,
        _p(xlsx_long_name, chars=80),
        LIMIT_SECONDS,
        True,
        "two 6,800-character names",
        len(LINES) + 2,
    ),
    Case(
        "xlsx-under-declared",
        xlsx_underdeclared,
        _p(xlsx_underdeclared, inflated=4096, honest=True),
        LIMIT_SECONDS,
        True,
        "sheet declared 1 KB, inflating to 500 MB",
        -1,
    ),
    Case(
        "csv-long-line",
        csv_long_line,
        _p(csv_long_line, size=64),
        LIMIT_SECONDS,
        True,
        "one 50 MB line",
        len(LINES) + 1,
    ),
    Case(
        "csv-large",
        csv_large,
        _p(csv_large, size=100_000),
        LIMIT_SECONDS,
        False,
        "200 MB export (about 840,000 lines)",
        -1,
    ),
    Case(
        "csv-unclosed-quote",
        csv_unclosed_quote,
        _p(csv_unclosed_quote, size=4096, closed=True),
        LIMIT_SECONDS,
        False,
        "quote never closed: a 1 GiB field",
        -1,
    ),
    Case(
        "ods-cell-bomb",
        ods_cell_bomb,
        _p(ods_cell_bomb, inflated=200_000),
        BOMB_SECONDS,
        True,
        "content.xml of ~17 million cells, 1 GiB inflated",
        -1,
    ),
    Case(
        "ods-whitespace-bomb",
        ods_whitespace_bomb,
        _p(ods_whitespace_bomb, inflated=200_000),
        BOMB_SECONDS,
        True,
        "1 GiB of whitespace inside <table:table>",
        len(LINES),
    ),
    Case(
        "ods-repeated-rows",
        ods_repeated_rows,
        _p(ods_repeated_rows, repeat=3),
        LIMIT_SECONDS,
        True,
        "a line repeated 1,000,000 times",
        len(LINES) + 2,
    ),
    Case(
        "ods-repeated-cells",
        ods_repeated_cells,
        _p(ods_repeated_cells, repeat=3, rows=6),
        LIMIT_SECONDS,
        True,
        "1,000 lines each with a cell repeated 16,384 times",
        6,
    ),
)
CASE = {case.name: case for case in CASES}

# ---------------------------------------------------------------------------
# Running cellchem in a bounded child process


@dataclass
class Run:
    args: list[str]
    code: int | None  # None when the child was killed (timeout or on purpose)
    seconds: float
    peak_mb: float
    stdout: str
    stderr: str
    timed_out: bool
    killed: bool

    @property
    def output(self) -> str:
        return self.stdout + self.stderr

    def describe(self) -> str:
        """A one-line account for an assertion message or a table: how it ended, the
        last lines on standard error and why the summary says a file was not read."""
        how = "timed out" if self.timed_out else "killed" if self.killed else f"exit {self.code}"
        last = " | ".join(line for line in self.stderr.strip().splitlines()[-3:])
        text = f"{how} after {self.seconds:.1f} s, peak {self.peak_mb:.0f} MB; stderr: {last[:400]!r}"
        unread = [line.strip() for line in self.stdout.splitlines() if "NOT READ" in line]
        return text + (f"; {unread[0][:400]!r}" if unread else "")


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


def _limits(memory: int | None, fsize: int | None) -> Callable[[], None]:
    def apply() -> None:
        os.umask(0o022)
        if memory:
            resource.setrlimit(resource.RLIMIT_AS, (memory, memory))
        if fsize is not None:
            resource.setrlimit(resource.RLIMIT_FSIZE, (fsize, fsize))
            signal.signal(signal.SIGXFSZ, signal.SIG_IGN)  # a write past the limit fails with EFBIG
        resource.setrlimit(resource.RLIMIT_CORE, (0, 0))

    return apply


def _read_bounded(path: Path, limit: int = 4 * MIB) -> str:
    size = path.stat().st_size
    with open(path, "rb") as fh:
        if size <= 2 * limit:
            data = fh.read()
        else:
            data = fh.read(limit) + b"\n[...]\n"
            fh.seek(size - limit)
            data += fh.read()
    return data.decode("utf-8", errors="replace")


def run_cellchem(
    args: Sequence[str],
    *,
    timeout: float = LIMIT_SECONDS,
    memory: int | None = MEMORY_BYTES,
    fsize: int | None = None,
    cwd: Path | None = None,
    watch: Callable[[int], bool] | None = None,
) -> Run:
    """Run ``python -m cellchem ARGS`` with an address-space limit of ``memory``
    bytes, umask 022, an optional file-size limit, and a wall-clock ``timeout``.

    ``watch(pid)`` is called every 10 ms while the child runs; when it returns
    True the child is killed with SIGKILL. The child's peak resident size is
    its VmHWM read every 10 ms (wait4's rusage would count the parent's size at
    the fork as the child's).
    """
    command = [sys.executable, "-m", "cellchem", *map(str, args)]
    with tempfile.TemporaryDirectory(prefix="cellchem-run-") as tmp:
        out_path, err_path = Path(tmp) / "stdout", Path(tmp) / "stderr"
        with open(out_path, "wb") as out, open(err_path, "wb") as err:
            start = time.perf_counter()
            proc = subprocess.Popen(
                command,
                stdin=subprocess.DEVNULL,
                stdout=out,
                stderr=err,
                cwd=cwd or tmp,  # not the source tree: -m would import the package from there
                preexec_fn=_limits(memory, fsize),
                start_new_session=True,
            )
            timed_out = killed = False
            peak = None
            while True:
                pid, status, usage = os.wait4(proc.pid, os.WNOHANG)
                if pid:
                    break
                mark = high_water_mb(proc.pid)
                if mark is not None:
                    peak = max(peak or 0.0, mark)
                elapsed = time.perf_counter() - start
                if elapsed > timeout or (watch is not None and watch(proc.pid)):
                    timed_out = elapsed > timeout
                    killed = True
                    try:
                        os.killpg(proc.pid, signal.SIGKILL)
                    except ProcessLookupError:
                        pass
                    _pid, status, usage = os.wait4(proc.pid, 0)
                    break
                time.sleep(0.01)
            seconds = time.perf_counter() - start
        code = os.waitstatus_to_exitcode(status)
        proc.returncode = code  # reaped here; keep Popen from waiting again
        return Run(
            list(command),
            None if killed and code < 0 else code,
            seconds,
            peak if peak is not None else usage.ru_maxrss / 1024,
            _read_bounded(out_path),
            _read_bounded(err_path),
            timed_out,
            killed and code < 0,
        )


def commands(case: Case, path: Path, out: Path) -> dict[str, list[str]]:
    """The commands run on a case's file, writing into the folder ``out``."""
    runs = {
        "audit": ["audit", str(path)],
        "fill": ["fill", str(path), "-o", str(out / f"filled{path.suffix}")],
    }
    if case.annotate:
        runs["annotate"] = ["audit", str(path), "--annotate", str(out / f"annotated{path.suffix}")]
    return runs
