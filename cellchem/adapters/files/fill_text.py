"""Fill over a text export (CSV): the new columns appended to each record, the
rest of every record kept as it was written (quoting, separators, line
endings, encoding and byte-order mark)."""

from __future__ import annotations

import csv
import io
from pathlib import Path

from ...columns import HEADER_SEARCH_ROWS, column_letter
from ...errors import CellchemError
from ...fill import MASS
from . import UnusableFile
from .audit import sheet_columns
from .fill import FillOptions, FillReport, _fill_from_roles, _layout
from .reports import defuse, replace_atomically


def _raw_records(text: str) -> list[tuple[str, str]]:
    """(record text, line ending) for each record of a CSV text, split as the
    csv module splits them (a line ending inside double quotes belongs to the
    record)."""
    out: list[tuple[str, str]] = []
    i = 0
    start = 0
    quoted = False
    n = len(text)
    while i < n:
        ch = text[i]
        if ch == '"':
            quoted = not quoted
        elif not quoted and ch in "\r\n":
            end = i
            if ch == "\r" and i + 1 < n and text[i + 1] == "\n":
                i += 1
            out.append((text[start:end], text[end : i + 1]))
            start = i + 1
        i += 1
    if start < n:
        out.append((text[start:], ""))
    return out


def _encode_like(original: bytes, text: str, encoding: str) -> bytes:
    if original.startswith(b"\xef\xbb\xbf"):
        return b"\xef\xbb\xbf" + text.encode("utf-8")
    if original.startswith(b"\xff\xfe"):
        return b"\xff\xfe" + text.encode("utf-16-le")
    if original.startswith(b"\xfe\xff"):
        return b"\xfe\xff" + text.encode("utf-16-be")
    return text.encode(encoding)


def _csv_number(value: float, kind: str, decimal_comma: bool) -> str:
    text = f"{value:.2f}" if kind == MASS else f"{value:.6g}"
    return text.replace(".", ",") if decimal_comma else text


def fill_text(src: Path, dst: Path, options: FillOptions) -> FillReport:
    from .text import read_text_table, ungrouped_number

    report = FillReport(str(src))
    table = read_text_table(src)
    raw = src.read_bytes()
    encoding = table.encoding
    text = raw.decode(encoding if encoding not in ("utf-16",) else "utf-16")
    if text.startswith("\ufeff"):
        text = text[1:]
    records = _raw_records(text)
    rows = [list(r) for r in table.rows]
    columns = sheet_columns(options.layout_options(), "", single_table=True)
    index = None
    if columns.header_row is not None:
        index = {line: i for i, line in enumerate(table.line_numbers)}.get(columns.header_row)
        if index is None:
            raise UnusableFile(f"'{src.name}': --header-row {columns.header_row}: no row starts on that line")
    try:
        layout = _layout(rows[: max(HEADER_SEARCH_ROWS, (index or 0) + 1)], columns, index)
    except CellchemError as exc:
        raise UnusableFile(f"'{src.name}': nothing was written: {exc}") from None
    header_line = table.line_numbers[layout.header_index]
    mass_index = layout.roles.get("molar_mass")
    degraded = not ({"formula", "name"} <= layout.roles.keys())
    role_columns = set(layout.roles.values())
    report.header_row = header_line
    width = len(layout.headers)
    report.columns = [(column_letter(width + k), c.header) for k, c in enumerate(options.columns)]
    by_line = {line: i for i, line in enumerate(table.line_numbers)}
    record_lines = []
    line = 1
    for body, ending in records:
        record_lines.append(line)
        line += body.count("\n") + body.count("\r") - body.count("\r\n") + (1 if ending else 0)

    def encode_cells(cells: list[str]) -> str:
        buf = io.StringIO()
        csv.writer(buf, delimiter=table.delimiter, lineterminator="").writerow(cells)
        return buf.getvalue()

    out_parts: list[str] = []
    for (body, ending), start_line in zip(records, record_lines):
        index = by_line.get(start_line)
        suffix = ""
        if index is not None and start_line == header_line:
            pad = max(width - len(table.rows[index]), 0)
            suffix = table.delimiter * (pad + 1) + encode_cells([defuse(c.header) for c in options.columns])
        elif (
            index is not None and start_line > header_line and any(str(c).strip() for c in table.rows[index])
        ):
            cells = table.rows[index]
            values = {role: (cells[i] if i < len(cells) else None) for role, i in layout.roles.items()}
            if mass_index is not None and isinstance(values.get("molar_mass"), str):
                values["molar_mass"] = ungrouped_number(values["molar_mass"], table.decimal_comma)
            others = [c for i, c in enumerate(cells) if i not in role_columns] if degraded else None
            line_result = _fill_from_roles(values, options, report, table.decimal_comma, others)
            shown = []
            for column, value in zip(options.columns, line_result.values):
                if value is None:
                    shown.append("")
                elif isinstance(value, int | float) and not isinstance(value, bool):
                    shown.append(_csv_number(float(value), column.kind, table.decimal_comma))
                else:
                    shown.append(defuse(str(value)))
            pad = max(width - len(cells), 0)
            suffix = table.delimiter * (pad + 1) + encode_cells(shown)
        out_parts.append(body + suffix + ending)
    data = _encode_like(raw, "".join(out_parts), encoding)
    replace_atomically(dst, lambda tmp: tmp.write_bytes(data))
    report.output = str(dst)
    return report
