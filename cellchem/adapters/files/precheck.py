r"""Checking a supplier file before any spreadsheet library parses it.

Supplier files are untrusted. :func:`precheck` looks at a file with the
standard library's ``zipfile`` and, for the few XML parts it reads, with
``defusedxml`` (which refuses entity declarations and external references), and
refuses anything openpyxl should not be given: the wrong format under a workbook
name, a damaged or hostile zip package (duplicate parts, parts outside the
package, encrypted parts, declared sizes over the limits), a Strict Open XML
workbook (openpyxl reads it as empty), a workbook with no visible sheet, or a
sheet declaring a used range absurd for its size.

Sizes are bounded by what the package *declares*: ``zipfile`` inflates a part
to at most the uncompressed size given in its central-directory entry, so
checking the declared sizes against ``MAX_PART_BYTES`` and
``MAX_PACKAGE_BYTES`` bounds what any later reader can be made to inflate (a
zip bomb included). A compression ratio alone cannot tell a bomb from a real
sheet: a column of repeated values compresses a thousandfold too.

Every refusal is an :class:`~cellchem.adapters.files.UnusableFile` whose
message is one line: the file name in quotes, what was found, and what would
make the file usable. No other exception escapes for any content of the file.
"""

from __future__ import annotations

import os
import posixpath
import re
import stat
import struct
import zipfile
import zlib
from collections.abc import Iterator
from contextlib import contextmanager
from dataclasses import dataclass
from typing import IO, Any, NamedTuple

from . import (
    ABSURD_CELLS_PER_BYTE,
    ABSURD_MIN_CELLS,
    MAX_INFLATION_RATIO,
    MAX_MEMBERS,
    MAX_PACKAGE_BYTES,
    MAX_PART_BYTES,
    MAX_RATIO_FROM_BYTES,
    MAX_TEXT_BYTES,
    UnusableFile,
)

_WORKBOOK_EXTENSIONS = (".xlsx", ".xlsm")
_OPENDOCUMENT_EXTENSIONS = (".ods",)
_TEXT_EXTENSIONS = (".csv", ".txt")
_OTHER_FORMATS = {
    ".xls": "is in the legacy Excel format (.xls), which cellchem does not read: save it as .xlsx"
    " (File > Save As > Excel Workbook)",
    ".xlt": "is a legacy Excel template (.xlt), which cellchem does not read: save it as .xlsx",
    ".xlsb": "is a binary workbook (.xlsb), which cellchem does not read: save it as .xlsx",
    ".xltx": "is a workbook template (.xltx), which cellchem does not read: save it as .xlsx",
    ".xltm": "is a workbook template (.xltm), which cellchem does not read: save it as .xlsx or .xlsm",
    ".ots": "is an OpenDocument template (.ots), which cellchem does not read: save it as .ods",
    ".fods": "is a flat OpenDocument spreadsheet (.fods), which cellchem does not read: save it as .ods",
    ".numbers": "is an Apple Numbers document, which cellchem does not read: export it as .xlsx or CSV",
}

_ZIP_MAGIC = b"PK\x03\x04"
_EMPTY_ZIP_MAGIC = b"PK\x05\x06"
_OLE2_MAGIC = b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1"
_UTF16_BOMS = (b"\xff\xfe", b"\xfe\xff")
_UTF8_BOM = b"\xef\xbb\xbf"
_HEAD_BYTES = 4096  # bytes looked at to tell text from binary
_READ_CHUNK = 1 << 20  # bytes read at a time when scanning a text file for NUL bytes
_SHEET_HEAD_BYTES = 65536  # bytes of a sheet part searched for its <dimension>
# A central-directory entry is 46 bytes plus the part's name and extra fields; a
# spreadsheet program writes entries under 200 bytes. zipfile builds one object per
# entry while opening a package, so the directory is bounded before it is opened.
_CENTRAL_ENTRY_BYTES = 512

_EOCD = struct.Struct("<4s4H2LH")  # end of central directory record (22 bytes)
_ZIP64_LOCATOR = struct.Struct("<4sLQL")  # zip64 end of central directory locator (20 bytes)
_ZIP64_EOCD = struct.Struct("<4sQ2H2L4Q")  # zip64 end of central directory record (56 bytes)

