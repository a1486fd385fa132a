"""Score `cellchem audit` on the stock-list workbooks with planted errors.

    python evaluation/workbooks/score_workbooks.py            # all files in evaluation/workbooks/files/
    python evaluation/workbooks/score_workbooks.py --show     # also list misses, false errors, wrong fixes
    python evaluation/workbooks/score_workbooks.py --reports /tmp/reports   # keep the JSON reports
    python evaluation/workbooks/score_workbooks.py --from-reports /tmp/reports  # score saved reports

For each workbook or CSV export it runs `cellchem audit FILE --report OUT.json` and compares the findings
with FILE.truth.csv (one planted error per line) and FILE.clean.csv (the lines without one). Rows are the
1-based sheet rows (the line number in a CSV), as the report gives them.

- recall: planted errors with a finding of severity "error" on the planted cell's column;
- wrong cell: planted lines with an error on another column (whether or not the planted cell was found);
- right fix / choice / wrong fix / no fix: of the recalled errors, those whose error finding on the planted
  column suggests the original value, offers several values one of which is the original ("write one of:
  ..."), suggests something else, or suggests nothing. Formulas are compared by
  element counts, molar masses within the printed rounding plus 0.01 g/mol, CAS RNs as text, and names
  by their words (case, "sulph"/"sulf", grade and form words, "5-hydrate"/"pentahydrate" set aside)
  against every catalogue name of the substance in stock_substances.py; --show lists every "wrong fix"
  so that a person can check the name matches;
- false-error rate: clean lines with any finding of severity "error", divided by the clean lines;
- errors on other rows: error findings on rows that are not data lines (titles, headers, blank rows).

Only the standard library is needed; cellchem must be on PATH (or given with --cellchem).
"""

from __future__ import annotations

import argparse
import csv
import json
import re
import shlex
import subprocess
import sys
import tempfile
from collections import Counter, defaultdict
from dataclasses import dataclass, field
from pathlib import Path

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE))
from stock_substances import load as load_substances  # noqa: E402

# ---------------------------------------------------------------------------------------------------------
# Comparing a suggestion with the original value
# ---------------------------------------------------------------------------------------------------------

_TOKEN = re.compile(r"([A-Z][a-z]?|\(|\)|\d+)")


def element_counts(formula: str) -> Counter[str] | None:
    """Element counts of a formula such as "Cu(CH3COO)2 · H2O"; None when it does not read."""
    total: Counter[str] = Counter()
    for part in re.split(r"\s*[·.*]\s*", formula.strip()):
        m = re.match(r"^(\d*)\s*(.+)$", part)
        if not m:
            return None
        mult = int(m.group(1) or 1)
        body = m.group(2).replace(" ", "")
        if not re.fullmatch(r"[A-Za-z0-9()]+", body):
            return None
        stack: list[Counter[str]] = [Counter()]
        pos = 0
        tokens = _TOKEN.findall(body)
        if "".join(tokens) != body:
            return None
        while pos < len(tokens):
            t = tokens[pos]
            pos += 1
            n = 1
            if pos < len(tokens) and tokens[pos].isdigit():
                n = int(tokens[pos])
                pos += 1
            if t == "(":
                stack.append(Counter())
                if n != 1:
                    return None
            elif t == ")":
                if len(stack) == 1:
                    return None
                inner = stack.pop()
                for k, v in inner.items():
                    stack[-1][k] += v * n
            elif t.isdigit():
                return None
            else:
                stack[-1][t] += n
        if len(stack) != 1:
            return None
        for k, v in stack[0].items():
            total[k] += v * mult
    return total


GRADE_WORDS = {
    "ar", "gpr", "lr", "acs", "reagent", "grade", "extra", "pure", "for", "analysis", "laboratory",
    "anhydrous", "crystals", "crystalline", "powder", "granular", "granules", "granulated", "pellets",
    "flakes", "lumps", "light", "fused", "dried", "primary", "standard", "indicator", "hplc", "molecular",
    "biology", "ph", "eur", "reag", "free", "acid", "the", "of", "solution", "concentrated",
}  # fmt: skip
HYDRATE_WORDS = {
    "1": "monohydrate", "2": "dihydrate", "3": "trihydrate", "4": "tetrahydrate", "5": "pentahydrate",
    "6": "hexahydrate", "7": "heptahydrate", "8": "octahydrate", "9": "nonahydrate", "10": "decahydrate",
    "12": "dodecahydrate", "18": "octadecahydrate",
}  # fmt: skip


