"""Reading supplier text exports (cellchem.adapters.files.text).

Every file is built here from bytes. The expected cells are typed out by hand,
never produced by the csv module the reader uses, except in the round-trip
properties at the end, where csv.writer stands for the spreadsheet that wrote
the file.
"""

from __future__ import annotations

import codecs
import csv
import errno
import io
import os
import re
from pathlib import Path

import pytest
from hypothesis import HealthCheck, assume, given, settings
from hypothesis import strategies as st

from cellchem.adapters.files import UnusableFile
from cellchem.adapters.files import text as textfile
from cellchem.adapters.files.text import TextTable, parse_number, read_text_table
from cellchem.errors import CellchemError

RESAVE = 're-save it as "CSV UTF-8" or pass --encoding'
DECIMAL_COMMA_NOTE = (
    "numbers read with a decimal comma: the columns are separated by semicolons"
    " (the European export convention)"
)
CP1252_NOTE = "read as cp1252 (Windows Western): no UTF-8 sequences found"
ONE_COLUMN_NOTE = "no comma, semicolon or tab found between cells: read as one column"


def write(tmp_path: Path, data: bytes, name: str = "stock.csv") -> Path:
    path = tmp_path / name
    path.write_bytes(data)
    return path


def refusal(path: Path, **kwargs: str) -> str:
    with pytest.raises(UnusableFile) as caught:
        read_text_table(path, **kwargs)
    return str(caught.value)


# --- the same inventory table in every encoding, delimiter and line ending ------------------------


def inventory_text(d: str, mark: str, nl: str) -> str:
    """The table as a spreadsheet writes it: a quoted cell holds the delimiter and a
    line break (spreadsheets write a line break inside a cell as LF), a quoted cell
    holds doubled quotes, one row has an empty cell, one row is empty."""
    return (
        f"Name{d}Formula{d}Molar mass{nl}"
        f"Copper(II) sulfate pentahydrate{d}CuSO4·5H2O{d}249{mark}68{nl}"
        f'"Sodium chloride{d} AR grade\nstore below 25 °C"{d}NaCl{d}58{mark}44{nl}'
        f"Calcium chloride µm powder{d}CaCl2{d}{nl}"
        f"{nl}"
        f"Sulfate de cuivre anhydre (qualité réactif){d}CuSO4{d}159{mark}61{nl}"
        f'"Ammonia solution ""880"""{d}NH3{d}17{mark}03{nl}'
        f" Potassium chloride {d}KCl{d}74{mark}55{nl}"
    )


def inventory_rows(d: str, mark: str) -> tuple[tuple[str, ...], ...]:
    return (
        ("Name", "Formula", "Molar mass"),
        ("Copper(II) sulfate pentahydrate", "CuSO4·5H2O", f"249{mark}68"),
        (f"Sodium chloride{d} AR grade\nstore below 25 °C", "NaCl", f"58{mark}44"),
        ("Calcium chloride µm powder", "CaCl2", ""),
        (),
        ("Sulfate de cuivre anhydre (qualité réactif)", "CuSO4", f"159{mark}61"),
        ('Ammonia solution "880"', "NH3", f"17{mark}03"),
        (" Potassium chloride ", "KCl", f"74{mark}55"),
    )


INVENTORY_LINE_NUMBERS = (1, 2, 3, 5, 6, 7, 8, 9)  # the quoted cell of row 3 spans lines 3 and 4

SAVED_AS = {  # how each export is encoded, and the encoding the reader must report
    "utf-8": (lambda text: text.encode("utf-8"), "utf-8"),
    "utf-8-bom": (lambda text: codecs.BOM_UTF8 + text.encode("utf-8"), "utf-8-sig"),
    "utf-16-le-bom": (lambda text: codecs.BOM_UTF16_LE + text.encode("utf-16-le"), "utf-16"),
    "utf-16-be-bom": (lambda text: codecs.BOM_UTF16_BE + text.encode("utf-16-be"), "utf-16"),
    "cp1252": (lambda text: text.encode("cp1252"), "cp1252"),
}
DELIMITERS = {"comma": ",", "semicolon": ";", "tab": "\t"}
LINE_ENDINGS = {"crlf": "\r\n", "lf": "\n"}