_MAIN_NS = "http://schemas.openxmlformats.org/spreadsheetml/2006/main"
_STRICT_NS = "http://purl.oclc.org/ooxml/spreadsheetml/main"
_REL_ID = "{http://schemas.openxmlformats.org/officeDocument/2006/relationships}id"
_CONTENT_TYPES = "[Content_Types].xml"
_ROOT_RELS = "_rels/.rels"
_DEFAULT_WORKBOOK = "xl/workbook.xml"
# the workbook content types, in the order openpyxl looks for them
_WORKBOOK_TYPES = (
    "application/vnd.ms-excel.template.macroEnabled.main+xml",
    "application/vnd.openxmlformats-officedocument.spreadsheetml.template.main+xml",
    "application/vnd.ms-excel.sheet.macroEnabled.main+xml",
    "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml",
)
_STATES = ("visible", "hidden", "veryHidden")

_DIMENSION = re.compile(rb"<(?:[A-Za-z_][\w.-]*:)?dimension\b[^>]*?\bref\s*=\s*([\"'])(.*?)\1", re.DOTALL)
_RANGE = re.compile(r"\$?([A-Za-z]{1,10})\$?([0-9]{1,20})(?::\$?([A-Za-z]{1,10})\$?([0-9]{1,20}))?")

_RESAVE = "save it again from the spreadsheet program"
_ASK = "ask the supplier for a copy saved by a spreadsheet program"
_INSTALL = "install it with python -m pip install 'cellchem[workbook]'"


class _Sheet(NamedTuple):
    name: str
    state: str
    rid: str | None


def require_defusedxml() -> None:
    """Make sure workbooks will be parsed safely: the pre-checks parse with
    defusedxml, and the readers refuse what it refuses with its exception
    classes.

    Raises:
        UnusableFile: defusedxml is not installed. The message names no file.

    Example:
        >>> require_defusedxml()  # doctest: +SKIP
    """
    try:
        import defusedxml  # noqa: F401
    except ImportError:
        raise UnusableFile(
            f"reading workbooks safely needs defusedxml, which is not installed: {_INSTALL}"
        ) from None


def precheck(path: str | os.PathLike[str]) -> str:
    r"""Check a file before any parsing, and say which reader it needs.

    The file must be a regular, readable, non-empty file named .xlsx or .xlsm
    (a workbook), .ods (an OpenDocument spreadsheet) or .csv or .txt (a text
    export). No part of a package may inflate more than
    ``MAX_INFLATION_RATIO`` to 1 once it declares over
    ``MAX_RATIO_FROM_BYTES``. A workbook must be a sound
    zip package (no duplicate, encrypted or escaping parts, declared sizes
    within ``MAX_PART_BYTES`` each and ``MAX_PACKAGE_BYTES`` in all, at most
    ``MAX_MEMBERS`` parts) holding a transitional SpreadsheetML workbook with
    at least one visible sheet, and no sheet part may declare a used range of
    more than ``ABSURD_CELLS_PER_BYTE`` cells per byte of the part (and more
    than ``ABSURD_MIN_CELLS``). A text export must not be a workbook under a
    text name, must be at most ``MAX_TEXT_BYTES`` bytes, and may hold NUL
    bytes only after a UTF-16 byte-order mark.

    Args:
        path: the file to check.

    Returns:
        'xlsx' for a workbook (.xlsx or .xlsm), 'ods' for an OpenDocument
        spreadsheet, 'text' for a text export (.csv or .txt).

    Raises:
        UnusableFile: the file cannot or will not be read; the message is one
            line that starts with the file name in quotes and says why and
            what would make it usable.

    Example:
        >>> import pathlib, tempfile
        >>> folder = tempfile.TemporaryDirectory()
        >>> stock = pathlib.Path(folder.name) / "stock.csv"
        >>> _ = stock.write_bytes(b"formula,name\r\nNaCl,sodium chloride\r\n")
        >>> precheck(stock)
        'text'
        >>> legacy = pathlib.Path(folder.name) / "stock.xls"
        >>> _ = legacy.write_bytes(b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1" + bytes(504))
        >>> precheck(legacy)  # doctest: +ELLIPSIS
        Traceback (most recent call last):
        ...
        cellchem.errors.UnusableFile: '...stock.xls' is in the legacy Excel format (.xls), ...
        >>> folder.cleanup()
    """
    return inspect(path).kind


@dataclass(frozen=True)
class Checked:
    """What the pre-check learned, so that the reader does not learn it again."""

    kind: str  # 'xlsx' (.xlsx, .xlsm), 'ods' or 'text'
    sheets: tuple[tuple[str, str], ...] = ()  # a workbook's (sheet name, state) in workbook order
    facts: Any = None  # what the OpenDocument checks learned (``ods.check_ods``)


