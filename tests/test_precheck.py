"""precheck: supplier files checked before any spreadsheet library parses them.

Every hostile file is built here from a real workbook written by openpyxl (or
from scratch with zipfile and struct), so no binary fixture is committed. Each
refusal is checked for its type, for being one line that starts with the file
name in quotes, and for the words that say why and what to do.
"""

from __future__ import annotations

import functools
import importlib.util
import io
import os
import re
import struct
import sys
import warnings
import zipfile
from pathlib import Path

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from cellchem.adapters.files import UnusableFile
from cellchem.adapters.files import precheck as precheck_module
from cellchem.adapters.files.precheck import precheck, require_defusedxml, sheet_states

HAVE_WORKBOOK_EXTRA = all(importlib.util.find_spec(name) for name in ("openpyxl", "defusedxml"))
needs_workbook = pytest.mark.skipif(
    not HAVE_WORKBOOK_EXTRA, reason="openpyxl and defusedxml come with the workbook extra"
)

OLE2 = b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1"
MAIN = b"http://schemas.openxmlformats.org/spreadsheetml/2006/main"
STRICT = b"http://purl.oclc.org/ooxml/spreadsheetml/main"
WORKBOOK = "xl/workbook.xml"
SHEET1 = "xl/worksheets/sheet1.xml"


# --- building files ---------------------------------------------------------------------------------------


@functools.cache
def real_workbook(states: tuple[str, ...] = ("visible",)) -> bytes:
    """A small stock list saved by openpyxl, one sheet per state given."""
    import openpyxl

    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "Stock"
    ws.append(["formula", "name", "g/mol"])
    ws.append(["NaCl", "sodium chloride", 58.44])
    ws.append(["CuSO4.5H2O", "copper(II) sulfate pentahydrate", 249.68])
    ws.sheet_state = states[0]
    for number, state in enumerate(states[1:], start=2):
        extra = wb.create_sheet(f"Sheet {number}")
        extra.append(["kept", number])
        extra.sheet_state = state
    out = io.BytesIO()
    wb.save(out)
    return out.getvalue()


def rebuild(
    data: bytes,
    replace: dict[str, bytes | None] | None = None,
    add: tuple[tuple[str, bytes], ...] = (),
    compression: int = zipfile.ZIP_DEFLATED,
) -> bytes:
    """The package ``data`` with parts replaced (None drops a part) and parts added."""
    replace = replace or {}
    out = io.BytesIO()
    with zipfile.ZipFile(io.BytesIO(data)) as src, zipfile.ZipFile(out, "w", compression) as dst:
        for info in src.infolist():
            if info.filename in replace:
                if replace[info.filename] is not None:
                    dst.writestr(info.filename, replace[info.filename])
            else:
                dst.writestr(info.filename, src.read(info.filename))
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")  # zipfile warns on a duplicate name: some tests want one
            for name, content in add:
                dst.writestr(name, content)
    return out.getvalue()


def part(data: bytes, name: str) -> bytes:
    with zipfile.ZipFile(io.BytesIO(data)) as zf:
        return zf.read(name)


def edit(data: bytes, name: str, old: bytes, new: bytes) -> bytes:
    """The package with ``old`` replaced by ``new`` in one part (``old`` must be there)."""
    content = part(data, name)
    assert old in content, (name, old)
    return rebuild(data, {name: content.replace(old, new)})


def central_entries(data: bytes) -> dict[str, tuple[int, int]]:
    """Each member's (central-directory entry offset, local header offset), read with struct."""
    entries = {}
    at = data.find(b"PK\x01\x02")
    while at >= 0:
        name_length, extra_length, comment_length = struct.unpack_from("<3H", data, at + 28)
        (local,) = struct.unpack_from("<L", data, at + 42)
        entries[data[at + 46 : at + 46 + name_length].decode()] = (at, local)
        at = data.find(b"PK\x01\x02", at + 46 + name_length + extra_length + comment_length)
    return entries


def patch_member(data: bytes, name: str, central: int, local: int, fmt: str, value: int) -> bytes:
    """Write ``value`` at a field of a member's central-directory entry and local header."""
    out = bytearray(data)
    central_at, local_at = central_entries(data)[name]
    struct.pack_into(fmt, out, central_at + central, value)
    struct.pack_into(fmt, out, local_at + local, value)
    return bytes(out)