@pytest.mark.parametrize("ending", LINE_ENDINGS)
@pytest.mark.parametrize("delimiter", DELIMITERS)
@pytest.mark.parametrize("saved_as", SAVED_AS)
def test_inventory_reads_back_exactly(tmp_path: Path, saved_as: str, delimiter: str, ending: str) -> None:
    d, nl = DELIMITERS[delimiter], LINE_ENDINGS[ending]
    mark = "," if d == ";" else "."
    encode, reported = SAVED_AS[saved_as]
    table = read_text_table(write(tmp_path, encode(inventory_text(d, mark, nl))))
    assert table.rows == inventory_rows(d, mark)
    assert table.line_numbers == INVENTORY_LINE_NUMBERS
    assert table.encoding == reported
    assert table.delimiter == d
    assert table.decimal_comma is (d == ";")
    assert table.line_ending == nl
    expected_notes = (CP1252_NOTE,) if reported == "cp1252" else ()
    if d == ";":
        expected_notes += (DECIMAL_COMMA_NOTE,)
    assert table.notes == expected_notes


@pytest.mark.parametrize(
    ("data", "encoding"),
    [
        (b"Caf\xc3\xa9,\xc2\xb0C\r\n", "utf-8"),
        (b"\xef\xbb\xbfCaf\xc3\xa9,\xc2\xb0C\r\n", "utf-8-sig"),
        (b"\xff\xfeC\x00a\x00f\x00\xe9\x00,\x00\xb0\x00C\x00\r\x00\n\x00", "utf-16"),
        (b"\xfe\xff\x00C\x00a\x00f\x00\xe9\x00,\x00\xb0\x00C\x00\r\x00\n", "utf-16"),
        (b"Caf\xe9,\xb0C\r\n", "cp1252"),
    ],
    ids=["utf-8", "utf-8-bom", "utf-16-le-bom", "utf-16-be-bom", "cp1252"],
)
def test_encodings_from_literal_bytes(tmp_path: Path, data: bytes, encoding: str) -> None:
    # byte values from the Unicode and Windows-1252 code charts (common practice)
    table = read_text_table(write(tmp_path, data))
    assert table.rows == (("Café", "°C"),)
    assert table.encoding == encoding


def test_returns_plain_python(tmp_path: Path) -> None:
    table = read_text_table(write(tmp_path, b"Name,Formula\r\nSalt,NaCl\r\n"))
    assert type(table) is TextTable
    assert all(type(row) is tuple and all(type(cell) is str for cell in row) for row in table.rows)
    assert all(type(n) is int for n in table.line_numbers)
    assert type(table.notes) is tuple


# --- encodings that are refused --------------------------------------------------------------------


def test_mixed_utf8_and_cp1252_refused_at_the_first_bad_byte(tmp_path: Path) -> None:
    # bytes 1-14 'Name,Formula\r\n', 15-29 'CuSO4\xc2\xb75H2O,x\r\n', 30-32 'Caf', 33 is 0xE9
    path = write(tmp_path, b"Name,Formula\r\nCuSO4\xc2\xb75H2O,x\r\nCaf\xe9,y\r\n")
    assert refusal(path) == (
        f"'{path}' mixes encodings: it holds UTF-8 sequences, but byte 33 (0xE9, line 3) is not UTF-8;"
        f" {RESAVE}"
    )


def test_utf8_with_an_undefined_cp1252_byte_is_a_mix(tmp_path: Path) -> None:
    path = write(tmp_path, b"\xc2\xb0C,x\x81\r\n")
    assert refusal(path) == (
        f"'{path}' mixes encodings: it holds UTF-8 sequences, but byte 6 (0x81, line 1) is not UTF-8;"
        f" {RESAVE}"
    )


@pytest.mark.parametrize("byte", [0x81, 0x8D, 0x8F, 0x90, 0x9D], ids=lambda b: f"0x{b:02X}")
def test_byte_undefined_in_cp1252_without_utf8_refused(tmp_path: Path, byte: int) -> None:
    # bytes 1-6 'Name\r\n', 7 'x', 8 the byte; cp1252 leaves these five undefined (Microsoft's table)
    path = write(tmp_path, b"Name\r\nx" + bytes([byte]) + b"y\r\n")
    assert refusal(path) == (
        f"'{path}' is neither UTF-8 nor Windows-1252 (cp1252): byte 8 (0x{byte:02X}, line 2)"
        f" is not defined in either; {RESAVE}"
    )


@pytest.mark.parametrize(("codec", "advice"), [("utf-16-le", "utf-16-le"), ("utf-16-be", "utf-16-be")])
def test_utf16_without_bom_refused(tmp_path: Path, codec: str, advice: str) -> None:
    path = write(tmp_path, "Name,Formula\r\nSalt,NaCl\r\n".encode(codec))
    assert refusal(path) == (
        f"'{path}' looks like UTF-16 without a byte-order mark: save it with a BOM"
        f" or pass --encoding {advice}"
    )