def name_words(name: str) -> frozenset[str]:
    t = name.lower()
    t = t.replace("sulph", "sulf").replace("aluminium", "aluminum").replace("caesium", "cesium")
    t = re.sub(r"(\d+)-(hydrate|water)", lambda m: " " + HYDRATE_WORDS.get(m.group(1), m.group(0)), t)
    t = re.sub(r"^(di|tri)-", r"\1", t)
    t = re.sub(r"hydrogen\s+(?=[a-z])", "hydrogen", t)  # "hydrogen carbonate" = "hydrogencarbonate"
    t = t.replace("orthophosphate", "phosphate")
    # "disodium hydrogenphosphate" = "sodium hydrogenphosphate": the cation's count is not part of the match
    t = re.sub(r"\b(?:di|tri|tetra)(sodium|potassium|ammonium|lithium)\b", r"\1", t)
    t = re.sub(r"[^a-z0-9()]+", " ", t)
    words = [w for w in t.split() if w not in GRADE_WORDS and not re.fullmatch(r"\d+", w)]
    return frozenset(words)


@dataclass
class Fixer:
    names_of: dict[str, list[str]]

    def judge(self, role: str, original: str, suggestion: str, substance: str) -> str:
        """'right', 'choice' (several values offered, the original among them), 'wrong' or 'none'."""
        s = suggestion.strip()
        if not s:
            return "none"
        m = re.match(r"(?i)^write one of:\s*(.+)$", s)
        if m:
            options = [o.strip() for o in m.group(1).split(",") if o.strip()]
            hits = [o for o in options if self.same(role, original, o, substance)]
            if hits:
                return "right" if len(options) == 1 else "choice"
            return "wrong"
        return "right" if self.same(role, original, s, substance) else "wrong"

    def same(self, role: str, original: str, s: str, substance: str) -> bool:
        if role == "cas":
            return re.sub(r"\s", "", s) == original.strip()
        if role == "formula":
            a, b = element_counts(original), element_counts(s)
            return a is not None and a == b
        if role == "molar_mass":
            m = re.search(r"\d+(?:[.,]\d+)?", s)
            if not m:
                return False
            value = float(m.group(0).replace(",", "."))
            decimals = len(original.split(".")[1]) if "." in original else 0
            # the printed rounding, and editions of the atomic-weight table (0.02 g/mol or 0.01 %)
            allowance = 0.5 * 10**-decimals + max(0.02, 1e-4 * float(original))
            return abs(value - float(original)) <= allowance + 1e-9
        if role == "name":
            target = name_words(s)
            candidates = [original] + self.names_of.get(substance, [])
            return any(target == name_words(c) for c in candidates)
        return False


# ---------------------------------------------------------------------------------------------------------
# Scoring
# ---------------------------------------------------------------------------------------------------------


@dataclass
class Planted:
    file: str
    sheet: str
    row: int
    kind: str
    column: str
    role: str
    original: str
    planted: str
    detail: str
    substance: str


@dataclass
class Tally:
    planted: int = 0
    hit: int = 0
    wrong_cell_also: int = 0
    wrong_cell_only: int = 0
    softer: int = 0  # missed, but a warning or note on the planted column
    right_fix: int = 0
    choice_fix: int = 0
    wrong_fix: int = 0
    no_fix: int = 0
    clean: int = 0
    false_lines: int = 0
    other_row_errors: int = 0
    unusable: int = 0

    def add(self, other: Tally) -> None:
        for k in self.__dataclass_fields__:
            setattr(self, k, getattr(self, k) + getattr(other, k))