def inspect(path: str | os.PathLike[str]) -> Checked:
    """``precheck``, returning what it learned: the kind of file and a
    workbook's sheets with their visibility."""
    shown = _shown(path)
    with _open_file(path, shown) as (fh, size):
        kind = _kind(path, shown)
        if kind == "text":
            _check_text(fh, size, shown)
            return Checked("text")
        try:
            require_defusedxml()
        except UnusableFile as exc:
            raise _refuse(shown, f"cannot be checked: {exc}") from None
        with _open_package(fh, size, shown) as zf:
            if kind == "ods":
                from .ods import check_ods

                _check_doctypes(zf, shown)
                facts = check_ods(zf, shown)
                return Checked("ods", tuple((sheet.name, sheet.state) for sheet in facts.sheets), facts)
            book = _workbook_part(zf, shown)
            sheets = _read_sheets(zf, book, shown)
            if not sheets:
                raise _refuse(shown, f"has no sheets ('{book}' lists none): {_RESAVE} with the data's sheets")
            if all(sheet.state != "visible" for sheet in sheets):
                listed = ", ".join(f"'{sheet.name}' ({sheet.state})" for sheet in sheets[:5])
                more = f" and {len(sheets) - 5} more" if len(sheets) > 5 else ""
                raise _refuse(
                    shown,
                    f"has no visible sheet: all its sheets are hidden: {listed}{more}; unhide the sheet"
                    " that holds the data (right-click a sheet tab > Unhide) and save it again",
                )
            _check_used_ranges(zf, book, sheets, shown)
            _check_doctypes(zf, shown)
    return Checked("xlsx", tuple((sheet.name, sheet.state) for sheet in sheets))


_PROLOG_BYTES = 65536


def _check_doctypes(zf: zipfile.ZipFile, shown: str) -> None:
    """Refuse any XML part whose prolog declares a document type (and so may
    declare entities): no part of a workbook needs one. Only the first 64 KiB
    of each part are read; defusedxml, under openpyxl, refuses any that hide
    a declaration further in."""
    for info in zf.infolist():
        name = info.filename
        if not name.lower().endswith((".xml", ".rels", ".vml")):
            continue
        try:
            with zf.open(info) as fh:
                head = fh.read(_PROLOG_BYTES)
        except (zipfile.BadZipFile, zlib.error, OSError, EOFError, NotImplementedError, RuntimeError) as exc:
            raise _damaged(shown, f"the part '{name}' cannot be read ({exc})") from None
        if head.startswith((b"\xff\xfe", b"\xfe\xff")):
            head = head.decode("utf-16", errors="ignore").encode("utf-8", errors="ignore")
        if b"<!DOCTYPE" in head or b"<!ENTITY" in head:
            raise _refuse(
                shown,
                f"holds an XML entity declaration in '{name}', which cellchem refuses (a possible"
                f" entity-expansion attack): {_ASK}",
            )


def sheet_states(path: str | os.PathLike[str]) -> list[tuple[str, str]]:
    """The sheets of a workbook with their visibility, read from its workbook part.

    The package is checked as :func:`precheck` checks it (format, zip
    structure, declared sizes) before the workbook part is parsed with
    defusedxml.

    Args:
        path: a workbook (.xlsx or .xlsm).

    Returns:
        (sheet name, state) in workbook order; state is 'visible', 'hidden' or
        'veryHidden'.

    Raises:
        UnusableFile: the file is not a workbook cellchem reads, or its
            workbook part cannot be read; the message is one line that starts
            with the file name in quotes.

    Example:
        >>> sheet_states("no-such-stock-list.xlsx")  # doctest: +ELLIPSIS
        Traceback (most recent call last):
        ...
        cellchem.errors.UnusableFile: 'no-such-stock-list.xlsx' cannot be read: ...
    """
    shown = _shown(path)
    with _open_file(path, shown) as (fh, size):
        if _kind(path, shown) != "xlsx":
            raise _refuse(shown, "is not a workbook: sheets are listed only for .xlsx and .xlsm files")
        try:
            import defusedxml  # noqa: F401
        except ImportError:
            raise _refuse(
                shown, f"cannot be read: reading workbooks safely needs defusedxml, {_INSTALL}"
            ) from None
        with _open_package(fh, size, shown) as zf:
            return [(sheet.name, sheet.state) for sheet in _read_sheets(zf, _workbook_part(zf, shown), shown)]


# --- the file ---------------------------------------------------------------------------------------------


def _shown(path: str | os.PathLike[str]) -> str:
    """The path as given, in quotes, with control characters escaped (one line)."""
    return f"'{_printable(os.fsdecode(os.fspath(path)))}'"