def test_nul_bytes_refused(tmp_path: Path) -> None:
    # bytes 1-14 'Name,Formula\r\n', 15-18 'NaCl', 19 NUL
    path = write(tmp_path, b"Name,Formula\r\nNaCl\x00,x\r\n")
    assert refusal(path) == (
        f"'{path}' holds a NUL byte at byte 19 (0x00, line 2): it is not a text table;"
        " export the table again as CSV"
    )


def test_nul_character_in_a_utf16_file_refused(tmp_path: Path) -> None:
    path = write(tmp_path, codecs.BOM_UTF16_LE + "a,b\r\nc\x00,d\r\n".encode("utf-16-le"))
    assert refusal(path) == (
        f"'{path}': line 2 holds a NUL character: it is not a text table; export the table again as CSV"
    )


@pytest.mark.parametrize("bom", [codecs.BOM_UTF32_LE, codecs.BOM_UTF32_BE], ids=["le", "be"])
def test_utf32_refused(tmp_path: Path, bom: bytes) -> None:
    codec = "utf-32-le" if bom == codecs.BOM_UTF32_LE else "utf-32-be"
    path = write(tmp_path, bom + "a,b\r\n".encode(codec))
    assert refusal(path) == (
        f"'{path}' starts with a UTF-32 byte-order mark: re-save it as \"CSV UTF-8\""
        " or pass --encoding utf-32"
    )
    assert read_text_table(path, encoding="utf-32").rows == (("a", "b"),)


def test_utf8_bom_then_cp1252_refused(tmp_path: Path) -> None:
    # bytes 1-3 the mark, 4-8 'a,b\r\n', 9-11 'Caf', 12 is 0xE9
    path = write(tmp_path, codecs.BOM_UTF8 + b"a,b\r\nCaf\xe9\r\n")
    assert refusal(path) == (
        f"'{path}' starts with a UTF-8 byte-order mark, but byte 12 (0xE9, line 2) is not UTF-8:"
        f" it mixes encodings; {RESAVE}"
    )


def test_utf16_cut_short_refused(tmp_path: Path) -> None:
    # bytes 1-2 the mark, 3-8 'a,b' in UTF-16 LE, 9 a lone byte
    path = write(tmp_path, codecs.BOM_UTF16_LE + "a,b".encode("utf-16-le") + b"x")
    assert refusal(path) == (
        f"'{path}' starts with a UTF-16 byte-order mark, but byte 9 (0x78, line 1) is not UTF-16:"
        f" it mixes encodings; {RESAVE}"
    )


# --- an encoding passed by the caller ---------------------------------------------------------------


@pytest.mark.parametrize(
    ("data", "encoding", "reported", "cell"),
    [
        ("Café,x\r\n".encode("utf-16-le"), "utf-16-le", "utf-16-le", "Café"),
        (b"Caf\xe9,x\r\n", "windows-1252", "cp1252", "Café"),
        (b"Caf\xe9,x\r\n", "CP1252", "cp1252", "Café"),
        (b"Caf\xe9\x81,x\r\n", "latin-1", "iso8859-1", "Café\x81"),
        (b"Caf\xc3\xa9,x\r\n", "utf8", "utf-8", "Café"),
    ],
)
def test_explicit_encoding_is_used(
    tmp_path: Path, data: bytes, encoding: str, reported: str, cell: str
) -> None:
    table = read_text_table(write(tmp_path, data), encoding=encoding)
    assert table.rows == ((cell, "x"),)
    assert table.encoding == reported
    assert table.notes == ()


def test_explicit_encoding_drops_a_byte_order_mark(tmp_path: Path) -> None:
    table = read_text_table(write(tmp_path, codecs.BOM_UTF8 + b"Name,x\r\n"), encoding="utf-8")
    assert table.rows == (("Name", "x"),)
    assert table.notes == ("a byte-order mark at the start was dropped (read as utf-8, as asked)",)


def test_explicit_wrong_encoding_refused(tmp_path: Path) -> None:
    path = write(tmp_path, b"Name\r\nCaf\xe9\r\n")
    assert refusal(path, encoding="utf-8") == (
        f"'{path}' is not utf-8 text: byte 10 (0xE9, line 2) cannot be read as utf-8;"
        ' pass the encoding it was saved in, or re-save it as "CSV UTF-8"'
    )
    path = write(tmp_path, b"Name\r\nCaf\xc3\xa9\r\n")
    assert refusal(path, encoding="ascii") == (
        f"'{path}' is not ascii text: byte 10 (0xC3, line 2) cannot be read as ascii;"
        ' pass the encoding it was saved in, or re-save it as "CSV UTF-8"'
    )


