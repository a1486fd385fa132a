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
MAX_COLUMNS = 256  # columns read from one sheet; columns beyond are not read (the summary says so)
# a used range declaring more cells than this many per byte of its sheet part, and more than
# ABSURD_MIN_CELLS in all, is refused as absurd for the file's size
ABSURD_CELLS_PER_BYTE = 100
ABSURD_MIN_CELLS = 10_000_000


def one_line(exc: object, limit: int = 300) -> str:
    """An exception's text on one line (a library's message may span several),
    cut to ``limit`` characters."""
    text = " ".join(str(exc).split())
    return text if len(text) <= limit else text[: limit - 3] + "..."