@dataclass
class Result:
    tally: Tally = field(default_factory=Tally)
    by_kind: dict[str, Tally] = field(default_factory=lambda: defaultdict(Tally))
    by_detail: dict[tuple[str, str], Tally] = field(default_factory=lambda: defaultdict(Tally))
    missed: list[tuple[Planted, list[dict]]] = field(default_factory=list)
    wrong_cell: list[tuple[Planted, list[dict]]] = field(default_factory=list)
    wrong_fixes: list[tuple[Planted, dict]] = field(default_factory=list)
    false_errors: list[tuple[tuple[str, str, int], list[dict]]] = field(default_factory=list)
    other_rows: list[dict] = field(default_factory=list)
    notes: list[str] = field(default_factory=list)


def detail_class(p: Planted) -> str:
    """A short sub-kind for the per-kind table."""
    d = p.detail
    if p.kind == "c":
        return "passes check digit" if "passes" in d else "fails check digit"
    if p.kind == "h":
        return {"formula": "H count", "molar_mass": "neighbour's M", "cas": "another organic's CAS"}[p.role]
    if p.kind == "d":
        if d.startswith("element case"):
            return "element case"
        return "count changed" if d.startswith("count") else "digit dropped"
    if p.kind == "f":
        return "digits swapped" if "swapped" in d else "other hydrate's M"
    if p.kind == "a":
        return "hydrate CAS on anhydrous" if d.startswith("hydrate") else "anhydrous CAS on hydrate"
    return ""


KIND_TITLES = {
    "a": "CAS RN of the hydrate/anhydrous partner",
    "b": "CAS RN of the row above",
    "c": "CAS RN digits transposed",
    "d": "formula typo (inorganic)",
    "e": "anhydrous formula on a hydrate line",
    "f": "molar mass digits swapped / other hydrate",
    "g": "name of another compound",
    "h": "organic line: H count, neighbour's M, other CAS",
}


def read_truth(path: Path) -> tuple[list[Planted], list[tuple[str, str, int]]]:
    planted: list[Planted] = []
    with open(path.with_name(path.name + ".truth.csv"), newline="", encoding="utf-8") as fh:
        for r in csv.DictReader(fh):
            planted.append(
                Planted(
                    r["file"], r["sheet"], int(r["row"]), r["kind"],
                    r["planted_cell_column"], r["planted_role"],
                    r["original_value"], r["planted_value"], r.get("detail", ""), r.get("substance", ""),
                )
            )  # fmt: skip
    clean: list[tuple[str, str, int]] = []
    with open(path.with_name(path.name + ".clean.csv"), newline="", encoding="utf-8") as fh:
        for r in csv.DictReader(fh):
            clean.append((r["file"], r["sheet"], int(r["row"])))
    return planted, clean


def run_audit(cellchem: list[str], path: Path, report: Path) -> tuple[int, str]:
    proc = subprocess.run(
        [*cellchem, "audit", str(path), "--report", str(report), "--show", "0"],
        capture_output=True,
        text=True,
        check=False,
    )
    return proc.returncode, proc.stdout + proc.stderr


def score_file(path: Path, findings: list[dict], fixer: Fixer, result: Result) -> Tally:
    planted, clean = read_truth(path)
    is_csv = path.suffix.lower() in (".csv", ".txt")
    by_row: dict[tuple[str, int], list[dict]] = defaultdict(list)
    for f in findings:
        sheet = "" if is_csv else (f.get("sheet") or "")
        by_row[(sheet, int(f["row"]))].append(f)
    t = Tally()
    listed: set[tuple[str, int]] = set()
    for p in planted:
        key = (p.sheet, p.row)
        listed.add(key)
        row_findings = by_row.get(key, [])
        errors = [f for f in row_findings if f["severity"] == "error"]
        on_cell = [f for f in errors if f["column"] == p.column]
        elsewhere = [f for f in errors if f["column"] != p.column]
        kt = result.by_kind[p.kind]
        dt = result.by_detail[(p.kind, detail_class(p))]
        for x in (t, kt, dt):
            x.planted += 1
        if on_cell:
            for x in (t, kt, dt):
                x.hit += 1
            verdicts = [
                fixer.judge(p.role, p.original, f.get("suggestion") or "", p.substance) for f in on_cell
            ]
            best = next(v for v in ("right", "choice", "wrong", "none") if v in verdicts)
            for x in (t, kt, dt):
                if best == "right":
                    x.right_fix += 1
                elif best == "choice":
                    x.choice_fix += 1
                elif best == "wrong":
                    x.wrong_fix += 1
                else:
                    x.no_fix += 1
            if best == "wrong":
                result.wrong_fixes.append((p, on_cell[verdicts.index("wrong")]))
        else:
            soft = [f for f in row_findings if f["column"] == p.column]
            if soft:
                for x in (t, kt, dt):
                    x.softer += 1
            result.missed.append((p, row_findings))
        if elsewhere:
            for x in (t, kt, dt):
                if on_cell:
                    x.wrong_cell_also += 1
                else:
                    x.wrong_cell_only += 1
            result.wrong_cell.append((p, elsewhere))
    for key3 in clean:
        key = (key3[1], key3[2])
        listed.add(key)
        t.clean += 1
        errors = [f for f in by_row.get(key, []) if f["severity"] == "error"]
        if errors:
            t.false_lines += 1
            result.false_errors.append((key3, errors))
    for key, fs in by_row.items():
        if key in listed:
            continue
        errs = [f for f in fs if f["severity"] == "error"]
        t.other_row_errors += len(errs)
        result.other_rows.extend(errs)
    return t