def test_explicit_utf8_sig_counts_bytes_from_the_start_of_the_file(tmp_path: Path) -> None:
    # bytes 1-3 the mark, 4-9 'Name\r\n', 10-12 'Caf', 13 is 0xE9
    path = write(tmp_path, codecs.BOM_UTF8 + b"Name\r\nCaf\xe9\r\n")
    assert refusal(path, encoding="utf-8-sig") == (
        f"'{path}' is not utf-8-sig text: byte 13 (0xE9, line 2) cannot be read as utf-8-sig;"
        ' pass the encoding it was saved in, or re-save it as "CSV UTF-8"'
    )


@pytest.mark.parametrize("encoding", ["klingon", "base64", "rot13", "utf\x008"])
def test_unknown_codec_refused(tmp_path: Path, encoding: str) -> None:
    path = write(tmp_path, b"Name\r\n")
    assert refusal(path, encoding=encoding) == (
        f"'{path}': {encoding!r} is not a text encoding Python knows;"
        " pass a name such as utf-8, cp1252 or utf-16-le"
    )


# --- delimiters -----------------------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("given", "row"),
    [
        (",", ("a;b", "c\td")),
        ("comma", ("a;b", "c\td")),
        (";", ("a", "b,c\td")),
        ("semicolon", ("a", "b,c\td")),
        ("Semicolon", ("a", "b,c\td")),
        ("\t", ("a;b,c", "d")),
        ("tab", ("a;b,c", "d")),
        ("TAB", ("a;b,c", "d")),
        ("\\t", ("a;b,c", "d")),
    ],
)
def test_explicit_delimiter_wins(tmp_path: Path, given: str, row: tuple[str, ...]) -> None:
    table = read_text_table(write(tmp_path, b"a;b,c\td\r\n"), delimiter=given)
    assert table.rows == (row,)
    assert table.decimal_comma is (table.delimiter == ";")
    assert table.notes == ((DECIMAL_COMMA_NOTE,) if table.delimiter == ";" else ())


def test_unknown_delimiter_refused(tmp_path: Path) -> None:
    path = write(tmp_path, b"a|b\r\n")
    assert refusal(path, delimiter="pipe") == (
        f"'{path}': the delimiter 'pipe' is not one cellchem reads;"
        " pass comma, semicolon or tab (or ',', ';', a tab character)"
    )


def test_two_delimiters_equally_consistent_refused(tmp_path: Path) -> None:
    path = write(tmp_path, b"a;b,c\r\nd;e,f\r\n")
    assert refusal(path) == (
        f"'{path}': cannot tell the delimiter: commas and semicolons each split 2 of 2 sampled lines"
        " into the same number of columns; pass --delimiter comma or --delimiter semicolon"
    )


def test_three_delimiters_equally_consistent_refused(tmp_path: Path) -> None:
    path = write(tmp_path, b"a,b;c\td\r\n")
    assert refusal(path) == (
        f"'{path}': cannot tell the delimiter: commas, semicolons and tabs each split 1 of 1 sampled lines"
        " into the same number of columns; pass --delimiter comma or --delimiter semicolon"
        " or --delimiter tab"
    )


@pytest.mark.parametrize(
    ("data", "delimiter"),
    [
        # decimal commas on the data rows only: semicolons agree on every line
        (b"Name;Formula;Molar mass\r\nSalt;NaCl;58,44\r\nSugar;C12H22O11;342,30\r\n", ";"),
        # a comma inside one unquoted name of a semicolon file
        (b"Name;Formula\r\nSalt, fine;NaCl\r\nSugar;C12H22O11\r\nWater;H2O\r\n", ";"),
        # a semicolon in one unquoted name of a comma file
        (b"Name,Formula\r\nSalt; fine,NaCl\r\nSugar,C12H22O11\r\nWater,H2O\r\n", ","),
        # a semicolon inside quotes is not counted
        (b'Name,Formula\r\n"Salt; fine",NaCl\r\n', ","),
        # a tab file with decimal commas
        (b"Name\tMolar mass\r\nSalt\t58,44\r\nSugar\t342,30\r\n", "\t"),
        # a title line above the table
        (b"Stock list\r\n\r\nName,Formula\r\nSalt,NaCl\r\n", ","),
    ],
    ids=["decimal-commas", "comma-in-name", "semicolon-in-name", "quoted", "tab", "title"],
)
def test_most_consistent_delimiter_chosen(tmp_path: Path, data: bytes, delimiter: str) -> None:
    assert read_text_table(write(tmp_path, data)).delimiter == delimiter


def test_delimiter_chosen_from_the_first_fifty_lines(tmp_path: Path) -> None:
    lines = [b"a,b"] * 50 + [b"c;d"] * 60
    assert read_text_table(write(tmp_path, b"\r\n".join(lines))).delimiter == ","