def _printable(text: str) -> str:
    """``text`` with every character that is not printable written as an escape."""
    if text.isprintable():
        return text
    return "".join(ch if ch.isprintable() else ch.encode("unicode_escape").decode("ascii") for ch in text)


def _refuse(shown: str, text: str) -> UnusableFile:
    """The refusal for the file ``shown``: one line, the name first."""
    return UnusableFile(f"{shown} {_printable(text)}")


@contextmanager
def _open_file(path: str | os.PathLike[str], shown: str) -> Iterator[tuple[IO[bytes], int]]:
    """The file open for reading, with its size, once it is known to be a regular, non-empty file."""
    try:
        info = os.stat(path)
        if stat.S_ISDIR(info.st_mode):
            raise _refuse(
                shown, "is a folder, not a file: name a workbook (.xlsx, .xlsm) or a text export (.csv, .txt)"
            )
        if not stat.S_ISREG(info.st_mode):
            raise _refuse(
                shown,
                "is not a regular file (it is a device, pipe or socket): copy the data into a .xlsx,"
                " .xlsm, .csv or .txt file",
            )
        fh = open(path, "rb")
    except OSError as exc:
        reason = exc.strerror or type(exc).__name__
        raise _refuse(
            shown, f"cannot be read: {reason}; check the path and that you may read the file"
        ) from None
    except ValueError as exc:  # a path holding a NUL character
        raise _refuse(shown, f"cannot be read: the path is not valid ({exc}); check the path") from None
    with fh:
        size = os.fstat(fh.fileno()).st_size
        if size == 0:
            raise _refuse(shown, "is empty (0 bytes): export it again, or ask the supplier for a new copy")
        yield fh, size


def _kind(path: str | os.PathLike[str], shown: str) -> str:
    """'xlsx' or 'text' from the file's extension, or a refusal naming what to save it as."""
    extension = os.path.splitext(os.path.basename(os.fsdecode(os.fspath(path))))[1].lower()
    if extension in _WORKBOOK_EXTENSIONS:
        return "xlsx"
    if extension in _OPENDOCUMENT_EXTENSIONS:
        return "ods"
    if extension in _TEXT_EXTENSIONS:
        return "text"
    if extension in _OTHER_FORMATS:
        raise _refuse(shown, _OTHER_FORMATS[extension])
    if not extension:
        raise _refuse(
            shown,
            "has no file extension, so cellchem cannot tell a workbook from a text export: name it .xlsx"
            ", .xlsm or .ods if it is a workbook, .csv or .txt if it is text",
        )
    raise _refuse(
        shown,
        f"has the extension '{extension}', which cellchem does not read: cellchem reads workbooks"
        " (.xlsx, .xlsm, .ods) and text exports (.csv, .txt)",
    )


def _looks_like_text(head: bytes) -> bool:
    """Whether the first bytes of a file read as text (a byte-order mark, or no control bytes)."""
    if head.startswith(_UTF16_BOMS):
        return True
    return not re.search(rb"[\x00-\x08\x0e-\x1a\x1c-\x1f\x7f]", head)


def _check_text(fh: IO[bytes], size: int, shown: str) -> None:
    """Refuse a workbook under a text name, a text file over MAX_TEXT_BYTES, or binary content."""
    head = fh.read(_HEAD_BYTES)
    if head.startswith((_ZIP_MAGIC, _EMPTY_ZIP_MAGIC)):
        raise _refuse(
            shown,
            "is a workbook (a zip package) saved under a text name: rename it .xlsx, or open it in the"
            " spreadsheet program and export CSV",
        )
    if head.startswith(_OLE2_MAGIC):
        raise _refuse(
            shown,
            "is a binary workbook (a legacy .xls or a password-protected workbook) saved under a text name:"
            " open it in the spreadsheet program and export CSV, or save it as .xlsx",
        )
    if size > MAX_TEXT_BYTES:
        raise _refuse(
            shown,
            f"is {size:,} bytes, over cellchem's limit of {MAX_TEXT_BYTES:,} bytes for a text file:"
            " split it into smaller files",
        )
    if head.startswith(_UTF16_BOMS):
        return
    fh.seek(0)
    offset = 0
    while chunk := fh.read(_READ_CHUNK):
        nul = chunk.find(b"\x00")
        if nul >= 0:
            raise _refuse(
                shown,
                f"holds NUL bytes (the first at byte {offset + nul + 1:,}) and no UTF-16 byte-order mark,"
                " so it is binary, not text: export the table again as CSV (UTF-8, or UTF-16 with a"
                " byte-order mark)",
            )
        offset += len(chunk)


# --- the zip package --------------------------------------------------------------------------------------


