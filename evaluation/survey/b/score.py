import json
from pathlib import Path

from cellchem.adapters.files.audit import AuditRun, Options, audit_file
from cellchem.adapters.files.survey import survey

HERE = Path(__file__).parent
key = json.loads((HERE / "key.json").read_text())
SDS_CHECKS = {"ec", "un", "hazard-statements", "precautionary-statements", "signal-word", "pictograms"}
run = AuditRun()
audit_file(HERE / "sds.xlsx", Options(), run)
print("roles:", [(s.sheet, sorted(s.roles)) for fr in run.files for s in fr.sheets])
found = {}
for r in run.findings:
    if r.check in SDS_CHECKS:
        found.setdefault(r.row, []).append(r)
right = other = missed = 0
for p in key["sds"]["planted_errors"]:
    hits = found.get(p["row"], [])
    ok = [
        h
        for h in hits
        if h.column == p["column"]
        and (h.severity == p["expected_severity"] or h.severity in p["also_acceptable"])
    ]
    if ok:
        right += 1
    elif hits:
        other += 1
        print(
            "  other cell/severity:",
            p["row"],
            p["column"],
            p["kind"],
            [(h.column, h.severity, h.message[:100]) for h in hits],
        )
    else:
        missed += 1
        print("  MISSED:", p["row"], p["column"], p["kind"], p.get("note", "")[:80])
false = 0
for c in key["sds"]["correct_lines"]:
    hits = [h for h in found.get(c["row"], []) if h.severity in ("error", "warning")]
    if hits:
        false += 1
        print("  FALSE:", c["row"], c["product"], [(h.column, h.severity, h.message[:110]) for h in hits])
print(
    f"SDS: planted {len(key['sds']['planted_errors'])}: right {right},"
    f" other cell/severity {other}, missed {missed};"
    f" correct lines {len(key['sds']['correct_lines'])}: with error/warning {false}"
)
all_other = [r for r in run.findings if r.check not in SDS_CHECKS and r.severity == "error"]
print("identity errors on the SDS file:", [(r.row, r.column, r.check, r.message[:80]) for r in all_other])

st = key["store"]
s = survey([HERE / "store.xlsx"], Options())
print("store roles:", [(sh.sheet, sorted(sh.roles)) for fr in s.run.files for sh in fr.sheets])
pairs = set()
for c in s.conflicts:
    for a in c.lines_a:
        for b in c.lines_b:
            pairs.add((a.sheet, c.location.strip().casefold(), frozenset((a.row, b.row))))
exp = {(p["sheet"], p["location"].casefold(), frozenset(p["rows"])) for p in st["incompatible_pairs"]}
print(f"pairs expected {len(exp)}: found {len(exp & pairs)}")
for e in exp - pairs:
    print("  MISSED pair", e)
quiet = {(q["sheet"], q["location"].casefold()) for q in st["no_conflict_locations"]}
for c in s.conflicts:
    sheet = c.lines_a[0].sheet
    if (sheet, c.location.strip().casefold()) in quiet:
        print(
            "  FALSE conflict at a quiet location:",
            c.location,
            c.family_a,
            c.family_b,
            [ln.name for ln in c.lines_a],
            [ln.name for ln in c.lines_b],
        )
    elif not any(
        (sheet, c.location.strip().casefold(), frozenset((a.row, b.row))) in exp
        for a in c.lines_a
        for b in c.lines_b
    ):
        print(
            "  reported, not in key:",
            c.location,
            c.family_a,
            c.family_b,
            [ln.name for ln in c.lines_a],
            [ln.name for ln in c.lines_b],
        )
dups = {(d.lines[0].sheet, frozenset(ln.row for ln in d.lines)) for d in s.duplicates}
exp_d = {(d["sheet"], frozenset(d["rows"])) for d in st["duplicates"]}
print("duplicates expected", len(exp_d), "found", len(exp_d & dups), "extra", dups - exp_d)
refused = [(ln.sheet, ln.row, why[:80]) for t in s.totals for ln, why in t.refused]
print("refused packs/lines:", refused, "expected:", [(u["sheet"], u["row"]) for u in st["unreadable_pack"]])
et = st["element_totals"]
for c in s.concern:
    if c.part in ("Hg", "Pb", "Cd", "Cr(VI)"):
        want = et["CrVI" if c.part == "Cr(VI)" else c.part]["total_g"]
        print(
            f"  {c.part}: {c.mass_g:.2f} g (key {want});"
            f" unweighed {[(ln.row, w[:50]) for ln, w in c.unweighed]};"
            f" not counted {[(ln.row, w[:50]) for ln, w in c.not_counted]}"
        )
hcl = [t for t in s.totals if t.formula == "HCl"]
for t in hcl:
    print(
        "  HCl total:",
        t.strength,
        round(t.mass_g, 1),
        "g",
        round(t.volume_ml, 1),
        "mL",
        [(ln.sheet, ln.row) for ln in t.lines],
    )
print("  key HCl 37 %:", st["hydrochloric_acid_37"]["total_g"], "g at 1.18 g/mL")