def test_one_column_file(tmp_path: Path) -> None:
    table = read_text_table(write(tmp_path, b"Name\r\nSodium chloride\r\nWater\r\n"))
    assert table.rows == (("Name",), ("Sodium chloride",), ("Water",))
    assert table.delimiter == ","
    assert table.decimal_comma is False
    assert table.notes == (ONE_COLUMN_NOTE,)


def test_sep_hint_names_the_delimiter(tmp_path: Path) -> None:
    table = read_text_table(write(tmp_path, b"sep=;\r\nName;Mass\r\nSalt;58,44\r\n"))
    assert table.rows == (("Name", "Mass"), ("Salt", "58,44"))
    assert table.line_numbers == (2, 3)
    assert table.delimiter == ";"
    assert table.notes == (
        "the first line is a spreadsheet hint naming the delimiter (semicolon); it was not read as a row",
        DECIMAL_COMMA_NOTE,
    )


def test_explicit_delimiter_overrides_sep_hint(tmp_path: Path) -> None:
    table = read_text_table(write(tmp_path, b"SEP=;\r\na;b,c\r\n"), delimiter="comma")
    assert table.rows == (("a;b", "c"),)
    assert table.notes == (
        "the first line is a spreadsheet hint naming the delimiter (semicolon); the delimiter given (comma)"
        " was used instead; it was not read as a row",
    )


# --- lines, rows and cells ----------------------------------------------------------------------------


def test_trailing_empty_lines_dropped_inner_kept(tmp_path: Path) -> None:
    table = read_text_table(write(tmp_path, b"a,b\r\n\r\nc,d\r\n\r\n\r\n"))
    assert table.rows == (("a", "b"), (), ("c", "d"))
    assert table.line_numbers == (1, 2, 3)


def test_cells_are_not_normalised(tmp_path: Path) -> None:
    table = read_text_table(write(tmp_path, b" a ,b  ,\r\n,,\r\n"))
    assert table.rows == ((" a ", "b  ", ""), ("", "", ""))


@pytest.mark.parametrize(
    ("data", "ending", "line_numbers"),
    [
        (b"a,b\rc,d\r", "\r", (1, 2)),
        (b"a,b\r\nc,d\r\ne,f\ng,h\r\n", "\r\n", (1, 2, 3, 4)),
        (b"a,b\nc,d\ne,f\r\n", "\n", (1, 2, 3)),
        (b'a,"b\r\nc\rd"\ne,f\n', "\n", (1, 4)),
        (b"a,b\r\nc,d", "\r\n", (1, 2)),
        (b"a,b", "\r\n", (1,)),
    ],
    ids=["cr", "crlf-dominant", "lf-dominant", "breaks-in-quotes", "no-final-break", "no-break"],
)
def test_line_endings_and_line_numbers(tmp_path: Path, data: bytes, ending: str, line_numbers: tuple) -> None:
    table = read_text_table(write(tmp_path, data))
    assert table.line_ending == ending
    assert table.line_numbers == line_numbers


def test_breaks_inside_quotes_kept_exactly(tmp_path: Path) -> None:
    table = read_text_table(write(tmp_path, b'a,"b\r\nc\rd"\ne,f\n'))
    assert table.rows == (("a", "b\r\nc\rd"), ("e", "f"))


def test_very_long_line_reads(tmp_path: Path) -> None:
    cells = [f"cell {i:05d} " + "x" * 90 for i in range(3000)]  # one line of about 300 000 characters
    table = read_text_table(write(tmp_path, (",".join(cells) + "\r\nend\r\n").encode("ascii")))
    # the first 256 cells are read (columns A to IV), the rest are not kept; a note says so
    assert table.rows == (tuple(cells[:256]), ("end",))
    assert table.line_numbers == (1, 2)
    assert table.notes[-1] == "columns beyond IV were not read (first on line 1)"


def test_empty_cells_beyond_the_last_column_read_are_no_loss(tmp_path: Path) -> None:
    table = read_text_table(write(tmp_path, ("a" + "," * 300 + "\r\nb,c\r\n").encode("ascii")))
    assert table.rows == (("a",) + ("",) * 255, ("b", "c"))
    assert not any("were not read" in note for note in table.notes)


CUT_NOTE = (
    "a cell is longer than 32,767 characters, more than a spreadsheet cell holds:"
    " only its first 32,767 were read"
)


