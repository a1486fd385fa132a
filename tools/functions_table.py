"""Print README's table of worksheet functions from the one function table.

    python tools/functions_table.py

Paste the output over the table in README's "Worksheet functions" section;
tests/test_worksheet_functions.py checks that every function is listed there
under its Excel and its Calc/classic name.
"""

from cellchem.adapters.sheets.functions import FUNCTIONS, spelled


def rows() -> list[str]:
    out = [
        "| Excel (xlwings Lite) | Calc, classic xlwings | what, and its arguments | result | example |",
        "| --- | --- | --- | --- | --- |",
    ]
    for name, spec in FUNCTIONS.items():
        args = ", ".join(f"[{a.name}]" if a.optional else a.name for a in spec.arguments)
        what = spec.summary + " " + "; ".join(f"`{a.name}`: {a.description}" for a in spec.arguments)
        example = f"`{spec.example}`"
        for sep in (" gives ", " spills "):
            if sep in spec.example:
                formula, rest = spec.example.split(sep, 1)
                example = f"`{formula}`{sep}{rest}"
                break
        out.append(
            f"| `{spelled(name)}({args})` | `{spelled(name, 'calc')}` | {what} | {spec.result} | {example} |"
        )
    return out


if __name__ == "__main__":
    print("\n".join(rows()))