def patch_end_record(data: bytes, offset: int, fmt: str, value: int) -> bytes:
    out = bytearray(data)
    struct.pack_into(fmt, out, data.rfind(b"PK\x05\x06") + offset, value)
    return bytes(out)


def write(tmp_path: Path, name: str, content: bytes) -> Path:
    path = tmp_path / name
    path.write_bytes(content)
    return path


def refusal(path: str | os.PathLike[str], check=precheck) -> str:
    """The message of the UnusableFile raised for ``path``, checked to be one line naming the file."""
    with pytest.raises(UnusableFile) as caught:
        check(path)
    message = str(caught.value)
    assert "\n" not in message and "\r" not in message, message
    assert message.startswith(f"'{os.fspath(path)}' "), message
    return message


def assert_words(message: str, *words: str) -> None:
    for word in words:
        assert word in message, (word, message)


# --- files that pass --------------------------------------------------------------------------------------


@needs_workbook
@pytest.mark.parametrize("name", ["stock.xlsx", "stock.xlsm", "STOCK.XLSX"])
def test_real_workbook_passes(tmp_path, name):
    assert precheck(write(tmp_path, name, real_workbook())) == "xlsx"


@needs_workbook
def test_sheet_states_in_workbook_order(tmp_path):
    path = write(tmp_path, "stock.xlsx", real_workbook(("visible", "hidden", "veryHidden", "visible")))
    assert precheck(path) == "xlsx"
    assert sheet_states(path) == [
        ("Stock", "visible"),
        ("Sheet 2", "hidden"),
        ("Sheet 3", "veryHidden"),
        ("Sheet 4", "visible"),
    ]


@needs_workbook
def test_sheet_states_reads_a_state_left_out_as_visible(tmp_path):
    data = edit(real_workbook(), WORKBOOK, b' state="visible"', b"")
    assert sheet_states(write(tmp_path, "stock.xlsx", data)) == [("Stock", "visible")]


@pytest.mark.parametrize(
    "name, content",
    [
        ("stock.csv", b"formula,name\r\nNaCl,sodium chloride\r\n"),
        ("stock.txt", b"formula\tname\nKCl\tpotassium chloride\n"),
        ("stock.csv", b"\xef\xbb\xbfformula;name\r\nNaCl;chlorure de sodium\r\n"),
        ("stock.csv", "formula,name\r\nNaCl,sodium chloride\r\n".encode("utf-16")),  # BOM, then NUL bytes
        ("stock.csv", b"\xfe\xff" + "formula,name\n".encode("utf-16-be")),
    ],
    ids=["csv", "txt", "utf-8 BOM", "utf-16 BOM (LE)", "utf-16 BOM (BE)"],
)
def test_text_exports_pass(tmp_path, name, content):
    assert precheck(write(tmp_path, name, content)) == "text"


# --- the file itself --------------------------------------------------------------------------------------


def test_missing_file(tmp_path):
    message = refusal(tmp_path / "missing.xlsx")
    assert_words(message, "cannot be read", "No such file", "check the path")


def test_path_holding_a_nul_character():
    with pytest.raises(UnusableFile) as caught:
        precheck("stock\x00.xlsx")
    assert (
        str(caught.value)
        == "'stock\\x00.xlsx' cannot be read: the path is not valid (embedded null byte); check the path"
    )


def test_directory(tmp_path):
    folder = tmp_path / "stock.xlsx"
    folder.mkdir()
    assert_words(refusal(folder), "is a folder, not a file")


@pytest.mark.skipif(not hasattr(os, "mkfifo"), reason="named pipes are made with os.mkfifo")
def test_named_pipe(tmp_path):
    pipe = tmp_path / "stock.csv"
    os.mkfifo(pipe)
    assert_words(refusal(pipe), "not a regular file")


@pytest.mark.skipif(not hasattr(os, "geteuid") or os.geteuid() == 0, reason="root reads any file")
def test_unreadable_file(tmp_path):
    path = write(tmp_path, "stock.csv", b"formula\nNaCl\n")
    path.chmod(0)
    try:
        assert_words(refusal(path), "cannot be read", "Permission denied")
    finally:
        path.chmod(0o600)