def pct(a: int, b: int) -> str:
    return f"{100 * a / b:5.1f} %" if b else "    - "


def print_table(rows: list[tuple[str, Tally]], first: str) -> None:
    head = (
        f"{first:<46} {'planted':>7} {'hit':>4} {'recall':>8} {'wrong cell':>10} {'right fix':>9} "
        f"{'choice':>6} "
        f"{'wrong fix':>9} {'no fix':>6} {'clean':>6} {'false err':>9} {'false rate':>10} {'other rows':>10}"
    )
    print(head)
    print("-" * len(head))
    for label, t in rows:
        print(
            f"{label:<46} {t.planted:>7} {t.hit:>4} {pct(t.hit, t.planted):>8} "
            f"{t.wrong_cell_also + t.wrong_cell_only:>10} {t.right_fix:>9} {t.choice_fix:>6} "
            f"{t.wrong_fix:>9} {t.no_fix:>6} {t.clean:>6} {t.false_lines:>9} "
            f"{pct(t.false_lines, t.clean):>10} {t.other_row_errors:>10}"
        )


def print_kinds(result: Result) -> None:
    head = (
        f"{'kind':<58} {'planted':>7} {'hit':>4} {'recall':>8} {'right fix':>9} {'choice':>6} "
        f"{'wrong fix':>9} "
        f"{'no fix':>6} {'wrong cell':>10}"
    )
    print(head)
    print("-" * len(head))

    def line(label: str, t: Tally) -> None:
        cells = t.wrong_cell_also + t.wrong_cell_only
        print(
            f"{label:<58} {t.planted:>7} {t.hit:>4} {pct(t.hit, t.planted):>8} {t.right_fix:>9} "
            f"{t.choice_fix:>6} "
            f"{t.wrong_fix:>9} {t.no_fix:>6} {cells:>10}"
        )

    for kind in sorted(result.by_kind):
        line(f"({kind}) {KIND_TITLES.get(kind, '')}", result.by_kind[kind])
        for (k, d), dt in sorted(result.by_detail.items()):
            if k == kind and d:
                line("    " + d, dt)


def fmt_finding(f: dict) -> str:
    sug = f" -> {f['suggestion']}" if f.get("suggestion") else ""
    return f"{f['column']} {f['severity']} {f['check']}: {f['message']}{sug}"


