"""Formula cells whose value cannot be read, found in a sheet part's bytes
(cellchem.adapters.files.workbook.unsaved_formula_cells). The XML is written here as
the OOXML standard (ECMA-376 Part 1, 18.3.1.4 c, 18.3.1.40 f, 18.3.1.96 v;
from memory) lays a cell out; which cells lack a value is known from how each
was written, not from cellchem."""

from __future__ import annotations

from itertools import pairwise

from hypothesis import given, settings
from hypothesis import strategies as st

from cellchem.adapters.files.workbook import unsaved_formula_cells
from cellchem.columns import column_letter

# (kind, prefix): a plain value, a formula with a saved value, a formula with an empty <v>, a formula
# with no <v>, a shared formula's follower cell (no <v>)
KINDS = ("value", "saved", "empty", "none", "shared")


def _cell(ref: str, kind: str, p: str) -> bytes:
    body = {
        "value": f"<{p}v>58.44</{p}v>",
        "saved": f"<{p}f>22.99+35.45</{p}f><{p}v>58.44</{p}v>",
        "empty": f"<{p}f>22.99+35.45</{p}f><{p}v></{p}v>",
        "none": f"<{p}f>22.99+35.45</{p}f>",
        "shared": f'<{p}f t="shared" si="0"/>',
    }[kind]
    return f'<{p}c r="{ref}" s="1">{body}</{p}c>'.encode()


def _sheet(rows: list[list[str]], prefix: str) -> bytes:
    p = f"{prefix}:" if prefix else ""
    ns = f' xmlns:{prefix}="urn:main"' if prefix else ' xmlns="urn:main"'
    out = [f"<{p}worksheet{ns}><{p}sheetData>".encode()]
    for r, kinds in enumerate(rows, 1):
        out.append(f'<{p}row r="{r}">'.encode())
        out.extend(_cell(f"{column_letter(c)}{r}", k, p) for c, k in enumerate(kinds))
        out.append(f"</{p}row>".encode())
    out.append(f"</{p}sheetData></{p}worksheet>".encode())
    return b"".join(out)


@settings(max_examples=150, deadline=None)
@given(
    rows=st.lists(st.lists(st.sampled_from(KINDS), min_size=1, max_size=6), min_size=1, max_size=30),
    prefix=st.sampled_from(["", "x"]),
    recalculate=st.booleans(),
    cuts=st.lists(st.integers(min_value=1, max_value=4000), max_size=8),
)
def test_unsaved_cells_are_found_however_the_part_is_read_in_chunks(rows, prefix, recalculate, cuts):
    data = _sheet(rows, prefix)
    points = sorted({c % len(data) for c in cuts} | {0, len(data)})
    chunks = [data[a:b] for a, b in pairwise(points) if b > a]
    found = unsaved_formula_cells(iter(chunks), recalculate)
    expected = {}
    for r, kinds in enumerate(rows, 1):
        for c, kind in enumerate(kinds):
            if kind in ("empty", "none", "shared") or (kind == "saved" and recalculate):
                expected.setdefault(r, {})[c] = kind == "saved"
    assert {r: {c: v.recalculate for c, v in cells.items()} for r, cells in found.items()} == expected