def _check_magic(fh: IO[bytes], shown: str) -> None:
    """Refuse a file named as a workbook that does not start as a zip package."""
    fh.seek(0)
    head = fh.read(_HEAD_BYTES)
    if head.startswith((_ZIP_MAGIC, _EMPTY_ZIP_MAGIC)):
        return
    if head.startswith(_OLE2_MAGIC):
        raise _refuse(
            shown,
            "is an OLE2 compound file, not an .xlsx package: it is either a password-protected (encrypted)"
            " workbook or a legacy .xls file renamed; remove the password (File > Info > Protect"
            " Workbook) or save as .xlsx",
        )
    stripped = head.removeprefix(_UTF8_BOM).lstrip()
    if stripped.startswith(b"<") or _looks_like_text(head):
        raise _refuse(
            shown,
            "is not a workbook (it looks like HTML/XML or text exported under a workbook name): open it in"
            " the spreadsheet program and save it as .xlsx, or name a CSV export .csv",
        )
    raise _refuse(
        shown,
        "is not a workbook: it does not start with the zip signature of an .xlsx package (it is damaged"
        " or in another format); save it again as .xlsx",
    )


def _directory_bounds(fh: IO[bytes], size: int) -> tuple[int, int] | None:
    """The largest part count and central-directory size the end records declare.

    The end record is found the way ``zipfile`` finds it (the last 22 bytes,
    else the last signature within the 64 KiB comment room); both places a
    zip64 record may be read from are looked at, and the largest value any
    record declares is kept.

    Returns:
        (parts, directory bytes) as declared, or None when there is no end record.
    """
    start = max(size - (1 << 16) - _EOCD.size, 0)
    fh.seek(start)
    tail = fh.read()
    if (
        len(tail) >= _EOCD.size
        and tail.endswith(b"\x00\x00")
        and tail[-_EOCD.size :].startswith(b"PK\x05\x06")
    ):
        at = len(tail) - _EOCD.size
    else:
        at = tail.rfind(b"PK\x05\x06")
        if at < 0 or len(tail) - at < _EOCD.size:
            return None
    fields = _EOCD.unpack_from(tail, at)
    count, directory = fields[4], fields[5]
    counts: list[int] = []
    sizes: list[int] = []
    record = start + at
    if record >= _ZIP64_LOCATOR.size:
        fh.seek(record - _ZIP64_LOCATOR.size)
        signature, _, offset, _ = _ZIP64_LOCATOR.unpack(fh.read(_ZIP64_LOCATOR.size))
        if signature == b"PK\x06\x07":
            for place in {record - _ZIP64_LOCATOR.size - _ZIP64_EOCD.size, offset}:
                if 0 <= place <= size - _ZIP64_EOCD.size:
                    fh.seek(place)
                    zip64 = _ZIP64_EOCD.unpack(fh.read(_ZIP64_EOCD.size))
                    if zip64[0] == b"PK\x06\x06":
                        counts.append(zip64[7])
                        sizes.append(zip64[8])
    # with a zip64 record, 0xFFFF and 0xFFFFFFFF in the end record are placeholders for its values
    if not counts or count != 0xFFFF:
        counts.append(count)
    if not sizes or directory != 0xFFFFFFFF:
        sizes.append(directory)
    return max(counts), max(sizes)


@contextmanager
def _open_package(fh: IO[bytes], size: int, shown: str) -> Iterator[zipfile.ZipFile]:
    """The workbook's zip package, once its signature, directory and parts have been checked."""
    _check_magic(fh, shown)
    bounds = _directory_bounds(fh, size)
    if bounds is None:
        raise _damaged(shown, "it has no end-of-directory record, so it is cut short or not a zip file")
    parts, directory = bounds
    if parts > MAX_MEMBERS:
        raise _too_many_parts(shown, parts)
    if directory > size:
        raise _damaged(shown, f"its zip directory claims {directory:,} bytes, more than the whole file")
    if directory > MAX_MEMBERS * _CENTRAL_ENTRY_BYTES:
        raise _refuse(
            shown,
            f"has a zip directory of {directory:,} bytes, more than a workbook of at most {MAX_MEMBERS:,}"
            f" parts (cellchem's limit) needs: {_ASK}",
        )
    try:
        fh.seek(0)
        zf = zipfile.ZipFile(fh)
    except (zipfile.BadZipFile, OSError, EOFError, ValueError, NotImplementedError, struct.error) as exc:
        raise _damaged(shown, f"its zip directory cannot be read ({exc})") from None
    with zf:
        _check_members(zf, shown)
        yield zf