@pytest.mark.parametrize("quoted", [False, True], ids=["plain", "quoted"])
@pytest.mark.parametrize("length", [32_768, 200_000], ids=["one-over", "csv-module-limit"])
def test_an_overlong_cell_is_cut_and_its_row_named(tmp_path: Path, length: int, quoted: bool) -> None:
    # 32 767 characters is the most a spreadsheet cell holds (common practice: Excel's specification)
    text = "x" * (length - 3) + "end"
    cell = f'"{text}"' if quoted else text
    path = write(tmp_path, f"Name,Note,Formula\r\nSalt,{cell},NaCl\r\nSugar,ok,C12H22O11\r\n".encode("ascii"))
    table = read_text_table(path)
    assert table.rows == (
        ("Name", "Note", "Formula"),
        ("Salt", text[:32_767], "NaCl"),
        ("Sugar", "ok", "C12H22O11"),
    )
    assert table.line_numbers == (1, 2, 3)
    assert table.notes[-1] == f"line 2: {CUT_NOTE}"


def test_a_cell_of_the_longest_length_is_read(tmp_path: Path) -> None:
    table = read_text_table(write(tmp_path, b'Name,Note\r\nSalt,"' + b"x" * 32_767 + b'"\r\n'))
    assert table.rows == (("Name", "Note"), ("Salt", "x" * 32_767))


def test_an_overlong_quoted_cell_over_several_lines_names_where_it_ends(tmp_path: Path) -> None:
    cell = "\n".join(["y" * 10_000] * 5)  # five lines, 50 004 characters
    path = write(tmp_path, f'Name,Note\r\nSalt,"{cell}"\r\nSugar,ok\r\n'.encode("ascii"))
    table = read_text_table(path)
    assert table.rows == (("Name", "Note"), ("Salt", cell[:32_767]), ("Sugar", "ok"))
    assert table.line_numbers == (1, 2, 7)
    assert table.notes[-1] == (
        f"line 2: {CUT_NOTE} (it runs to line 6: look for a quote that is never closed)"
    )


def test_unclosed_quote_refused(tmp_path: Path) -> None:
    path = write(tmp_path, b'Name,Formula\r\nSalt,"NaCl\r\nSugar,C12H22O11\r\n')
    assert refusal(path) == f"'{path}': a quote opened in the row starting on line 2 is never closed"


def test_text_after_a_closing_quote_refused(tmp_path: Path) -> None:
    path = write(tmp_path, b'Name,Formula\r\n"AR" grade salt,NaCl\r\n')
    assert refusal(path) == (
        f"'{path}': line 2: a quoted cell is followed by text before the next delimiter;"
        ' inside quotes write a quote twice ("")'
    )


# --- empty, large and unreadable files ------------------------------------------------------------------


@pytest.mark.parametrize(
    "data",
    [b"", codecs.BOM_UTF8, codecs.BOM_UTF16_LE, b"\r\n\r\n", b"sep=;\r\n"],
    ids=["no-bytes", "utf-8-bom-only", "utf-16-bom-only", "blank-lines", "sep-hint-only"],
)
def test_empty_file_refused(tmp_path: Path, data: bytes) -> None:
    path = write(tmp_path, data)
    assert refusal(path) == f"'{path}' is empty: it holds no rows"


