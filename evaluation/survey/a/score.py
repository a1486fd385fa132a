"""Score cellchem (audit SDS checks + survey) on the held-out files against key.json."""

import json
from pathlib import Path

from cellchem.adapters.files.audit import AuditRun, Options, audit_file
from cellchem.adapters.files.survey import survey

HERE = Path(__file__).parent
key = json.loads((HERE / "key.json").read_text())
SDS_CHECKS = {"ec", "un", "hazard-statements", "precautionary-statements", "signal-word", "pictograms"}
run = AuditRun()
for f in ("sds_a.xlsx", "sds_b_de.xlsx"):
    audit_file(HERE / f, Options(), run)
print("roles:", [(s.sheet, sorted(s.roles)) for fr in run.files for s in fr.sheets])
found = {}
for r in run.findings:
    if r.check in SDS_CHECKS:
        found.setdefault((Path(r.file).name, r.row), []).append(r)
right = wrong_sev = missed = 0
for p in key["sds"]["planted_errors"]:
    hits = found.get((p["file"], p["row"]), [])
    on_cell = [h for h in hits if h.column == p["column"]]
    ok = [h for h in on_cell if h.severity == p["expected"] or h.severity in p["also_acceptable"]]
    if ok:
        right += 1
    elif on_cell or hits:
        wrong_sev += 1
        print(
            "  other cell/severity:",
            p["file"],
            p["row"],
            p["column"],
            p["kind"],
            "->",
            [(h.column, h.severity, h.message[:90]) for h in hits],
        )
    else:
        missed += 1
        print("  MISSED:", p["file"], p["row"], p["column"], p["kind"], p["value"])
false = 0
for c in key["sds"]["correct_lines"]:
    hits = [h for h in found.get((c["file"], c["row"]), []) if h.severity in ("error", "warning")]
    if hits:
        false += 1
        print(
            "  FALSE on correct line:",
            c["file"],
            c["row"],
            c["product"],
            [(h.column, h.severity, h.message[:100]) for h in hits],
        )
print(
    f"SDS: planted {len(key['sds']['planted_errors'])}: found {right},"
    f" other cell/severity {wrong_sev}, missed {missed};"
    f" correct lines {len(key['sds']['correct_lines'])}: with error/warning {false}"
)

s = survey([HERE / "store.xlsx"], Options())
st = key["store"]
got = {
    (c.location, frozenset(ln.row for ln in c.lines_a), frozenset(ln.row for ln in c.lines_b))
    for c in s.conflicts
}
rows_pairs = set()
for c in s.conflicts:
    for a in c.lines_a:
        for b in c.lines_b:
            rows_pairs.add((a.sheet, c.location.strip(), frozenset((a.row, b.row))))
exp_pairs = {(p["sheet"], p["location"], frozenset(p["rows"])) for p in st["incompatible_pairs"]}
hit = sum(1 for e in exp_pairs if e in rows_pairs)
print(f"store pairs expected {len(exp_pairs)}: found {hit}")
for e in exp_pairs - rows_pairs:
    print("  MISSED pair", e)
quiet = {q["location"] for q in st["no_conflict_locations"]}
extra = [
    (c.location, c.family_a, c.family_b, [ln.name for ln in c.lines_a], [ln.name for ln in c.lines_b])
    for c in s.conflicts
    if not any(
        (cl_sheet, c.location.strip(), fr) in exp_pairs
        for (cl_sheet, _loc, fr) in [
            (a.sheet, c.location, frozenset((a.row, b.row))) for a in c.lines_a for b in c.lines_b
        ]
    )
]
print(
    f"conflicts reported {len(s.conflicts)}; conflicts at no-conflict locations:"
    f" {sum(1 for c in s.conflicts if c.location in quiet)}"
)
for x in extra:
    print("  REPORTED, not in key:", x)
dups = {(d.location, frozenset(ln.row for ln in d.lines)) for d in s.duplicates}
exp_d = {(d["location"], frozenset(d["rows"])) for d in st["duplicates"]}
print("duplicates expected", len(exp_d), "found", len(exp_d & dups), "extra", [d for d in dups - exp_d])
refused = [(ln.row, why) for t in s.totals for ln, why in t.refused]
print("unreadable packs expected", [(u["row"]) for u in st["unreadable_packs"]], "refused:", refused)
em = st["element_masses"]
exp_tot = em.get("totals") or {k: v for k, v in em.items() if k in ("Hg", "Pb", "Cd", "Cr(VI)")}
print("element totals key:", exp_tot if exp_tot else [k for k in em])
for c in s.concern:
    if c.part in ("Hg", "Pb", "Cd", "Cr(VI)"):
        print(
            f"  {c.part}: {c.mass_g:.2f} g; not weighed {[(ln.row, w[:60]) for ln, w in c.unweighed]};"
            f" not counted {[(ln.row, w[:60]) for ln, w in c.not_counted]}"
        )