def _damaged(shown: str, why: str) -> UnusableFile:
    return _refuse(shown, f"is damaged: {why}; {_RESAVE} or ask the supplier for a new copy")


def _too_many_parts(shown: str, parts: int) -> UnusableFile:
    return _refuse(
        shown,
        f"has {parts:,} parts, over cellchem's limit of {MAX_MEMBERS:,} parts for one workbook: save the"
        " sheets you need in a smaller workbook",
    )


def _escapes(name: str) -> bool:
    """Whether a part name is absolute or climbs out of the package with '..'."""
    return (
        name.startswith(("/", "\\")) or bool(re.match(r"[A-Za-z]:", name)) or ".." in re.split(r"[/\\]", name)
    )


def _check_members(zf: zipfile.ZipFile, shown: str) -> None:
    """Refuse an empty package, too many parts, duplicate, escaping, encrypted or oversized parts."""
    members = zf.infolist()
    if not members:
        raise _refuse(shown, f"is an empty zip package with no parts, not a workbook: {_RESAVE} as .xlsx")
    if len(members) > MAX_MEMBERS:
        raise _too_many_parts(shown, len(members))
    seen: dict[str, str] = {}
    total = 0
    for info in members:
        name = info.filename
        if _escapes(name):
            raise _refuse(
                shown,
                f"holds a part named '{name}' that points outside the package (an absolute path or '..'),"
                f" which cellchem refuses: {_ASK}",
            )
        folded = name.casefold()  # part names are compared without regard to case
        if folded in seen:
            twice = (
                f"the part '{name}' twice"
                if seen[folded] == name
                else f"the parts '{seen[folded]}' and '{name}'"
            )
            raise _refuse(
                shown,
                f"holds {twice}: a duplicate can hide a part from one reader and show it to another, so"
                f" cellchem refuses it; {_RESAVE}",
            )
        seen[folded] = name
        if info.flag_bits & 0x1:
            raise _refuse(
                shown,
                f"holds the encrypted part '{name}' (zip encryption), which cellchem cannot read: save the"
                " workbook again without a password",
            )
        if info.compress_type not in (zipfile.ZIP_STORED, zipfile.ZIP_DEFLATED):
            raise _refuse(
                shown,
                f"holds the part '{name}' compressed with zip method {info.compress_type}, which spreadsheet"
                f" programs do not write: {_RESAVE}",
            )
        if info.file_size > MAX_PART_BYTES:
            raise _refuse(
                shown,
                f"holds the part '{name}' declaring {info.file_size:,} bytes uncompressed, over cellchem's"
                f" limit of {MAX_PART_BYTES:,} bytes for one part: split the data over smaller workbooks"
                " or export the sheet as CSV",
            )
        if info.file_size > MAX_RATIO_FROM_BYTES and info.file_size > MAX_INFLATION_RATIO * max(
            info.compress_size, 1
        ):
            raise _refuse(
                shown,
                f"holds the part '{name}' that inflates from {info.compress_size:,} to {info.file_size:,}"
                f" bytes ({info.file_size // max(info.compress_size, 1):,} to 1), far beyond what cells of"
                f" data compress to (a zip bomb, or millions of empty formatted cells): cellchem refuses"
                f" parts over {MAX_RATIO_FROM_BYTES >> 20} MiB that inflate more than"
                f" {MAX_INFLATION_RATIO} to 1; {_RESAVE}, or export the sheet as CSV",
            )
        total += info.file_size
    if total > MAX_PACKAGE_BYTES:
        raise _refuse(
            shown,
            f"declares {total:,} bytes uncompressed in all its parts, over cellchem's limit of"
            f" {MAX_PACKAGE_BYTES:,} bytes for one workbook: split the data over smaller workbooks",
        )


# --- the XML parts ----------------------------------------------------------------------------------------