def test_file_over_the_size_limit_refused(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.setattr(textfile, "MAX_TEXT_BYTES", 10)
    assert read_text_table(write(tmp_path, b"a,b\r\nc,d\r\n")).rows == (("a", "b"), ("c", "d"))
    path = write(tmp_path, b"a,b\r\nc,d\r\ne")
    assert (
        refusal(path)
        == f"'{path}' is larger than 10 bytes, the limit for a text file; split it into smaller files"
    )


def test_size_limit_named_in_gib() -> None:
    assert textfile._size(textfile.MAX_TEXT_BYTES) == "1 GiB"


def test_file_over_the_row_limit_refused(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.setattr(textfile, "MAX_ROWS", 3)
    assert len(read_text_table(write(tmp_path, b"a\r\nb\r\nc\r\n")).rows) == 3
    path = write(tmp_path, b"a\r\nb\r\nc\r\nd\r\n")
    assert refusal(path) == (
        f"'{path}' holds more than 3 rows, the limit of a spreadsheet; split it into smaller files"
    )


def test_missing_file_refused(tmp_path: Path) -> None:
    path = tmp_path / "missing.csv"
    assert refusal(path) == f"'{path}' cannot be read: {os.strerror(errno.ENOENT)}"


def test_directory_refused(tmp_path: Path) -> None:
    assert refusal(tmp_path) == f"'{tmp_path}' cannot be read: {os.strerror(errno.EISDIR)}"


def test_file_name_with_a_line_break_stays_on_one_line(tmp_path: Path) -> None:
    message = refusal(tmp_path / "stock\nlist.csv")
    assert "\n" not in message
    assert message.startswith(f"'{tmp_path}/stock\\nlist.csv' cannot be read")


# --- numbers --------------------------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("text", "decimal_comma", "value"),
    [
        ("58.44", False, 58.44),
        ("58,44", True, 58.44),
        (" 1 234,5 ", True, 1234.5),
        ("1.234,5", True, 1234.5),
        ("1,234.5", False, 1234.5),
        ("1,234,567", False, 1234567.0),
        ("1.234.567", True, 1234567.0),
        ("1 234 567,25", True, 1234567.25),
        ("1\u00a0234,5", True, 1234.5),
        ("1\u202f234", False, 1234.0),
        ("1 234", False, 1234.0),
        ("1,234", True, 1.234),
        ("1.234", False, 1.234),
        ("12", True, 12.0),
        ("-0.5", False, -0.5),
        ("+2", False, 2.0),
        ("\u22123,5", True, -3.5),
        (".5", False, 0.5),
        (",5", True, 0.5),
        ("58.", False, 58.0),
        ("1.5e-3", False, 0.0015),
        ("1,5E3", True, 1500.0),
        ("", False, None),
        ("   ", True, None),
    ],
    ids=lambda v: repr(v) if isinstance(v, str) else None,
)
def test_parse_number(text: str, decimal_comma: bool, value: float | None) -> None:
    assert parse_number(text, decimal_comma) == value


@pytest.mark.parametrize(
    ("text", "decimal_comma", "message", "choices"),
    [
        (
            "1,234",
            False,
            "'1,234' is ambiguous: 1234 if ',' groups thousands, or 1.234 if it marks decimals;"
            " write 1234 or 1.234",
            ("1234", "1.234"),
        ),
        (
            "-12,345",
            False,
            "'-12,345' is ambiguous: -12345 if ',' groups thousands, or -12.345 if it marks decimals;"
            " write -12345 or -12.345",
            ("-12345", "-12.345"),
        ),
        (
            "1.234",
            True,
            "'1.234' is ambiguous: 1234 if '.' groups thousands, or 1.234 if it marks decimals;"
            " write 1234 or 1,234",
            ("1234", "1,234"),
        ),
        (
            " 123.456 ",
            True,
            "' 123.456 ' is ambiguous: 123456 if '.' groups thousands, or 123.456 if it marks decimals;"
            " write 123456 or 123,456",
            ("123456", "123,456"),
        ),
        (
            "58,44",
            False,
            "'58,44' is written with a decimal comma, but this file writes decimals with a point:"
            " write 58.44",
            ("58.44",),
        ),
        (
            "58.44",
            True,
            "'58.44' is written with a decimal point, but this file writes decimals with a comma:"
            " write 58,44",
            ("58,44",),
        ),
        (
            "1.234,5",
            False,
            "'1.234,5' is written with a decimal comma, but this file writes decimals with a point:"
            " write 1234.5",
            ("1234.5",),
        ),
        (
            "1,234.5",
            True,
            "'1,234.5' is written with a decimal point, but this file writes decimals with a comma:"
            " write 1234,5",
            ("1234,5",),
        ),
        (
            ".5",
            True,
            "'.5' is written with a decimal point, but this file writes decimals with a comma: write 0,5",
            ("0,5",),
        ),
        (
            "1,234e3",
            False,
            "'1,234e3' is written with a decimal comma, but this file writes decimals with a point:"
            " write 1.234e3",
            ("1.234e3",),
        ),
    ],
    ids=lambda v: repr(v) if isinstance(v, str) else None,
)
def test_parse_number_refuses_the_other_reading(
    text: str, decimal_comma: bool, message: str, choices: tuple[str, ...]
) -> None:
    with pytest.raises(CellchemError) as caught:
        parse_number(text, decimal_comma)
    assert str(caught.value) == message
    assert caught.value.choices == choices
    assert caught.value.text == text


@pytest.mark.parametrize(
    ("text", "decimal_comma"),
    [
        ("abc", False),
        ("58.44 g/mol", False),
        ("1,23,456", False),
        ("12 34", True),
        ("1,234 567", False),
        ("nan", False),
        ("inf", True),
        ("1_000", False),
        ("--5", False),
        ("5-", True),
        ("0x1F", False),
    ],
    ids=lambda v: repr(v) if isinstance(v, str) else None,
)
def test_parse_number_refuses_non_numbers(text: str, decimal_comma: bool) -> None:
    example = "a decimal comma, such as 58,44" if decimal_comma else "a decimal point, such as 58.44"
    with pytest.raises(CellchemError) as caught:
        parse_number(text, decimal_comma)
    assert str(caught.value) == f"{text!r} is not a number; expected digits with {example}"


def test_parse_number_refuses_overflow() -> None:
    with pytest.raises(CellchemError) as caught:
        parse_number("1e999", False)
    assert str(caught.value) == "'1e999' is too large for a number"


# --- round trips through csv.writer ------------------------------------------------------------------

SEP_HINT = re.compile(r"sep=[,;\t](\r\n|\r|\n|$)", re.IGNORECASE)
NOT_WRITABLE = "\x00\ufeff"  # NUL is refused; U+FEFF first in a file is read as a byte-order mark
ANY_CELL = st.text(
    st.characters(blacklist_categories=("Cs",), blacklist_characters=NOT_WRITABLE), max_size=10
)


def written(rows: list[list[str]], delimiter: str, terminator: str) -> tuple[str, tuple[int, ...]]:
    """The text csv.writer makes of the rows, and the line each row starts on."""
    chunks, starts, line = [], [], 1
    for row in rows:
        out = io.StringIO()
        csv.writer(out, delimiter=delimiter, lineterminator=terminator).writerow(row)
        chunk = out.getvalue()
        chunks.append(chunk)
        starts.append(line)
        line += chunk.count("\n") + chunk.count("\r") - chunk.count("\r\n")
    return "".join(chunks), tuple(starts)


@settings(max_examples=100, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(
    rows=st.lists(st.lists(ANY_CELL, max_size=5), min_size=1, max_size=8).filter(lambda rows: rows[-1] != []),
    delimiter=st.sampled_from([",", ";", "\t"]),
    terminator=st.sampled_from(["\r\n", "\n"]),
)
def test_any_text_written_by_csv_reads_back(
    tmp_path: Path, rows: list[list[str]], delimiter: str, terminator: str
) -> None:
    # csv.writer quotes a cell with a lone CR only when CR is part of its line terminator
    assume(terminator == "\r\n" or not any("\r" in cell for row in rows for cell in row))
    text, starts = written(rows, delimiter, terminator)
    assume(not SEP_HINT.match(text))  # a first line sep=; is a spreadsheet hint, not a row
    table = read_text_table(write(tmp_path, text.encode("utf-8")), delimiter=delimiter)
    assert table.rows == tuple(tuple(row) for row in rows)
    assert table.line_numbers == starts
    assert table.encoding == "utf-8"


@settings(max_examples=100, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(data=st.data(), delimiter=st.sampled_from([",", ";", "\t"]), columns=st.integers(2, 5))
def test_delimiter_of_a_rectangular_table_is_found(
    tmp_path: Path, data: st.DataObject, delimiter: str, columns: int
) -> None:
    others = "".join(c for c in ",;\t" if c != delimiter)
    cell = st.text(st.characters(blacklist_categories=("Cs",), blacklist_characters=NOT_WRITABLE + others))
    rows = data.draw(st.lists(st.lists(cell, min_size=columns, max_size=columns), min_size=1, max_size=8))
    text, _ = written(rows, delimiter, "\r\n")
    assume(not SEP_HINT.match(text))
    table = read_text_table(write(tmp_path, text.encode("utf-8")))
    assert table.delimiter == delimiter
    assert table.decimal_comma is (delimiter == ";")
    assert table.rows == tuple(tuple(row) for row in rows)


# -- digit grouping in a molar-mass cell ----------------------------------------------------------


@pytest.mark.parametrize(
    "text, decimal_comma, expected",
    [
        ("1.235,86", True, "1235,86"),
        ("1\u00a0235,86", True, "1235,86"),
        ("1.235,86 g/mol", True, "1235,86 g/mol"),
        ("1,235.86", False, "1235.86"),
        ("12.345.678", True, "12345678"),
        ("1.235", True, "1.235"),  # grouping or a decimal point: left to the reader of the cell
        ("1,235", False, "1,235"),
        ("58,44", True, "58,44"),
        ("58.44", True, "58.44"),
        ("n/a", True, "n/a"),
        ("", True, ""),
    ],
)
def test_ungrouped_number(text, decimal_comma, expected):
    from cellchem.adapters.files.text import ungrouped_number

    assert ungrouped_number(text, decimal_comma) == expected


@given(
    whole=st.integers(min_value=1000, max_value=10**9),
    cents=st.integers(min_value=0, max_value=99),
    decimal_comma=st.booleans(),
    space=st.booleans(),
)
def test_grouped_numbers_read_as_their_plain_value(whole, cents, decimal_comma, space):
    from cellchem.adapters.files.text import parse_number, ungrouped_number

    group = " " if space else ("." if decimal_comma else ",")
    mark = "," if decimal_comma else "."
    grouped = f"{whole:,}".replace(",", group) + f"{mark}{cents:02d}"
    plain = ungrouped_number(grouped, decimal_comma)
    assert group not in plain
    assert float(plain.replace(",", ".")) == pytest.approx(whole + cents / 100)
    assert parse_number(plain, decimal_comma) == parse_number(grouped, decimal_comma)
