"""Drive a running LibreOffice (headless) over UNO for tests/test_calc.py.

Run with a Python that has LibreOffice's ``uno`` module (Debian:
python3-uno, /usr/bin/python3). Reads a JSON job on stdin:
``{"pipe": NAME, "open": PATH}`` loads a workbook, or ``{"pipe": NAME,
"cells": [[ref, value], ...], "arrays": [[range, formula], ...]}`` fills a
new sheet (a value starting with "=" is a formula, set in Calc's English
API grammar); then recalculates everything and prints, as JSON, every
non-empty cell of the first sheet as ref -> [kind, value] (kind: value,
text, error, formula-text), plus the function wizard's descriptions of the
cellchem functions.
"""

import json
import sys
import time

import uno
from com.sun.star.beans import PropertyValue


def connect(pipe):
    local = uno.getComponentContext()
    resolver = local.ServiceManager.createInstanceWithContext("com.sun.star.bridge.UnoUrlResolver", local)
    deadline = time.time() + 60
    while True:
        try:
            return resolver.resolve(f"uno:pipe,name={pipe};urp;StarOffice.ComponentContext")
        except Exception:
            if time.time() > deadline:
                raise
            time.sleep(0.3)


def prop(name, value):
    p = PropertyValue()
    p.Name, p.Value = name, value
    return p


def col_letter(c):
    s = ""
    c += 1
    while c:
        c, r = divmod(c - 1, 26)
        s = chr(65 + r) + s
    return s


def main():
    job = json.load(sys.stdin)
    ctx = connect(job["pipe"])
    smgr = ctx.ServiceManager
    desktop = smgr.createInstanceWithContext("com.sun.star.frame.Desktop", ctx)
    if "open" in job:
        url = uno.systemPathToFileUrl(job["open"])
        doc = desktop.loadComponentFromURL(url, "_blank", 0, (prop("Hidden", True), prop("ReadOnly", True)))
        if doc is None:
            raise SystemExit(f"LibreOffice did not open {job['open']}")
    else:
        doc = desktop.loadComponentFromURL("private:factory/scalc", "_blank", 0, (prop("Hidden", True),))
    try:
        sheet = doc.Sheets.getByIndex(0)
        for ref, value in job.get("cells", []):
            cell = sheet.getCellRangeByName(ref)
            if isinstance(value, str) and value.startswith("="):
                cell.setFormula(value)
            elif isinstance(value, str):
                cell.setString(value)
            else:
                cell.setValue(value)
        for ref, formula in job.get("arrays", []):
            sheet.getCellRangeByName(ref).setArrayFormula(formula)
        doc.calculateAll()
        cursor = sheet.createCursor()
        cursor.gotoEndOfUsedArea(False)
        last_row, last_col = cursor.RangeAddress.EndRow, cursor.RangeAddress.EndColumn
        out = {}
        for r in range(last_row + 1):
            for c in range(last_col + 1):
                cell = sheet.getCellByPosition(c, r)
                ref = f"{col_letter(c)}{r + 1}"
                kind = cell.Type.value  # EMPTY, VALUE, TEXT or FORMULA
                if kind == "EMPTY":
                    continue
                if kind == "FORMULA":
                    t = cell.FormulaResultType2  # 1 value, 2 text, 4 error
                    if cell.getError():
                        out[ref] = ["error", cell.getString(), cell.getFormula(), cell.getError()]
                    elif t == 1:
                        out[ref] = ["value", cell.getValue(), cell.getFormula()]
                    else:
                        out[ref] = ["text", cell.getString(), cell.getFormula()]
                elif kind == "VALUE":
                    out[ref] = ["value", cell.getValue(), None]
                else:
                    out[ref] = ["text", cell.getString(), None]
        wizard = {}
        descriptions = smgr.createInstanceWithContext("com.sun.star.sheet.FunctionDescriptions", ctx)
        for i in range(descriptions.getCount()):
            d = {p.Name: p.Value for p in descriptions.getByIndex(i)}
            if str(d.get("Name", "")).startswith("CELLCHEM_"):
                wizard[d["Name"]] = {
                    "description": d.get("Description"),
                    "arguments": [[a.Name, a.Description, a.IsOptional] for a in d.get("Arguments", ())],
                }
        json.dump({"cells": out, "wizard": wizard}, sys.stdout)
    finally:
        doc.close(True)


if __name__ == "__main__":
    main()