def _xml_events(zf: zipfile.ZipFile, part: str, shown: str) -> Iterator[tuple[str, Any]]:
    """("start" | "end", element) from a part parsed with defusedxml, one element at a time.

    An element is cleared and dropped from its parent once its "end" has been
    handled, so memory stays bounded by the depth of the document.
    """
    import defusedxml
    from defusedxml import ElementTree as SafeTree

    stack: list[Any] = []
    try:
        with zf.open(part) as stream:
            for event, element in SafeTree.iterparse(stream, events=("start", "end")):
                if event == "start":
                    stack.append(element)
                    yield event, element
                    continue
                stack.pop()
                yield event, element
                element.clear()
                if stack:
                    stack[-1].remove(element)
    except defusedxml.ExternalReferenceForbidden:
        raise _refuse(
            shown,
            f"holds an external XML reference in '{part}', which cellchem refuses (it could make a reader"
            f" fetch other files): {_ASK}",
        ) from None
    except defusedxml.DefusedXmlException:
        raise _refuse(
            shown,
            f"holds an XML entity declaration in '{part}', which cellchem refuses (a possible"
            f" entity-expansion attack): {_ASK}",
        ) from None
    except SafeTree.ParseError as exc:
        raise _damaged(shown, f"'{part}' is not well-formed XML ({exc})") from None
    except (zipfile.BadZipFile, zlib.error, OSError, EOFError, NotImplementedError, RuntimeError) as exc:
        raise _damaged(shown, f"the part '{part}' cannot be read ({exc})") from None
    except (ValueError, LookupError) as exc:
        raise _damaged(shown, f"'{part}' cannot be read as XML ({exc})") from None


def _local(tag: Any) -> str:
    """The local name of an element tag ('' for a comment or processing instruction)."""
    return tag.rpartition("}")[2] if isinstance(tag, str) else ""


def _resolve(source_part: str, target: str) -> str:
    """The part a relationship target names, from the part the relationship belongs to."""
    if target.startswith("/"):
        return target[1:]
    return posixpath.normpath(posixpath.join(posixpath.dirname(source_part), target))


def _relationships(
    zf: zipfile.ZipFile, rels_part: str, source_part: str, shown: str
) -> Iterator[tuple[str, str, str]]:
    """(id, type, target part) of each internal relationship in a .rels part."""
    for event, element in _xml_events(zf, rels_part, shown):
        if (
            event == "end"
            and _local(element.tag) == "Relationship"
            and element.get("TargetMode") != "External"
        ):
            target = element.get("Target")
            if target:
                yield element.get("Id", ""), element.get("Type", ""), _resolve(source_part, target)


def _rels_part(part: str) -> str:
    """The relationships part of ``part`` (xl/workbook.xml -> xl/_rels/workbook.xml.rels)."""
    folder, name = posixpath.split(part)
    return posixpath.join(folder, "_rels", f"{name}.rels")


def _workbook_part(zf: zipfile.ZipFile, shown: str) -> str:
    """The workbook part: from [Content_Types].xml (where openpyxl finds it), agreeing with _rels/.rels."""
    names = set(zf.namelist())
    if _CONTENT_TYPES not in names:
        raise _refuse(
            shown, f"has no {_CONTENT_TYPES}, so it is not an Office Open XML workbook: {_RESAVE} as .xlsx"
        )
    overrides: dict[str, str] = {}
    by_default = False
    for event, element in _xml_events(zf, _CONTENT_TYPES, shown):
        if event != "end":
            continue
        content_type = element.get("ContentType")
        if content_type not in _WORKBOOK_TYPES:
            continue
        if _local(element.tag) == "Override" and element.get("PartName"):
            overrides.setdefault(content_type, element.get("PartName"))
        elif _local(element.tag) == "Default":
            by_default = True
    found = next((overrides[t] for t in _WORKBOOK_TYPES if t in overrides), None)
    if found is not None:
        book = found[1:]  # openpyxl drops the leading '/'
    elif by_default:
        book = _DEFAULT_WORKBOOK
    else:
        raise _refuse(
            shown,
            f"declares no workbook part in {_CONTENT_TYPES}: it is not an Excel workbook; {_RESAVE} as .xlsx",
        )
    if _ROOT_RELS in names:
        for _, kind, target in _relationships(zf, _ROOT_RELS, "", shown):
            if kind.endswith("/officeDocument"):
                if target != book:
                    raise _refuse(
                        shown,
                        f"names two different workbook parts ('{book}' in {_CONTENT_TYPES}, '{target}' in"
                        f" {_ROOT_RELS}), so two readers could see different sheets: {_RESAVE}",
                    )
                break
    if book not in names:
        raise _refuse(
            shown, f"has no workbook part '{book}': it is damaged or not a workbook; {_RESAVE} as .xlsx"
        )
    return book