@pytest.mark.parametrize("name", ["stock.xlsx", "stock.csv"])
def test_empty_file(tmp_path, name):
    assert_words(refusal(write(tmp_path, name, b"")), "is empty (0 bytes)", "export it again")


@pytest.mark.parametrize(
    "name, words",
    [
        ("stock.xls", ("legacy Excel format", "save it as .xlsx")),
        ("stock.XLS", ("legacy Excel format", "save it as .xlsx")),
        ("stock.ods", ("OLE2 compound file", "password")),
        ("stock.ots", ("OpenDocument template", "save it as .ods")),
        ("stock.xlsb", ("binary workbook (.xlsb)", "save it as .xlsx")),
        ("stock.xltx", ("template", "save it as .xlsx")),
        ("stock", ("no file extension", "name it .xlsx", ".csv")),
        (".xlsx", ("no file extension",)),
        ("stock.pdf", ("extension '.pdf'", ".xlsx, .xlsm, .ods", ".csv, .txt")),
    ],
)
def test_formats_not_read_say_what_to_save_as(tmp_path, name, words):
    assert_words(refusal(write(tmp_path, name, OLE2 + bytes(504))), *words)


def test_control_characters_in_the_name_stay_on_one_line(tmp_path):
    path = write(tmp_path, "stock\nlist.xls", b"x")
    with pytest.raises(UnusableFile) as caught:
        precheck(path)
    message = str(caught.value)
    assert "\n" not in message
    assert message.startswith(f"'{tmp_path}/stock\\nlist.xls' ")


# --- a workbook name on something else --------------------------------------------------------------------


@needs_workbook
def test_ole2_file_named_xlsx_is_encrypted_or_legacy(tmp_path):
    message = refusal(write(tmp_path, "stock.xlsx", OLE2 + bytes(1016)))
    assert_words(
        message,
        "password-protected (encrypted)",
        "legacy .xls",
        "File > Info > Protect Workbook",
        "save as .xlsx",
    )


@needs_workbook
@pytest.mark.parametrize(
    "content",
    [
        b"<html><body><table><tr><td>NaCl</td></tr></table></body></html>",
        b"\xef\xbb\xbf  <?xml version='1.0'?><Workbook/>",
        b"formula,name\r\nNaCl,sodium chloride\r\n",
    ],
    ids=["html", "xml", "csv"],
)
def test_text_named_xlsx_is_not_a_workbook(tmp_path, content):
    message = refusal(write(tmp_path, "stock.xlsx", content))
    assert_words(message, "not a workbook (it looks like HTML/XML or text exported under a workbook name)")


@needs_workbook
def test_binary_named_xlsx_without_zip_signature(tmp_path):
    message = refusal(write(tmp_path, "stock.xlsx", bytes(range(256)) * 4))
    assert_words(message, "not a workbook", "zip signature")


# --- a text name on something else ------------------------------------------------------------------------


@needs_workbook
def test_workbook_named_csv(tmp_path):
    message = refusal(write(tmp_path, "stock.csv", real_workbook()))
    assert_words(message, "is a workbook (a zip package) saved under a text name", "rename it .xlsx")


def test_ole2_named_csv(tmp_path):
    message = refusal(write(tmp_path, "stock.txt", OLE2 + bytes(504)))
    assert_words(message, "workbook", "saved under a text name", "export CSV")


def test_csv_holding_nul_bytes_is_binary(tmp_path):
    message = refusal(write(tmp_path, "stock.csv", b"formula,name\nNaCl,so\x00dium\n"))
    assert_words(message, "NUL bytes", "byte 21", "no UTF-16 byte-order mark", "binary", "export")


def test_nul_bytes_far_into_a_csv_are_found(tmp_path):
    content = b"NaCl,sodium chloride\n" * 100_000 + b"\x00"
    assert_words(refusal(write(tmp_path, "stock.csv", content)), f"byte {len(content):,}")


def test_text_over_the_limit(tmp_path, monkeypatch):
    monkeypatch.setattr(precheck_module, "MAX_TEXT_BYTES", 16)
    path = write(tmp_path, "stock.csv", b"formula,name\nNaCl,sodium chloride\n")
    assert_words(refusal(path), "is 34 bytes", "limit of 16 bytes for a text file", "split it")
    monkeypatch.setattr(precheck_module, "MAX_TEXT_BYTES", 34)
    assert precheck(path) == "text"


