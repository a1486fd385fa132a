"""The streaming text reader (cellchem.adapters.files.text.open_text_table) and
fill over CSV in bounded memory.

Files are built here from bytes. Record splitting is checked against the csv
module (the reference for how a spreadsheet's CSV is read), with the file
read in chunks of a few bytes so that every record, quote and line break
falls across a chunk boundary somewhere. The large files run in a child
process that reports its own peak resident memory.
"""

from __future__ import annotations

import codecs
import csv
import io
import json
import os
import re
import subprocess
import sys
from pathlib import Path

import periodictable
import pytest
from hypothesis import HealthCheck, assume, given, settings
from hypothesis import strategies as st

from cellchem.adapters.files import UnusableFile
from cellchem.adapters.files import text as textfile
from cellchem.adapters.files.text import open_text_table, read_text_table

MIB = 1 << 20


def write(tmp_path: Path, data: bytes, name: str = "stock.csv") -> Path:
    path = tmp_path / name
    path.write_bytes(data)
    return path


def csv_rows(text: str, delimiter: str = ",") -> tuple[list[tuple[str, ...]], list[int]]:
    """What the csv module reads from the text given line by line, with the line each row starts on."""
    reader = csv.reader(io.StringIO(text, newline=""), delimiter=delimiter, strict=True)
    rows, starts = [], []
    while True:
        begins = reader.line_num + 1
        try:
            row = next(reader)
        except StopIteration:
            break
        rows.append(tuple(row))
        starts.append(begins)
    return rows, starts


# --- the stream gives what read_text_table gives, and records copy the file exactly ---------------


def test_rows_records_and_table_agree(tmp_path: Path) -> None:
    data = b'Name;Formula;Mass\r\n\r\n"Salt; fine";NaCl;58,44\r\n"Two\r\nlines";;\r\nWater;H2O;18,02\r\n\r\n'
    path = write(tmp_path, data)
    stream = open_text_table(path)
    assert (stream.encoding, stream.delimiter, stream.decimal_comma, stream.bom) == ("utf-8", ";", True, b"")
    assert list(stream.rows()) == [
        (1, ["Name", "Formula", "Mass"]),
        (2, []),
        (3, ["Salt; fine", "NaCl", "58,44"]),
        (4, ["Two\r\nlines", None, None]),
        (6, ["Water", "H2O", "18,02"]),
        (7, []),
    ]
    records = list(stream.records())
    assert [r.line for r in records] == [1, 2, 3, 4, 6, 7]
    assert "".join(r.raw for r in records).encode() == data
    assert all(r.problem == "" for r in records)
    table = read_text_table(path)
    assert table.rows == tuple(tuple(r.fields) for r in records[:-1])  # the trailing empty line dropped
    assert table.line_numbers == (1, 2, 3, 4, 6)


def test_keep_gives_only_the_columns_asked_for(tmp_path: Path) -> None:
    stream = open_text_table(write(tmp_path, b"a,b,c\r\nd,e,f\r\ng,h,i\r\n"))
    rows = stream.rows()
    assert next(rows) == (1, ["a", "b", "c"])
    rows.keep = frozenset({0, 2})
    assert list(rows) == [(2, ["d", None, "f"]), (3, ["g", None, "i"])]


def test_the_stream_keeps_the_byte_order_mark_and_hint_for_writers(tmp_path: Path) -> None:
    data = codecs.BOM_UTF16_BE + "sep=;\r\nName;x\r\n".encode("utf-16-be")
    stream = open_text_table(write(tmp_path, data))
    assert (stream.bom, stream.codec, stream.encoding) == (codecs.BOM_UTF16_BE, "utf-16-be", "utf-16")
    assert stream.preamble == "sep=;\r\n"
    assert [(r.line, r.raw) for r in stream.records()] == [(2, "Name;x\r\n")]
    text = stream.preamble + "".join(r.raw for r in stream.records())
    assert stream.bom + text.encode(stream.codec) == data


