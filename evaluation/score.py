"""Score cellchem on an evaluation folder: how many inputs it answers right, refuses, or
answers wrong (the rules are in evaluation/README.md).

    python evaluation/score.py evaluation/dev              # rates per file and class
    python evaluation/score.py evaluation/dev --show wrong # and every wrong row

Run it on ``heldout`` only to measure, never to look for rows to fix.
"""

from __future__ import annotations

import argparse
import csv
import sys
from collections import Counter, defaultdict
from pathlib import Path

from cellchem import CellchemError, charge_balance, formula_from_name, molar_mass, parse_formula
from cellchem.audit import ERROR, check_line
from cellchem.charge import ORGANIC, RADICAL, UNBALANCED

RIGHT, REFUSED, WRONG = "right", "refused", "wrong"


def rows(path: Path) -> list[dict[str, str]]:
    with path.open(encoding="utf-8", newline="") as fh:
        return list(csv.DictReader(line for line in fh if not line.startswith("#")))


def _same(got: str, expected: str) -> bool:
    a, b = parse_formula(got), parse_formula(expected)
    return a.counts == b.counts and a.water == b.water and a.charge == b.charge


def _salt_part(text: str) -> dict:
    return dict(parse_formula(text).anhydrous().counts)


def score_name(row: dict[str, str]) -> tuple[str, str]:
    expected = row["expected"].strip()
    try:
        got = formula_from_name(row["input"])
    except CellchemError as exc:
        return (RIGHT if expected in ("AMBIGUOUS", "NONE") else REFUSED), str(exc)
    except Exception as exc:  # a crash is a wrong answer
        return WRONG, f"crash: {type(exc).__name__}: {exc}"
    if expected in ("AMBIGUOUS", "NONE"):
        return WRONG, f"answered {got} for a name marked {expected}"
    if "xH2O" in expected or "nH2O" in expected:
        ok = _salt_part(got) == _salt_part(expected) and parse_formula(got).water is None
        return (RIGHT if ok else WRONG), got
    return (RIGHT if _same(got, expected) else WRONG), got


def score_formula(row: dict[str, str]) -> tuple[str, str]:
    expected = row["expected"].strip()
    try:
        f = parse_formula(row["input"])
        balance = charge_balance(f)
    except CellchemError as exc:
        return (RIGHT if expected == "WRONG" else WRONG), f"refused: {exc}"
    except Exception as exc:
        return WRONG, f"crash: {type(exc).__name__}: {exc}"
    if expected == "WRONG":
        if balance.kind in (UNBALANCED, RADICAL):
            return RIGHT, balance.explanation
        if balance.kind == ORGANIC:
            return REFUSED, balance.explanation
        return WRONG, f"accepted: {balance.explanation}"
    if balance.kind in (UNBALANCED, RADICAL):
        return WRONG, balance.explanation
    if row.get("molar_mass", "").strip():
        try:
            mass = float(molar_mass(f))
        except CellchemError as exc:
            return REFUSED, f"molar mass refused: {exc}"
        if abs(mass - float(row["molar_mass"])) > 0.05:
            return WRONG, f"molar mass {mass:.2f}, expected {row['molar_mass']}"
    return RIGHT, balance.kind


_FIELDS = {"name": "name", "formula": "formula", "molar_mass": "molar_mass", "cas": "cas"}


def score_line(row: dict[str, str]) -> tuple[str, str, bool]:
    """(verdict, detail, strict): strict is False when the expected cell got an error and
    another cell did too (right when only the expected cell is asked for)."""
    expected = row["expected"].strip()
    try:
        cells = (row["formula"], row["molar_mass"], row["name"], row["cas"])
        result = check_line(*(c or None for c in cells))
    except Exception as exc:
        return WRONG, f"crash: {type(exc).__name__}: {exc}", True
    errors = [f for f in result.findings if f.severity == ERROR]
    detail = "; ".join(f"{f.severity} {f.field}: {f.message}" for f in result.findings) or "no findings"
    if expected == "clean":
        return (WRONG if errors else RIGHT), detail, True
    field = _FIELDS[expected.split(":", 1)[1]]
    on_field = [f for f in errors if _field_of(f) == field]
    others = [f for f in errors if _field_of(f) != field]
    if on_field:
        return RIGHT, detail, not others
    if errors:
        return WRONG, detail, True
    unchecked = any("not checked" in f.message or "not read" in f.message for f in result.findings)
    return (REFUSED if unchecked else WRONG), detail, True


def _field_of(f) -> str:
    """The cell a finding says is wrong: a name that disagrees with the formula blames no
    cell of its own, so it counts for the name or the formula."""
    return f.field


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("folder", type=Path)
    ap.add_argument("--show", choices=("wrong", "refused", "all"), help="list rows with this verdict")
    args = ap.parse_args(argv)
    total_wrong = 0
    for name, scorer, key in (
        ("names.csv", score_name, "class"),
        ("formulas.csv", score_formula, "class"),
        ("lines.csv", score_line, "expected"),
    ):
        path = args.folder / name
        if not path.exists():
            continue
        counts: Counter = Counter()
        by_class: dict[str, Counter] = defaultdict(Counter)
        loose = 0
        shown = []
        for row in rows(path):
            out = scorer(row)
            verdict, detail = out[0], out[1]
            if len(out) == 3 and verdict == RIGHT and not out[2]:
                loose += 1
            counts[verdict] += 1
            by_class[row[key].split(":")[0] if key == "expected" else row[key]][verdict] += 1
            if args.show and (args.show == "all" or args.show == verdict):
                cells = (row.get("name"), row.get("formula"), row.get("molar_mass"), row.get("cas"))
                label = row.get("input") or " | ".join(str(c) for c in cells)
                shown.append(
                    f"  {verdict:7} [{row.get(key)}] {label!r} -> {detail}  (expected {row['expected']})"
                )
        n = sum(counts.values())
        total_wrong += counts[WRONG]
        print(f"{path}: {n} rows: right {counts[RIGHT]}, refused {counts[REFUSED]}, wrong {counts[WRONG]}")
        if loose:
            print(f"  of the right lines, {loose} also put an error on a second cell")
        for cls in sorted(by_class):
            c = by_class[cls]
            print(f"    {cls:22} right {c[RIGHT]:4}  refused {c[REFUSED]:4}  wrong {c[WRONG]:4}")
        for line in shown:
            print(line)
    return 1 if total_wrong else 0


if __name__ == "__main__":
    sys.exit(main())