def _read_sheets(zf: zipfile.ZipFile, book: str, shown: str) -> list[_Sheet]:
    """The <sheet> elements of the workbook part, refusing Strict Open XML and unknown states."""
    sheets: list[_Sheet] = []
    depth = 0
    in_sheets = False
    for event, element in _xml_events(zf, book, shown):
        if event == "start":
            depth += 1
            if depth == 1:
                namespace = element.tag[1:].partition("}")[0] if element.tag.startswith("{") else ""
                if namespace == _STRICT_NS:
                    raise _refuse(
                        shown,
                        "is saved as Strict Open XML: openpyxl reads it as empty; save it as"
                        " 'Excel Workbook (.xlsx)'",
                    )
                if element.tag != f"{{{_MAIN_NS}}}workbook":
                    raise _damaged(shown, f"'{book}' holds a '{_local(element.tag)}' element, not a workbook")
            elif depth == 2 and element.tag == f"{{{_MAIN_NS}}}sheets":
                in_sheets = True
            continue
        depth -= 1
        if in_sheets and depth == 2 and element.tag == f"{{{_MAIN_NS}}}sheet":
            sheets.append(_sheet(element, book, shown))
            if len(sheets) > MAX_MEMBERS:
                raise _refuse(
                    shown,
                    f"lists more than {MAX_MEMBERS:,} sheets, more than the parts cellchem accepts:"
                    " save the sheets you need in a smaller workbook",
                )
        elif in_sheets and depth == 1:
            break  # the end of <sheets>: nothing after it is needed
    return sheets


def _sheet(element: Any, book: str, shown: str) -> _Sheet:
    """One <sheet> element as a _Sheet, refusing a sheet with no name or an unknown state."""
    name = element.get("name")
    if not name:
        raise _damaged(shown, f"a sheet in '{book}' has no name")
    state = element.get("state", "visible")
    if state not in _STATES:
        raise _damaged(
            shown, f"the sheet '{name}' has the state '{state}' (expected visible, hidden or veryHidden)"
        )
    return _Sheet(name, state, element.get(_REL_ID))


def _check_used_ranges(zf: zipfile.ZipFile, book: str, sheets: list[_Sheet], shown: str) -> None:
    """Refuse a sheet part whose declared used range is absurd for the part's size."""
    names = set(zf.namelist())
    wanted = {sheet.rid for sheet in sheets if sheet.rid}
    targets: dict[str, str] = {}
    rels = _rels_part(book)
    if wanted and rels in names:
        for rid, _, target in _relationships(zf, rels, book, shown):
            if rid in wanted:
                targets.setdefault(rid, target)
    checked: set[str] = set()
    for position, sheet in enumerate(sheets, start=1):
        part = targets.get(sheet.rid or "")
        if part is not None and part not in names:
            raise _damaged(
                shown, f"the sheet '{sheet.name}' points to the part '{part}', which is not in the file"
            )
        if part is None:
            part = f"xl/worksheets/sheet{position}.xml"  # where spreadsheet programs put it
            if part not in names:
                continue
        if part in checked:
            continue
        checked.add(part)
        _check_dimension(zf, part, sheet.name, shown)


def _check_dimension(zf: zipfile.ZipFile, part: str, sheet: str, shown: str) -> None:
    """Refuse the part if the <dimension> in its first 64 KiB declares an absurd number of cells."""
    try:
        with zf.open(part) as stream:
            head = stream.read(_SHEET_HEAD_BYTES)
    except (
        zipfile.BadZipFile,
        zlib.error,
        OSError,
        EOFError,
        NotImplementedError,
        RuntimeError,
        ValueError,
    ) as exc:
        raise _damaged(shown, f"the part '{part}' cannot be read ({exc})") from None
    if head.startswith(_UTF16_BOMS):
        head = head.decode("utf-16", errors="ignore").encode("utf-8")
    match = _DIMENSION.search(head)
    if match is None:
        return
    ref = match.group(2).decode("ascii", errors="replace").strip()
    cells = _cell_count(ref)
    declared = zf.getinfo(part).file_size
    if cells > ABSURD_CELLS_PER_BYTE * declared and cells > ABSURD_MIN_CELLS:
        raise _refuse(
            shown,
            f"declares a used range of {cells:,} cells ({ref}) in a sheet part of {declared:,} bytes"
            f" (sheet '{sheet}'), which is absurd for its size: delete the empty rows and columns after"
            " the data in the spreadsheet program and save it again",
        )


def _column_number(letters: str) -> int:
    """The 1-based column number of column letters (A -> 1, XFD -> 16384)."""
    number = 0
    for letter in letters.upper():
        number = number * 26 + ord(letter) - ord("A") + 1
    return number


def _cell_count(ref: str) -> int:
    """The number of cells in an A1-style range such as 'A1:XFD1048576' (0 if it does not read as one)."""
    match = _RANGE.fullmatch(ref)
    if match is None:
        return 0
    first_column, first_row, last_column, last_row = match.groups()
    if last_column is None:
        return 1
    columns = abs(_column_number(last_column) - _column_number(first_column)) + 1
    rows = abs(int(last_row) - int(first_row)) + 1
    return columns * rows
