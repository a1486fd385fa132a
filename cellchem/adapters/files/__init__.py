"""What the file adapters share: the error for a file that cannot be used,
and the documented limits that bound what cellchem reads from a file it did
not make (supplier files are untrusted)."""

from __future__ import annotations

from ...errors import OutputError, UnusableFile

__all__ = ["OutputError", "UnusableFile", "one_line"]

# Limits (documented in README, "Untrusted files")
MAX_PART_BYTES = 1 << 30  # declared uncompressed size of one part of a workbook package: 1 GiB
MAX_PACKAGE_BYTES = 2 << 30  # declared uncompressed size of all parts together: 2 GiB
MAX_MEMBERS = 10_000  # parts in one package
MAX_TEXT_BYTES = 1 << 30  # a CSV or text export: 1 GiB
MAX_ROWS = 1_048_576  # rows read from one sheet (the spreadsheet limit)
MAX_SHEET_COLUMNS = 16_384  # the last column of a spreadsheet program (XFD), for columns fill adds
MAX_COLUMNS = 256  # columns read from one sheet; columns beyond are not read (the summary says so)
# a used range declaring more cells than this many per byte of its sheet part, and more than
# ABSURD_MIN_CELLS in all, is refused as absurd for the file's size
ABSURD_CELLS_PER_BYTE = 100
ABSURD_MIN_CELLS = 10_000_000
# a part declaring more than MAX_RATIO_FROM_BYTES uncompressed that inflates more than
# MAX_INFLATION_RATIO to 1 is refused as a zip bomb: sheets of data compress about 5 to 20 to 1,
# and sheets of formatted empty cells or rows, whose references differ from cell to cell, up to
# about 25 to 1 (measured with zlib at levels 1, 6 and 9)
MAX_RATIO_FROM_BYTES = 32 << 20
MAX_INFLATION_RATIO = 64
MAX_CELL_CHARS = 32_767  # the longest text a spreadsheet cell holds; a longer text is cut while it is read


def one_line(exc: object, limit: int = 300) -> str:
    """An exception's text on one line (a library's message may span several),
    cut to ``limit`` characters."""
    text = " ".join(str(exc).split())
    return text if len(text) <= limit else text[: limit - 3] + "..."


# stands, in a row whose columns read are empty, for the content of the columns not read (so that
# a row holding only a quantity is not a blank row)
OTHER_CELLS = "(a cell of a column not read)"
