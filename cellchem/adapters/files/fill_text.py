"""Fill over a text export (CSV): the new columns appended to each record, the
rest of every record kept as it was written (quoting, separators, line
endings, encoding and byte-order mark).

The file is streamed: a first pass reads the first rows to find the header
and the columns, a second copies each record's own text to the output with
the new cells added before its line break. Nothing holds more than one
record (a record longer than ``text.MAX_RECORD_CHARS`` is copied through
piece by piece, unfilled, with a note), so memory does not grow with the
file. The output is written through ``writer.write_atomically``.
"""

from __future__ import annotations

import csv
import io
from pathlib import Path
from typing import BinaryIO

from ...columns import HEADER_SEARCH_ROWS, column_letter
from ...errors import CellchemError
from ...fill import MASS
from . import MAX_COLUMNS, UnusableFile
from .audit import sheet_columns
from .fill_common import FillOptions, FillReport, _fill_from_roles, _layout
from .reports import defuse
from .text import TextStream, open_text_table, ungrouped_number
from .writer import write_atomically

_KNOWN_LINES = 4096  # distinct lines whose new cells are remembered


def _csv_number(value: float, kind: str, decimal_comma: bool) -> str:
    text = f"{value:.2f}" if kind == MASS else f"{value:.6g}"
    return text.replace(".", ",") if decimal_comma else text


def _head(stream: TextStream, header_line: int | None) -> tuple[list[list[str]], dict[int, int], int | None]:
    """The first rows, as read_text_table gives them (empty lines included),
    for finding the layout: the first
    HEADER_SEARCH_ROWS, and with ``header_line`` (a line number) rows up to
    the one starting there, those in between as empty rows (the layout
    looks only at the header row when it is given). Returns the rows, the
    line of each row kept by index, and the index of the row starting on
    ``header_line`` (None when no row starts there)."""
    rows: list[list[str]] = []
    lines: dict[int, int] = {}
    index = None
    for record in stream.records():
        if header_line is not None and record.line > header_line:
            break
        at = len(rows)
        if at < HEADER_SEARCH_ROWS or record.line == header_line:
            rows.append(record.fields)
            lines[at] = record.line
        else:
            rows.append([])
        if record.line == header_line:
            index = at
        if at + 1 >= HEADER_SEARCH_ROWS and (header_line is None or record.line >= header_line):
            break
    return rows, lines, index


def fill_text(src: Path, dst: Path, options: FillOptions) -> FillReport:
    report = FillReport(str(src))
    stream = open_text_table(src)
    columns = sheet_columns(options.layout_options(), "", single_table=True)
    head, head_lines, index = _head(stream, columns.header_row)
    if columns.header_row is not None and index is None:
        raise UnusableFile(f"'{src.name}': --header-row {columns.header_row}: no row starts on that line")
    try:
        layout = _layout(head[: max(HEADER_SEARCH_ROWS, (index or 0) + 1)], columns, index)
    except CellchemError as exc:
        raise UnusableFile(f"'{src.name}': nothing was written: {exc}") from None
    header_line = head_lines[layout.header_index]
    degraded = not ({"formula", "name"} <= layout.roles.keys())
    role_columns = set(layout.roles.values())
    report.header_row = header_line
    width = len(layout.headers)
    report.columns = [(column_letter(width + k), c.header) for k, c in enumerate(options.columns)]
    delimiter = stream.delimiter
    decimal_comma = stream.decimal_comma
    codec = stream.codec

    def encode_cells(cells: list[str]) -> str:
        buf = io.StringIO()
        csv.writer(buf, delimiter=delimiter, lineterminator="").writerow(cells)
        return buf.getvalue()

    roles = sorted(layout.roles.items())
    # what a line's cells give (the new cells, and the line counted in a report of its own) by the
    # cells that decide it: a stores list repeats its compounds, and the values fill writes are a
    # function of the cells alone; bounded, so that memory does not grow with the file
    known: dict[tuple, tuple] = {}

    def added(cells: list[str]) -> str:
        """The new cells of a data row, after its own (padded to the header's width)."""
        pad = max(width - len(cells), 0)
        key = (
            tuple(cells[i] if i < len(cells) else None for _role, i in roles),
            tuple(c for i, c in enumerate(cells) if i not in role_columns) if degraded else None,
            pad,
        )
        seen = known.get(key)
        if seen is None:
            counted = FillReport(report.source)
            suffix = _added(cells, pad, counted)
            seen = (
                suffix,
                counted.filled,
                counted.partly,
                counted.kept_existing,
                tuple(counted.not_filled.items()),
                tuple(counted.notes),
            )
            if len(known) >= _KNOWN_LINES:
                known.clear()
            known[key] = seen
        suffix, filled, partly, kept, not_filled, notes = seen
        report.filled += filled
        report.partly += partly
        report.kept_existing += kept
        for verdict, count in not_filled:
            report.not_filled[verdict] += count
        if notes:
            report.notes.extend(notes)
        return suffix

    def _added(cells: list[str], pad: int, counted: FillReport) -> str:
        values = {role: (cells[i] if i < len(cells) else None) for role, i in layout.roles.items()}
        if isinstance(values.get("molar_mass"), str):
            values["molar_mass"] = ungrouped_number(values["molar_mass"], decimal_comma)
        others = [c for i, c in enumerate(cells) if i not in role_columns] if degraded else None
        line_result = _fill_from_roles(values, options, counted, decimal_comma, others)
        shown = []
        for column, value in zip(options.columns, line_result.values):
            if value is None:
                shown.append("")
            elif isinstance(value, int | float) and not isinstance(value, bool):
                shown.append(_csv_number(float(value), column.kind, decimal_comma))
            else:
                shown.append(defuse(str(value)))
        return delimiter * (pad + 1) + encode_cells(shown)

    def write(fh: BinaryIO) -> None:
        def put(text: str, line: int) -> None:
            try:
                fh.write(text.encode(codec))
            except UnicodeEncodeError as exc:
                raise UnusableFile(
                    f"'{src.name}': nothing was written: the value {exc.object[exc.start : exc.end]!r} for"
                    f" line {line} cannot be written in {stream.encoding}, the file's encoding;"
                    ' re-save the file as "CSV UTF-8"'
                ) from None

        fh.write(stream.bom)
        put(stream.preamble, 1)
        records = stream.records(spill=lambda piece: fh.write(piece.encode(codec)))
        for record in records:
            raw, cells = record.raw, record.fields
            if record.problem:  # over a cap: copied as it is (already, when it was too long to hold)
                report.notes.append(f"{record.problem}; the line was copied as it is, not filled")
                if raw is not None:
                    put(raw, record.line)
                continue
            body = raw.rstrip("\r\n")
            suffix = ""
            if record.line == header_line:
                pad = max(width - len(cells), 0)
                suffix = delimiter * (pad + 1) + encode_cells([defuse(c.header) for c in options.columns])
            elif record.line > header_line and any(c.strip() for c in cells):
                suffix = added(cells)
            put(body + suffix + raw[len(body) :] if suffix else raw, record.line)
        if records.truncated_at:
            report.notes.append(
                f"columns beyond {column_letter(MAX_COLUMNS - 1)} were not read"
                f" (first on line {records.truncated_at}); the new cells follow each line's own"
            )

    write_atomically(dst, write)
    report.output = str(dst)
    return report