# --- zip structure ----------------------------------------------------------------------------------------


@needs_workbook
def test_truncated_zip_is_damaged(tmp_path):
    data = real_workbook()
    message = refusal(write(tmp_path, "stock.xlsx", data[: len(data) // 2]))
    assert_words(message, "is damaged", "save it again")


@needs_workbook
def test_empty_zip_has_no_parts(tmp_path):
    out = io.BytesIO()
    zipfile.ZipFile(out, "w").close()
    assert out.getvalue().startswith(b"PK\x05\x06")
    assert_words(refusal(write(tmp_path, "stock.xlsx", out.getvalue())), "empty zip package with no parts")


@needs_workbook
def test_duplicate_member_names(tmp_path):
    hidden = part(real_workbook(), WORKBOOK).replace(b'state="visible"', b'state="hidden"')
    data = rebuild(real_workbook(), add=((WORKBOOK, hidden),))
    with zipfile.ZipFile(io.BytesIO(data)) as zf:
        assert [i.filename for i in zf.infolist()].count(WORKBOOK) == 2
    message = refusal(write(tmp_path, "stock.xlsx", data))
    assert_words(message, f"the part '{WORKBOOK}' twice", "duplicate can hide a part")


@needs_workbook
def test_member_names_differing_only_in_case(tmp_path):
    data = rebuild(real_workbook(), add=(("XL/Workbook.xml", part(real_workbook(), WORKBOOK)),))
    message = refusal(write(tmp_path, "stock.xlsx", data))
    assert_words(message, f"the parts '{WORKBOOK}' and 'XL/Workbook.xml'", "duplicate")


@needs_workbook
def test_central_directory_claiming_a_huge_size(tmp_path):
    data = patch_member(real_workbook(), SHEET1, 24, 22, "<L", 0xF000_0000)
    with zipfile.ZipFile(io.BytesIO(data)) as zf:
        assert zf.getinfo(SHEET1).file_size == 0xF000_0000
    message = refusal(write(tmp_path, "stock.xlsx", data))
    assert_words(
        message, SHEET1, "declaring 4,026,531,840 bytes", "limit of 1,073,741,824 bytes for one part"
    )


@needs_workbook
def test_bomb_like_member_over_the_part_limit(tmp_path, monkeypatch):
    data = rebuild(real_workbook(), add=(("xl/media/padding.bin", bytes(300_000)),))
    assert len(data) < 20_000  # zeros compress a thousandfold: the declared size is what counts
    path = write(tmp_path, "stock.xlsx", data)
    assert precheck(path) == "xlsx"
    monkeypatch.setattr(precheck_module, "MAX_PART_BYTES", 200_000)
    assert_words(refusal(path), "'xl/media/padding.bin' declaring 300,000 bytes", "limit of 200,000 bytes")


@needs_workbook
def test_package_over_the_total_limit(tmp_path, monkeypatch):
    data = real_workbook()
    with zipfile.ZipFile(io.BytesIO(data)) as zf:
        total = sum(i.file_size for i in zf.infolist())
    path = write(tmp_path, "stock.xlsx", data)
    monkeypatch.setattr(precheck_module, "MAX_PACKAGE_BYTES", total)
    assert precheck(path) == "xlsx"
    monkeypatch.setattr(precheck_module, "MAX_PACKAGE_BYTES", total - 1)
    assert_words(refusal(path), f"declares {total:,} bytes uncompressed in all its parts", f"{total - 1:,}")


@needs_workbook
def test_too_many_members(tmp_path, monkeypatch):
    data = real_workbook()
    count = len(central_entries(data))
    path = write(tmp_path, "stock.xlsx", data)
    monkeypatch.setattr(precheck_module, "MAX_MEMBERS", count)
    assert precheck(path) == "xlsx"
    monkeypatch.setattr(precheck_module, "MAX_MEMBERS", count - 1)
    assert_words(refusal(path), f"has {count} parts", f"limit of {count - 1} parts")


@needs_workbook
def test_too_many_members_behind_an_end_record_that_understates_them(tmp_path, monkeypatch):
    data = patch_end_record(patch_end_record(real_workbook(), 8, "<H", 1), 10, "<H", 1)
    count = len(central_entries(data))
    monkeypatch.setattr(precheck_module, "MAX_MEMBERS", count - 1)
    assert_words(refusal(write(tmp_path, "stock.xlsx", data)), f"has {count} parts")


@needs_workbook
def test_central_directory_larger_than_its_parts_could_need(tmp_path, monkeypatch):
    data = patch_end_record(patch_end_record(real_workbook(), 8, "<H", 1), 10, "<H", 1)
    monkeypatch.setattr(precheck_module, "MAX_MEMBERS", 1)
    assert_words(refusal(write(tmp_path, "stock.xlsx", data)), "zip directory of", "at most 1 parts")


@needs_workbook
def test_archive_comment_is_allowed(tmp_path):
    out = io.BytesIO(real_workbook())
    with zipfile.ZipFile(out, "a") as zf:
        zf.comment = b"saved by the supplier's system"
    assert not out.getvalue().endswith(b"\x00\x00")  # the end record is not the last 22 bytes
    assert precheck(write(tmp_path, "stock.xlsx", out.getvalue())) == "xlsx"


def zip64_workbook(monkeypatch) -> bytes:
    """The real workbook written with zip64 end records (as for a package of more than 65,535 parts)."""
    with monkeypatch.context() as patched:
        patched.setattr(zipfile, "ZIP_FILECOUNT_LIMIT", 2)
        data = rebuild(real_workbook())
    assert b"PK\x06\x06" in data and b"PK\x06\x07" in data
    return data


@needs_workbook
def test_zip64_end_records_are_read(tmp_path, monkeypatch):
    data = zip64_workbook(monkeypatch)
    path = write(tmp_path, "stock.xlsx", data)
    assert precheck(path) == "xlsx"
    too_many = bytearray(data)
    struct.pack_into("<Q", too_many, data.rfind(b"PK\x06\x06") + 32, 1_000_000)
    path.write_bytes(too_many)
    assert_words(refusal(path), "has 1,000,000 parts", "limit of 10,000 parts")


@needs_workbook
def test_zip64_placeholders_in_the_end_record_are_not_counts(tmp_path, monkeypatch):
    data = zip64_workbook(monkeypatch)
    placeholders = patch_end_record(patch_end_record(data, 10, "<H", 0xFFFF), 12, "<L", 0xFFFF_FFFF)
    assert precheck(write(tmp_path, "stock.xlsx", placeholders)) == "xlsx"


@needs_workbook
def test_central_directory_larger_than_the_file(tmp_path):
    data = patch_end_record(real_workbook(), 12, "<L", 0xFFFF_FFF0)
    message = refusal(write(tmp_path, "stock.xlsx", data))
    assert_words(message, "is damaged", "4,294,967,280 bytes, more than the whole file")


@needs_workbook
def test_encrypted_member(tmp_path):
    data = patch_member(real_workbook(), SHEET1, 8, 6, "<H", 0x1)
    message = refusal(write(tmp_path, "stock.xlsx", data))
    assert_words(message, f"encrypted part '{SHEET1}'", "without a password")


@needs_workbook
@pytest.mark.parametrize("name", ["../evil", "xl/../../evil.xml", "/etc/evil", "C:/evil", "xl\\..\\evil"])
def test_member_names_outside_the_package(tmp_path, name):
    data = rebuild(real_workbook(), add=((name, b"<x/>"),))
    message = refusal(write(tmp_path, "stock.xlsx", data))
    assert_words(message, f"part named '{name}'", "outside the package")


@needs_workbook
def test_dots_inside_a_member_name_are_allowed(tmp_path):
    data = rebuild(real_workbook(), add=(("customXml/item..1.xml", b"<x/>"),))
    assert precheck(write(tmp_path, "stock.xlsx", data)) == "xlsx"


@needs_workbook
def test_compression_method_spreadsheet_programs_do_not_write(tmp_path):
    data = rebuild(real_workbook(), compression=zipfile.ZIP_BZIP2)
    assert_words(refusal(write(tmp_path, "stock.xlsx", data)), "zip method 12")


# --- package content --------------------------------------------------------------------------------------


@needs_workbook
def test_no_content_types(tmp_path):
    data = rebuild(real_workbook(), {"[Content_Types].xml": None})
    assert_words(refusal(write(tmp_path, "stock.xlsx", data)), "has no [Content_Types].xml")


@needs_workbook
def test_no_workbook_part(tmp_path):
    data = rebuild(real_workbook(), {WORKBOOK: None})
    assert_words(refusal(write(tmp_path, "stock.xlsx", data)), f"has no workbook part '{WORKBOOK}'")


@needs_workbook
def test_no_workbook_content_type(tmp_path):
    data = edit(
        real_workbook(), "[Content_Types].xml", b"spreadsheetml.sheet.main+xml", b"wordprocessingml.main+xml"
    )
    assert_words(
        refusal(write(tmp_path, "stock.xlsx", data)), "declares no workbook part in [Content_Types].xml"
    )


@needs_workbook
def test_workbook_part_found_by_content_types(tmp_path):
    data = real_workbook()
    rels = "xl/_rels/workbook.xml.rels"
    moved = rebuild(
        data,
        {WORKBOOK: None, rels: None},
        add=(("xl/book.xml", part(data, WORKBOOK)), ("xl/_rels/book.xml.rels", part(data, rels))),
    )
    moved = edit(moved, "[Content_Types].xml", b'"/xl/workbook.xml"', b'"/xl/book.xml"')
    path = write(tmp_path, "stock.xlsx", moved)
    assert_words(refusal(path), "two different workbook parts", "'xl/book.xml' in [Content_Types].xml")
    path.write_bytes(edit(moved, "_rels/.rels", b'"xl/workbook.xml"', b'"/xl/book.xml"'))
    assert precheck(path) == "xlsx"


@needs_workbook
def test_strict_open_xml(tmp_path):
    data = edit(real_workbook(), WORKBOOK, MAIN, STRICT)
    message = refusal(write(tmp_path, "stock.xlsx", data))
    assert_words(
        message, "Strict Open XML", "openpyxl reads it as empty", "save it as 'Excel Workbook (.xlsx)'"
    )


@needs_workbook
def test_not_a_workbook_root(tmp_path):
    data = edit(real_workbook(), WORKBOOK, b"<workbook ", b"<worksheet ")
    data = edit(data, WORKBOOK, b"</workbook>", b"</worksheet>")
    assert_words(refusal(write(tmp_path, "stock.xlsx", data)), "is damaged", "'worksheet' element")


@needs_workbook
def test_no_sheets(tmp_path):
    data = real_workbook()
    data = rebuild(data, {WORKBOOK: re.sub(rb"<sheets>.*</sheets>", b"<sheets />", part(data, WORKBOOK))})
    assert_words(refusal(write(tmp_path, "stock.xlsx", data)), "has no sheets")


@needs_workbook
def test_all_sheets_hidden(tmp_path):
    data = real_workbook(("visible", "visible"))
    content = part(data, WORKBOOK).replace(b'state="visible"', b'state="hidden"', 1)
    content = content.replace(b'state="visible"', b'state="veryHidden"', 1)
    path = write(tmp_path, "stock.xlsx", rebuild(data, {WORKBOOK: content}))
    message = refusal(path)
    assert_words(message, "all its sheets are hidden", "'Stock' (hidden)", "'Sheet 2' (veryHidden)", "Unhide")
    assert sheet_states(path) == [("Stock", "hidden"), ("Sheet 2", "veryHidden")]


@needs_workbook
def test_unknown_sheet_state(tmp_path):
    data = edit(real_workbook(), WORKBOOK, b'state="visible"', b'state="shown"')
    message = refusal(write(tmp_path, "stock.xlsx", data))
    assert_words(message, "is damaged", "'Stock' has the state 'shown'")


BILLION_LAUGHS = b"".join(
    [b'<?xml version="1.0"?>\n<!DOCTYPE workbook [\n<!ENTITY lol "lol">\n']
    + [
        b'<!ENTITY lol%d "%s">\n' % (n, (b"&lol%d;" % (n - 1) if n > 1 else b"&lol;") * 10)
        for n in range(1, 10)
    ]
    + [b"]>\n"]
)


@needs_workbook
@pytest.mark.parametrize("member", [WORKBOOK, "[Content_Types].xml"])
def test_billion_laughs(tmp_path, member):
    content = part(real_workbook(), member)
    if member == WORKBOOK:
        content = content.replace(b'name="Stock"', b'name="&lol9;"')
    data = rebuild(real_workbook(), {member: BILLION_LAUGHS + content})
    message = refusal(write(tmp_path, "stock.xlsx", data))
    assert_words(message, "holds an XML entity declaration", member, "a possible entity-expansion attack")


@needs_workbook
def test_external_entity(tmp_path):
    doctype = b'<!DOCTYPE workbook [<!ENTITY stock SYSTEM "file:///etc/hostname">]>'
    content = part(real_workbook(), WORKBOOK).replace(b'name="Stock"', b'name="&stock;"')
    data = rebuild(real_workbook(), {WORKBOOK: doctype + content})
    assert_words(refusal(write(tmp_path, "stock.xlsx", data)), "XML entity declaration")


@needs_workbook
def test_workbook_part_not_well_formed(tmp_path):
    data = edit(real_workbook(), WORKBOOK, b'name="Stock"', b"name=Stock")  # an unquoted attribute
    assert_words(refusal(write(tmp_path, "stock.xlsx", data)), "is damaged", "not well-formed XML")


@needs_workbook
def test_sheet_pointing_to_a_missing_part(tmp_path):
    data = rebuild(real_workbook(), {SHEET1: None})
    message = refusal(write(tmp_path, "stock.xlsx", data))
    assert_words(message, "is damaged", f"'Stock' points to the part '{SHEET1}', which is not in the file")


# --- used range -------------------------------------------------------------------------------------------


def with_dimension(ref: bytes, padding: int = 0) -> bytes:
    data = real_workbook()
    sheet = part(data, SHEET1).replace(b'<dimension ref="A1:C3"', b'<dimension ref="' + ref + b'"')
    assert ref in sheet
    if padding:
        sheet = sheet.replace(b"</worksheet>", b"<!--" + b" " * padding + b"--></worksheet>")
    return rebuild(data, {SHEET1: sheet})


@needs_workbook
def test_absurd_used_range_in_a_tiny_part(tmp_path):
    data = with_dimension(b"A1:XFD1048576")
    with zipfile.ZipFile(io.BytesIO(data)) as zf:
        size = zf.getinfo(SHEET1).file_size
    message = refusal(write(tmp_path, "stock.xlsx", data))
    assert_words(
        message,
        f"declares a used range of 17,179,869,184 cells (A1:XFD1048576) in a sheet part of {size:,} bytes",
        "sheet 'Stock'",
        "delete the empty rows and columns",
    )


@needs_workbook
@pytest.mark.parametrize(
    "ref, padding, refused",
    [
        (b"A1:J1000000", 0, False),  # 10,000,000 cells: not more than ABSURD_MIN_CELLS
        (b"A1:K1000000", 0, True),  # 11,000,000 cells in under 1 KiB
        (b"A1:K1000000", 120_000, False),  # 11,000,000 cells in over 110,000 bytes: under 100 a byte
        (b"$A$1:$K$1000000", 0, True),
        (b"k1000000:a1", 0, True),
        (b"A1", 0, False),
        (b"not a range", 0, False),
    ],
)
def test_used_range_rule(tmp_path, ref, padding, refused):
    path = write(tmp_path, "stock.xlsx", with_dimension(ref, padding))
    if refused:
        assert_words(refusal(path), "declares a used range of 11,000,000 cells")
    else:
        assert precheck(path) == "xlsx"


@needs_workbook
def test_used_range_found_with_a_namespace_prefix(tmp_path):
    data = real_workbook()
    sheet = part(data, SHEET1).replace(b"<dimension ", b'<x:dimension xmlns:x="' + MAIN + b'" ', 1)
    sheet = sheet.replace(b'ref="A1:C3"', b'ref="A1:XFD1048576"')
    message = refusal(write(tmp_path, "stock.xlsx", rebuild(data, {SHEET1: sheet})))
    assert_words(message, "17,179,869,184 cells")


@needs_workbook
def test_used_range_of_a_sheet_found_without_relationships(tmp_path):
    data = rebuild(with_dimension(b"A1:XFD1048576"), {"xl/_rels/workbook.xml.rels": None})
    assert_words(refusal(write(tmp_path, "stock.xlsx", data)), "17,179,869,184 cells")


# --- defusedxml -------------------------------------------------------------------------------------------


@needs_workbook
def test_require_defusedxml_passes_with_the_workbook_extra():
    assert require_defusedxml() is None


def test_the_readers_refuse_what_defusedxml_refuses():
    """The streaming readers parse with expat and refuse a document type
    the way defusedxml does (its own exception class), before any entity."""
    from defusedxml import DTDForbidden

    from cellchem.adapters.files.xlsx import safe_parser

    parser = safe_parser()
    with pytest.raises(DTDForbidden):
        parser.Parse(b'<?xml version="1.0"?><!DOCTYPE x [<!ENTITY a "aaaa">]><x>&a;</x>', True)


@pytest.mark.parametrize("module", ["defusedxml"])
def test_missing_library(tmp_path, monkeypatch, module):
    monkeypatch.setitem(sys.modules, module, None)  # import then raises ImportError
    monkeypatch.setitem(sys.modules, f"{module}.xml", None)
    with pytest.raises(
        UnusableFile, match=rf"needs {module}, which is not installed: .*cellchem\[workbook\]"
    ):
        require_defusedxml()
    message = refusal(write(tmp_path, "stock.xlsx", b"PK\x03\x04"))
    assert_words(message, "cannot be checked", f"needs {module}")


def test_sheet_states_of_a_text_file(tmp_path):
    message = refusal(write(tmp_path, "stock.csv", b"formula\nNaCl\n"), check=sheet_states)
    assert_words(message, "is not a workbook")


# --- any bytes at all -------------------------------------------------------------------------------------

PREFIXES = [b"", b"PK\x03\x04", b"PK\x05\x06", OLE2, b"\xff\xfe", b"\xef\xbb\xbf", b"<html>"]


@settings(max_examples=200, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(
    name=st.sampled_from(["stock.xlsx", "stock.xlsm", "stock.csv", "stock.txt"]),
    prefix=st.sampled_from(PREFIXES),
    body=st.binary(max_size=1024),
)
def test_random_bytes_give_a_kind_or_unusable_file(tmp_path, name, prefix, body):
    path = write(tmp_path, name, prefix + body)
    try:
        kind = precheck(path)
    except UnusableFile as exc:
        assert "\n" not in str(exc) and str(exc).startswith(f"'{path}' ")
    else:
        assert kind == ("xlsx" if name.endswith(("xlsx", "xlsm")) else "text")


@needs_workbook
@settings(max_examples=200, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(
    stored=st.booleans(),
    edits=st.lists(st.tuples(st.integers(min_value=0), st.integers(0, 255)), max_size=6),
    cut=st.one_of(st.none(), st.integers(min_value=1)),
)
def test_damaged_real_workbooks_give_a_kind_or_unusable_file(tmp_path, stored, edits, cut):
    data = bytearray(rebuild(real_workbook(), compression=zipfile.ZIP_STORED) if stored else real_workbook())
    for at, value in edits:
        data[at % len(data)] = value
    if cut is not None:
        data = data[: cut % len(data) or 1]
    path = write(tmp_path, "stock.xlsx", bytes(data))
    for check in (precheck, sheet_states):
        try:
            check(path)
        except UnusableFile as exc:
            assert "\n" not in str(exc) and str(exc).startswith(f"'{path}' ")


def test_a_part_that_inflates_like_a_bomb_is_refused(tmp_path):
    """A sheet part of 40 MiB of one repeated cell (about 1,000 to 1) is
    refused before it is parsed; the workbook's other parts are ordinary."""
    source = io.BytesIO(real_workbook())
    out = io.BytesIO()
    with zipfile.ZipFile(source) as zin, zipfile.ZipFile(out, "w", zipfile.ZIP_DEFLATED) as zout:
        for info in zin.infolist():
            data = zin.read(info)
            if info.filename == "xl/worksheets/sheet1.xml":
                data = data.replace(
                    b"</sheetData>", b"<row>" + b"<c><v>1</v></c>" * (40 << 16) + b"</row></sheetData>"
                )
            zout.writestr(info.filename, data)
    message = refusal(write(tmp_path, "stock.xlsx", out.getvalue()))
    assert_words(message, "xl/worksheets/sheet1.xml", "inflates from", "64 to 1", "zip bomb")