def show(result: Result) -> None:
    def where(p: Planted) -> str:
        sheet = f" [{p.sheet}]" if p.sheet else ""
        return f"{p.file}{sheet} row {p.row} {p.column}"

    print(f"\nMISSED planted errors ({len(result.missed)}):")
    for p, fs in result.missed:
        print(f"  ({p.kind}) {where(p)} {p.role}: {p.original!r} -> {p.planted!r}  [{p.detail}]")
        for f in fs:
            if f["severity"] != "note" or f["column"] == p.column:
                print(f"        {fmt_finding(f)}")
    print(f"\nPLANTED LINES WITH AN ERROR ON ANOTHER CELL ({len(result.wrong_cell)}):")
    for p, fs in result.wrong_cell:
        print(f"  ({p.kind}) {where(p)} {p.role}: {p.original!r} -> {p.planted!r}")
        for f in fs:
            print(f"        {fmt_finding(f)}")
    print(f"\nWRONG FIXES ({len(result.wrong_fixes)}) (names are matched by words: check these by eye):")
    for p, f in result.wrong_fixes:
        print(f"  ({p.kind}) {where(p)} original {p.original!r}, suggested {f['suggestion']!r}")
    print(f"\nFALSE ERRORS on clean lines ({len(result.false_errors)} lines):")
    for (file, sheet, row), fs in result.false_errors:
        s = f" [{sheet}]" if sheet else ""
        print(f"  {file}{s} row {row}")
        for f in fs:
            print(f"        {fmt_finding(f)}")
    if result.other_rows:
        print(f"\nERRORS ON ROWS THAT ARE NOT DATA LINES ({len(result.other_rows)}):")
        for f in result.other_rows:
            print(f"  {f['file']} [{f.get('sheet', '')}] row {f['row']}: {fmt_finding(f)}")


def main() -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument(
        "--files", type=Path, default=HERE / "files", help="folder of the workbooks and truth files"
    )
    ap.add_argument("--cellchem", default="cellchem", help="the command to run (default: cellchem on PATH)")
    ap.add_argument("--reports", type=Path, help="keep the JSON reports in this folder")
    ap.add_argument(
        "--from-reports", type=Path, help="score the JSON reports saved in this folder; run nothing"
    )
    ap.add_argument(
        "--show", action="store_true", help="list missed errors, wrong cells, wrong fixes, false errors"
    )
    args = ap.parse_args()

    data = sorted(
        p
        for p in args.files.iterdir()
        if p.suffix.lower() in (".xlsx", ".csv") and not p.name.endswith((".truth.csv", ".clean.csv"))
    )
    if not data:
        print(f"no workbooks in {args.files}", file=sys.stderr)
        return 2
    subs = load_substances()
    fixer = Fixer({s.key: list(s.names) for s in subs})
    result = Result()
    rows: list[tuple[str, Tally]] = []
    cellchem = shlex.split(args.cellchem)
    tmp = tempfile.TemporaryDirectory()
    out_dir = args.from_reports or args.reports or Path(tmp.name)
    out_dir.mkdir(parents=True, exist_ok=True)
    for path in data:
        report = out_dir / f"{path.name}.json"
        if not args.from_reports:
            if report.exists():
                report.unlink()
            try:
                code, output = run_audit(cellchem, path, report)
            except FileNotFoundError:
                print(
                    f"cannot run {args.cellchem!r}: put cellchem on PATH or give --cellchem", file=sys.stderr
                )
                return 2
            if code not in (0, 1):
                result.notes.append(
                    f"{path.name}: cellchem exited {code}: {output.strip().splitlines()[-1:]}"
                )
        findings = json.loads(report.read_text(encoding="utf-8")) if report.exists() else []
        t = score_file(path, findings, fixer, result)
        if not report.exists():
            t.unusable += 1
            result.notes.append(f"{path.name}: no report written; every planted error counts as missed")
        rows.append((path.name, t))
        result.tally.add(t)
    rows.append(("TOTAL", result.tally))
    print_table(rows, "file")
    print()
    print_kinds(result)
    t = result.tally
    print(
        f"\nrecall {pct(t.hit, t.planted).strip()} ({t.hit}/{t.planted}); "
        f"planted lines with an error on another cell {t.wrong_cell_also + t.wrong_cell_only} "
        f"({t.wrong_cell_only} with no error on the planted cell); "
        f"missed but flagged as warning/note on the planted cell {t.softer}"
    )
    print(
        f"fixes among the {t.hit} recalled: right {t.right_fix}, a choice that includes the right value "
        f"{t.choice_fix}, wrong {t.wrong_fix}, none {t.no_fix}; "
        f"false-error rate {pct(t.false_lines, t.clean).strip()} ({t.false_lines}/{t.clean} clean lines)"
    )
    for n in result.notes:
        print("note:", n)
    if args.show:
        show(result)
    tmp.cleanup()
    return 0


if __name__ == "__main__":
    sys.exit(main())