@pytest.mark.parametrize("chunk", [1, 2, 3, 5, 7])
def test_small_chunks_split_records_like_the_csv_module(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch, chunk: int
) -> None:
    monkeypatch.setattr(textfile, "_READ_CHUNK", chunk)
    text = 'a,"b\r\nc"\r\n"x""y",z\r\r\n\re,"f\rg"\n5" disk,q\r\n"é",\r\n,"ü\r\n"'
    data = text.encode("utf-8")
    stream = open_text_table(write(tmp_path, data), delimiter=",")
    records = list(stream.records())
    assert "".join(r.raw for r in records).encode("utf-8") == data
    rows, starts = csv_rows(text)
    assert [tuple(r.fields) for r in records] == rows
    assert [r.line for r in records] == starts


CELL = st.text(st.characters(blacklist_categories=("Cs",), blacklist_characters="\x00\ufeff"), max_size=8)


@settings(max_examples=150, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(
    rows=st.lists(st.lists(CELL, max_size=4), min_size=1, max_size=6),
    delimiter=st.sampled_from([",", ";", "\t"]),
    terminator=st.sampled_from(["\r\n", "\n"]),
    chunk=st.sampled_from([1, 2, 3, 4, 7, 64]),
    encoding=st.sampled_from(["utf-8", "utf-16-le"]),
)
def test_any_csv_streams_back_exactly(
    tmp_path: Path, rows: list[list[str]], delimiter: str, terminator: str, chunk: int, encoding: str
) -> None:
    assume(terminator == "\r\n" or not any("\r" in c for row in rows for c in row))
    out = io.StringIO()
    csv.writer(out, delimiter=delimiter, lineterminator=terminator).writerows(rows)
    text = "head\r\n" + out.getvalue()
    data = text.encode(encoding)
    if encoding == "utf-16-le":
        data = codecs.BOM_UTF16_LE + data
    textfile._READ_CHUNK, saved = chunk, textfile._READ_CHUNK
    try:
        records = list(open_text_table(write(tmp_path, data), delimiter=delimiter).records())
    finally:
        textfile._READ_CHUNK = saved
    expected, starts = csv_rows(text, delimiter)
    assert [tuple(r.fields) for r in records] == expected
    assert [r.line for r in records] == starts
    assert "".join(r.raw for r in records) == text


@settings(max_examples=200, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(
    text=st.text(st.sampled_from(["a", ",", '"', "\r", "\n", " ", "é"]), max_size=30),
    chunk=st.sampled_from([1, 2, 3, 5, 1 << 20]),
)
def test_any_text_splits_as_the_csv_module_or_is_refused_as_it_refuses(
    tmp_path: Path, text: str, chunk: int
) -> None:
    text = "x" + text  # never a sep= hint
    try:
        expected, starts = csv_rows(text)
    except csv.Error:
        expected = None
    textfile._READ_CHUNK, saved = chunk, textfile._READ_CHUNK
    try:
        records = list(open_text_table(write(tmp_path, text.encode("utf-8")), delimiter=",").records())
    except UnusableFile:
        records = None
    finally:
        textfile._READ_CHUNK = saved
    if expected is None:
        assert records is None
    else:
        assert records is not None
        assert [tuple(r.fields) for r in records] == expected
        assert [r.line for r in records] == starts


# --- caps while streaming ------------------------------------------------------------------------


@settings(max_examples=150, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(
    rows=st.lists(st.lists(st.text(st.sampled_from('ab,"\r\n é'), max_size=12), max_size=6), max_size=5),
    record_cap=st.sampled_from([4, 8, 20]),
    cell_cap=st.sampled_from([1, 3, 10]),
    columns=st.sampled_from([1, 2, 5]),
    chunk=st.sampled_from([1, 3, 7, 1 << 20]),
)
def test_caps_cut_cells_and_stream_long_records_past(
    tmp_path: Path, rows: list[list[str]], record_cap: int, cell_cap: int, columns: int, chunk: int
) -> None:
    out = io.StringIO()
    csv.writer(out, lineterminator="\r\n").writerows(rows)
    text = "x\r\n" + out.getvalue()
    path = write(tmp_path, text.encode("utf-8"))
    saved = textfile.MAX_RECORD_CHARS, textfile.MAX_CELL_CHARS, textfile.MAX_COLUMNS, textfile._READ_CHUNK
    textfile.MAX_RECORD_CHARS, textfile.MAX_CELL_CHARS, textfile.MAX_COLUMNS, textfile._READ_CHUNK = (
        record_cap,
        cell_cap,
        columns,
        chunk,
    )
    try:
        written: list[str] = []
        records = open_text_table(path, delimiter=",").records(spill=written.append)
        for record in records:
            assert record.raw is None or len(record.raw) <= record_cap
            if record.raw is not None:
                written.append(record.raw)
        table = read_text_table(path, delimiter=",")
    finally:
        textfile.MAX_RECORD_CHARS, textfile.MAX_CELL_CHARS, textfile.MAX_COLUMNS, textfile._READ_CHUNK = saved
    assert "".join(written) == text  # every record reaches the writer, in order
    expected, _ = csv_rows(text)
    cut = [tuple(cell[:cell_cap] for cell in row[:columns]) for row in expected]
    while cut and not cut[-1]:
        cut.pop()
    assert list(table.rows) == cut


def test_more_rows_than_the_limit_refuse_the_file(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.setattr(textfile, "MAX_ROWS", 3)
    path = write(tmp_path, b"a\r\nb\r\n" + b'"c\r\nd"\r\ne\r\n')
    with pytest.raises(UnusableFile) as caught:
        list(open_text_table(path).rows())
    assert str(caught.value) == (
        f"'{path}' holds more than 3 rows, the limit of a spreadsheet; split it into smaller files"
    )


# --- decisions from a sample, decoding errors from the whole file ----------------------------------


def test_a_decoding_error_far_beyond_the_sample_is_found_with_its_line(tmp_path: Path) -> None:
    lines = 200_000  # 3.2 MB of UTF-8 before the stray byte, three times the sample
    body = b"Caf\xc3\xa9,1234567\r\n" * lines
    path = write(tmp_path, b"Name,Code\r\n" + body + b"Th\xe9,1\r\n")
    offset = len(b"Name,Code\r\n") + len(body) + 2  # 0-based: 'Th' comes first
    with pytest.raises(UnusableFile) as caught:
        open_text_table(path)
    assert str(caught.value) == (
        f"'{path}' mixes encodings: it holds UTF-8 sequences, but byte {offset + 1} (0xE9, line {lines + 2})"
        ' is not UTF-8; re-save it as "CSV UTF-8" or pass --encoding'
    )


def test_cp1252_is_decided_from_the_whole_file(tmp_path: Path) -> None:
    # the first 3 MB are plain ASCII; the one byte beyond ASCII is at the end (0xB0 is the degree sign)
    path = write(tmp_path, b"Name;Temp\r\n" + b"Water;20\r\n" * 300_000 + b"Ice;-5 \xb0C\r\n")
    stream = open_text_table(path)
    assert stream.encoding == "cp1252"
    assert stream.notes[0] == "read as cp1252 (Windows Western): no UTF-8 sequences found"
    *_, last = stream.rows()
    assert last == (300_002, ["Ice", "-5 °C"])


def test_a_file_changed_between_passes_is_refused(tmp_path: Path) -> None:
    path = write(tmp_path, b"a,b\r\nc,d\r\n")
    stream = open_text_table(path)
    path.write_bytes(b"a,b\r\nc,d\r\ne,f\r\n")
    with pytest.raises(UnusableFile) as caught:
        list(stream.rows())
    assert str(caught.value) == (
        f"'{path}' changed while it was being read; read it again when nothing is writing to it"
    )


# --- large files in a child process: bounded memory, a clear result -------------------------------

# The child reports its own peak resident size: VmHWM, which starts afresh with the new program
# (ru_maxrss would count the size of the process it was forked from, pytest's).
CHILD = """
import re, resource, sys
from cellchem.cli import main

def peak_kib():
    try:
        with open("/proc/self/status") as fh:
            return int(re.search(r"VmHWM:\\s+(\\d+) kB", fh.read()).group(1))
    except (OSError, AttributeError):
        return resource.getrusage(resource.RUSAGE_SELF).ru_maxrss

try:
    code = main(sys.argv[1:])
finally:
    print(f"peak-rss-kib {peak_kib()}", file=sys.stderr)
sys.exit(code)
"""


def run_cellchem(*args: object) -> tuple[int, str, str, float]:
    """Exit code, output, errors and peak resident memory in MiB of ``cellchem ARGS``."""
    done = subprocess.run(
        [sys.executable, "-c", CHILD, *map(str, args)],
        capture_output=True,
        text=True,
        timeout=600,
        env={**os.environ, "PYTHONIOENCODING": "utf-8"},
    )
    found = re.search(r"peak-rss-kib (\d+)", done.stderr)
    assert found, done.stderr[-2000:]
    return done.returncode, done.stdout, done.stderr, int(found.group(1)) / 1024


def assert_clear(code: int, out: str, err: str) -> None:
    assert code in (0, 1), (code, out[-1500:], err[-1500:])
    assert "Traceback" not in out + err and "MemoryError" not in out + err, err[-1500:]


# Lines as a stores list prints them; molar masses checked against periodictable below
STOCK = (
    ("Sodium chloride", "NaCl"),
    ("Potassium nitrate", "KNO3"),
    ("Calcium carbonate", "CaCO3"),
    ("Magnesium sulfate heptahydrate", "MgSO4.7H2O"),
    ("Copper(II) sulfate pentahydrate", "CuSO4.5H2O"),
)
ORACLE = {
    "NaCl": "NaCl",
    "KNO3": "KNO3",
    "CaCO3": "CaCO3",
    "MgSO4.7H2O": "MgSO4(H2O)7",
    "CuSO4.5H2O": "CuSO4(H2O)5",
}


@pytest.mark.slow
def test_a_million_short_lines_are_filled_in_bounded_memory(tmp_path: Path) -> None:
    lines = 1_000_000
    src = tmp_path / "million.csv"
    with open(src, "w", encoding="utf-8", newline="") as fh:
        fh.write("No.,Item,Formula\r\n")
        for start in range(1, lines, 50_000):
            fh.write(
                "".join(f"{i},{STOCK[i % 5][0]},{STOCK[i % 5][1]}\r\n" for i in range(start, start + 50_000))
            )
    size = src.stat().st_size
    out = tmp_path / "million-filled.csv"
    code, stdout, err, peak = run_cellchem("fill", src, "-o", out, "--add", "formula,molar-mass")
    assert_clear(code, stdout, err)
    assert "lines filled: 1000000" in stdout
    # the reader holds one record at a time: far less than the file (reading it whole took 14 to 24 times it)
    assert peak < 200, f"peak resident memory {peak:.0f} MiB for a {size / MIB:.0f} MiB file"
    with open(src, encoding="utf-8", newline="") as a, open(out, encoding="utf-8", newline="") as b:
        assert next(b) == "No.,Item,Formula,Formula (canonical),Molar mass (g/mol)\r\n"
        next(a)
        for n, (before, after) in enumerate(zip(a, b)):
            assert after.startswith(before[:-2] + ","), (n, before, after)
            if n < 5 or n % 99_991 == 0:
                formula = before[:-2].split(",")[2]
                mass = float(after[:-2].split(",")[-1])
                assert mass == pytest.approx(periodictable.formula(ORACLE[formula]).mass, abs=0.01)
        assert next(b, None) is None


def long_line_file(tmp_path: Path, name_bytes: int) -> tuple[Path, bytes]:
    """A list with one name cell of ``name_bytes`` on one line (line 4) among ordinary lines."""
    lines = [
        b"Item,Formula,Molar mass\r\n",
        b"Sodium chloride,NaCl,58.44\r\n",
        b"Potassium nitrate,KNO3,101.10\r\n",
    ]
    long_line = b"Sodium chloride " + b"x" * name_bytes + b",NaCl,58.44\r\n"
    tail = [b"Calcium carbonate,CaCO3,100.09\r\n", b"Magnesium oxide,MgO,40.30\r\n"]
    path = tmp_path / "long-line.csv"
    with open(path, "wb") as fh:
        fh.writelines([*lines, long_line, *tail])
    return path, long_line


@pytest.mark.slow
@pytest.mark.parametrize("name_bytes", [40_000, 5_000_000], ids=["40-kB-cell", "5-MB-field"])
def test_a_long_single_line_field_is_that_rows_problem(tmp_path: Path, name_bytes: int) -> None:
    src, long_line = long_line_file(tmp_path, name_bytes)
    cut = (
        "a cell is longer than 32,767 characters, more than a spreadsheet cell holds:"
        " only its first 32,767 were read"
    )
    note = (
        f"line 4: the row is longer than 1,048,576 characters; {cut}"
        if name_bytes > MIB
        else f"line 4: {cut}"
    )

    code, out, err, peak = run_cellchem("audit", src)
    assert_clear(code, out, err)
    assert note in out
    assert "data rows read: 5" in out  # the long row is read, its name cut; the four others as they are
    assert peak < 200

    dst = tmp_path / "filled.csv"
    code, out, err, peak = run_cellchem("fill", src, "-o", dst, "--add", "formula")
    assert_clear(code, out, err)
    assert f"note: {note}; the line was copied as it is, not filled" in out
    assert "lines filled: 4" in out
    assert peak < 200
    result = dst.read_bytes()
    assert long_line in result  # copied byte for byte
    assert result.replace(long_line, b"") == (
        b"Item,Formula,Molar mass,Formula (canonical)\r\n"
        b"Sodium chloride,NaCl,58.44,NaCl\r\n"
        b"Potassium nitrate,KNO3,101.10,KNO3\r\n"
        b"Calcium carbonate,CaCO3,100.09,CaCO3\r\n"
        b"Magnesium oxide,MgO,40.30,MgO\r\n"
    )


@pytest.mark.slow
def test_a_50_mb_record_is_streamed_past(tmp_path: Path) -> None:
    # a note cell whose quote is closed only 50 MB and a million lines later
    src = tmp_path / "long-record.csv"
    para = b"Keep the lid closed and store away from acids.\n"
    blocks = 50_000_000 // (len(para) * 10_000)
    with open(src, "wb") as fh:
        fh.write(b'Item,Formula,Note\r\nSodium chloride,NaCl,ok\r\nPotassium nitrate,KNO3,"')
        for _ in range(blocks):
            fh.write(para * 10_000)
        fh.write(b'"\r\nCalcium carbonate,CaCO3,\r\n')
    assert src.stat().st_size > 49_000_000
    last_line = 3 + blocks * 10_000  # the record starts on line 3; each line break in its cell adds a line
    note = (
        "line 3: the row is longer than 1,048,576 characters; a cell is longer than 32,767 characters,"
        " more than a spreadsheet cell holds: only its first 32,767 were read"
        f" (it runs to line {last_line}: look for a quote that is never closed)"
    )

    code, out, err, peak = run_cellchem("audit", src)
    assert_clear(code, out, err)
    assert note in out
    assert "lines checked: 3" in out
    assert peak < 200

    dst = tmp_path / "filled.csv"
    code, out, err, peak = run_cellchem("fill", src, "-o", dst, "--add", "formula")
    assert_clear(code, out, err)
    assert f"note: {note}; the line was copied as it is, not filled" in out
    assert peak < 200
    assert dst.stat().st_size == src.stat().st_size + len(",Formula (canonical)" + ",NaCl" + ",CaCO3")
    with open(dst, "rb") as fh:
        assert fh.read(100).startswith(
            b"Item,Formula,Note,Formula (canonical)\r\nSodium chloride,NaCl,ok,NaCl\r\n"
        )
        fh.seek(-100, os.SEEK_END)
        assert fh.read().endswith(b'"\r\nCalcium carbonate,CaCO3,,CaCO3\r\n')


# --- audit and fill read the same rows ------------------------------------------------------------

# A supplier's export as European spreadsheets save it: Windows-1252, semicolons, decimal commas,
# a title above the header, cells quoted for a semicolon or a line break. Molar masses from the
# CRC Handbook (from memory); two lines carry planted errors (a formula that does not balance,
# a name that gives another formula).
EXPORT = (
    "Preisliste Quillbrook Reagents;;;\r\n"
    "\r\n"
    "Artikel;Formel;Molmasse;CAS-Nr.\r\n"
    "Natriumchlorid;NaCl;58,44;7647-14-5\r\n"
    '"Kupfersulfat; Pentahydrat";CuSO4·5H2O;249,68;7758-99-8\r\n'
    '"Kaliumpermanganat\r\n(Lager 2)";KMnO4;158,03;7722-64-7\r\n'
    "Sodium sulfite;Na2SO4;142,04;\r\n"
    "Sulfate de cuivre (qualité réactif);CuSO4;159,61;7758-98-7\r\n"
    "Sodium chloride;NaCl2;58,44;\r\n"
    "Calciumcarbonat;CaCO3;100,09;471-34-1\r\n"
)


def test_audit_and_fill_read_the_same_rows(tmp_path: Path) -> None:
    src = write(tmp_path, EXPORT.encode("cp1252"), "preisliste.csv")
    table = read_text_table(src)
    stream = open_text_table(src)
    assert (table.encoding, table.delimiter, table.decimal_comma) == ("cp1252", ";", True)
    assert (stream.encoding, stream.delimiter, stream.decimal_comma) == ("cp1252", ";", True)
    from_table = [(line, row) for line, row in zip(table.line_numbers, table.rows) if row]
    from_records = [(r.line, tuple(r.fields)) for r in stream.records() if r.fields]
    from_rows = [(line, tuple(v or "" for v in values)) for line, values in stream.rows() if values]
    assert from_table == from_records == from_rows
    assert from_rows[3] == (5, ("Kupfersulfat; Pentahydrat", "CuSO4·5H2O", "249,68", "7758-99-8"))
    assert from_rows[4] == (6, ("Kaliumpermanganat\r\n(Lager 2)", "KMnO4", "158,03", "7722-64-7"))
    assert [line for line, _ in from_rows] == [1, 3, 4, 5, 6, 8, 9, 10, 11]

    report = tmp_path / "findings.json"
    code, out, err, _ = run_cellchem("audit", src, "--report", report)
    assert_clear(code, out, err)
    errors: dict[int, set[str]] = {}
    for finding in json.loads(report.read_text(encoding="utf-8")):
        if finding["severity"] == "error":
            errors.setdefault(finding["row"], set()).add(finding["message"])

    dst = tmp_path / "filled.csv"
    code, out, err, _ = run_cellchem("fill", src, "-o", dst, "--add", "formula,verdict")
    assert_clear(code, out, err)
    filled = read_text_table(dst)
    assert filled.encoding == "cp1252" and filled.delimiter == ";"
    verdicts = {line: row[-1] for line, row in zip(filled.line_numbers, filled.rows) if line > 4 and row}
    assert set(verdicts) == {5, 6, 8, 9, 10, 11}
    for line, verdict in verdicts.items():
        if verdict.startswith("error: "):
            assert verdict.removeprefix("error: ") in errors.get(line, set()), (line, verdict, errors)
        else:
            assert line not in errors, (line, verdict, errors)
    assert {line for line, v in verdicts.items() if v.startswith("error")} == {8, 10} == set(errors)
