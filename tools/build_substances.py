"""Build cellchem/data/substances.sqlite, the table of substances keyed by CAS RN.

Source: the PubChem-derived identifier tables shipped in the PyPI package `chemicals`
(Chemical Engineering Design Library, Caleb Bell and contributors; MIT licence; the data are
from PubChem, NCBI, public domain): "chemical identifiers pubchem small.tsv", "... large.tsv",
"... example user db.tsv" and "Inorganic db.tsv" (CAS RN, formula in Hill order, molecular
weight, IUPAC and common names, synonyms). Only those columns are kept; the name shown is the
common name unless that is a registry code or PubChem's ion list, then another name cellchem
reads as the record's formula.

Every record is checked against itself before it can ground an audit finding:
- its formula must read (cellchem's formula reader) and its molar mass, computed with the
  CIAAW weights cellchem ships, must match the record's molecular weight;
- a hydrate word in its names (pentahydrate, hydrate (1:5)) must match the water the
  formula holds (a salt read from its counts with the water counted in); for a compound that
  does not read as a salt, the record of the name without the hydrate word must be the
  formula less that water (lactose monohydrate against lactose);
- where cellchem reads the record's common name, the reading must be the record's formula;
- an inorganic formula must balance, and an organic one must not have an odd number of
  electrons (a radical under a common name).
A record that fails any check is kept, marked uncertain with the reason; an uncertain record
never grounds an error. The counts are written into the table's `meta` rows.

Run with the package installed (it is in the test extra):

    python tools/build_substances.py            # writes cellchem/data/substances.sqlite
    python tools/build_substances.py --check    # rebuilds in memory, compares with the file

The output is deterministic for one `chemicals` release.
"""

from __future__ import annotations

import argparse
import hashlib
import re
import sqlite3
import sys
from importlib import metadata, resources
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

from cellchem import CellchemError, charge_balance, molar_mass, parse_formula  # noqa: E402
from cellchem.charge import water_counted_in  # noqa: E402
from cellchem.ions import counts_key  # noqa: E402
from cellchem.names import read_name  # noqa: E402
from cellchem.substances import composition_key, fold_name  # noqa: E402

OUT = ROOT / "cellchem" / "data" / "substances.sqlite"
FILES = (
    "chemical identifiers pubchem small.tsv",
    "Inorganic db.tsv",
    "chemical identifiers pubchem large.tsv",
    # PubChem records of the same form shipped as the package's example of a user database; they
    # hold common substances the other tables lack (hexane, octane, methane, aspirin)
    "chemical identifiers example user db.tsv",
)
SYNONYMS_KEPT = {"chemical identifiers pubchem small.tsv": 20, "Inorganic db.tsv": 20}
SYNONYMS_DEFAULT = 1

_CAS = re.compile(r"^\d{2,7}-\d\d-\d$")
NAME, SYNONYM = 0, 1  # how a name belongs to its record: its own (common or IUPAC) name, or a synonym
_CODE = re.compile(r"\d{3,}|^[a-z]{1,4}[- ]?\d|\bci\b|\(\d+ci\)|\b(?:ec|nsc|unii|mfcd|fema|ins|e)\s*\d")
_HYDRATE_WORD = {
    "monohydrate": 1, "dihydrate": 2, "trihydrate": 3, "tetrahydrate": 4, "pentahydrate": 5,
    "hexahydrate": 6, "heptahydrate": 7, "octahydrate": 8, "nonahydrate": 9, "decahydrate": 10,
    "dodecahydrate": 12, "hemihydrate": 0.5, "sesquihydrate": 1.5,
}  # fmt: skip


def _source_dir() -> Path:
    return Path(str(resources.files("chemicals"))) / "Identifiers"


def _records():
    """(file, CAS, formula, weight, IUPAC name, common name, synonyms) of every record,
    the first record of a CAS RN winning (the small table first: the common substances)."""
    seen: set[str] = set()
    for name in FILES:
        with (_source_dir() / name).open(encoding="utf-8") as fh:
            for line in fh:
                parts = line.rstrip("\n").split("\t")
                if len(parts) < 9 or not _CAS.match(parts[1]) or parts[1] in seen:
                    continue
                seen.add(parts[1])
                yield name, parts[1], parts[2], parts[3], parts[7], parts[8], parts[9:]


def _useful(name: str) -> bool:
    """A synonym worth indexing: a name, not a registry code, CAS RN or product number."""
    if not 3 <= len(name) <= 60 or _CAS.search(name) or "cas" in name:
        return False
    return not _CODE.search(name)


def _water_of(f) -> float | None:
    """The water a salt's Hill formula holds, read as a salt from its counts."""
    water = water_counted_in(f)
    return None if water is None else float(water)


def check(
    formula_text: str, weight: str, common: str, names: list[str], base_formulas: dict[str, str] | None = None
) -> tuple[str, int | None, str]:
    """(formula as cellchem writes it, water or None, doubt ('' when certain)) of one record.
    ``base_formulas`` maps folded names to formulas, for the hydrate check of records that
    do not read as salts (lactose monohydrate against lactose)."""
    try:
        f = parse_formula(formula_text)
    except CellchemError as exc:
        return formula_text, None, f"formula does not read: {exc}"
    if f.charge:
        return f.text(), None, "a charged species, not a substance"
    try:
        mass = float(molar_mass(f))
    except CellchemError as exc:
        return f.text(), None, f"no molar mass: {exc}"
    try:
        stated = float(weight)
    except ValueError:
        return f.text(), None, f"no molecular weight ({weight!r})"
    if abs(mass - stated) > max(0.05, 5e-4 * stated):
        return f.text(), None, f"molecular weight {stated:g} is not the formula's {mass:.3f}"
    balance = charge_balance(f)
    if balance.kind in ("unbalanced", "radical"):
        return f.text(), None, f"formula is {balance.kind}: {balance.explanation}"
    water = _water_of(f)
    for n in names[:3]:
        for word, count in _HYDRATE_WORD.items():
            if not re.search(rf"\b{word}\b", n):
                continue
            if water is not None:
                if water != count:
                    return f.text(), water, f"name '{n}' says {word}; the formula holds {water or 0} H2O"
                continue
            # not a salt: the anhydrous compound's record, found by the name without the
            # hydrate word, must be this formula less the water
            base = fold_name(re.sub(rf"\s*\b{word}\b", "", n)).strip(" ,")
            dry = (base_formulas or {}).get(base)
            if dry is None:
                return f.text(), None, f"name '{n}' says {word}; no record of '{base}' confirms the water"
            try:
                expected = parse_formula(dry).anhydrous().with_water(count)
            except CellchemError:
                return f.text(), None, f"name '{n}' says {word}; the record of '{base}' does not read"
            if counts_key(expected.counts) != counts_key(f.counts):
                return (
                    f.text(),
                    None,
                    f"name '{n}' says {word}; '{base}' is {dry}, so the formula lacks the water",
                )
            water = count
    try:
        reading = read_name(common)
    except CellchemError:
        reading = None
    if reading is not None:
        read = parse_formula(reading.formula)
        if not read.has_unknown_count and counts_key(read.counts) != counts_key(f.counts):
            return f.text(), water, f"its name '{common}' reads as {read.text()}"
    return f.text(), water, ""


def build(path: Path | str) -> dict[str, int]:
    counts = {"records": 0, "uncertain": 0, "names": 0}
    reasons: dict[str, int] = {}
    db = sqlite3.connect(str(path))
    db.executescript(
        """
        PRAGMA page_size = 4096;
        CREATE TABLE meta (key TEXT PRIMARY KEY, value TEXT NOT NULL);
        CREATE TABLE substances (
            id INTEGER PRIMARY KEY, cas TEXT NOT NULL, formula TEXT NOT NULL, weight REAL NOT NULL,
            name TEXT NOT NULL, water REAL, doubt TEXT NOT NULL, composition TEXT NOT NULL
        );
        CREATE INDEX by_composition ON substances (composition);
        CREATE TABLE names (name TEXT NOT NULL, id INTEGER NOT NULL, kind INTEGER NOT NULL,
                            PRIMARY KEY (name, id)) WITHOUT ROWID;
        """
    )
    rows = []
    name_rows: set[tuple[str, int, int]] = set()
    records = list(_records())
    base_formulas: dict[str, str] = {}
    for _, _, formula, _, _, common, _ in records:
        if common and not _CAS.match(common):
            base_formulas.setdefault(fold_name(common), formula)
    for file, cas, formula, weight, iupac, common, synonyms in records:
        names = [n for n in (common, iupac, *synonyms) if n]
        written, water, doubt = check(formula, weight, common, names, base_formulas)
        counts["records"] += 1
        if doubt:
            counts["uncertain"] += 1
            key = doubt.split(":")[0].split("'")[0].strip()
            reasons[key] = reasons.get(key, 0) + 1
        rows.append(
            (
                int(cas.replace("-", "")),
                cas,
                written,
                float(weight) if _is_number(weight) else 0.0,
                _display_name(common, synonyms, iupac, written),
                water,
                doubt,
                _composition(written),
            )
        )
        keep = SYNONYMS_KEPT.get(file, SYNONYMS_DEFAULT)
        ident = int(cas.replace("-", ""))
        for kind, name in ((NAME, common), (NAME, iupac if len(iupac) <= 40 else "")):
            if name and _useful(name.casefold()):
                name_rows.add((fold_name(name), ident, kind))
        for name in [s for s in synonyms if _useful(s.casefold())][:keep]:
            name_rows.add((fold_name(name), ident, SYNONYM))
    rows.sort()
    db.executemany("INSERT INTO substances VALUES (?, ?, ?, ?, ?, ?, ?, ?)", rows)
    best: dict[tuple[str, int], int] = {}
    for name, ident, kind in name_rows:
        best[(name, ident)] = min(kind, best.get((name, ident), kind))
    db.executemany("INSERT INTO names VALUES (?, ?, ?)", sorted((n, c, k) for (n, c), k in best.items()))
    counts["names"] = len(best)
    version = metadata.version("chemicals")
    meta = {
        "source": "PubChem-derived identifier tables of the PyPI package chemicals (Chemical Engineering"
        " Design Library; MIT licence; data from PubChem, NCBI, public domain)",
        "edition": f"chemicals {version}",
        "files": "; ".join(FILES),
        "records": str(counts["records"]),
        "uncertain": str(counts["uncertain"]),
        "names": str(counts["names"]),
        "uncertain_reasons": "; ".join(
            f"{k}: {v}" for k, v in sorted(reasons.items(), key=lambda kv: -kv[1])
        ),
        "checks": "formula reads; molar mass (CIAAW) matches the record's weight; hydrate words match the"
        " formula's water; cellchem's reading of the common name matches; formula balances and is no radical",
    }
    db.executemany("INSERT INTO meta VALUES (?, ?)", sorted(meta.items()))
    db.commit()
    db.execute("VACUUM")
    db.close()
    return counts


def _composition(formula_text: str) -> str:
    try:
        return composition_key(parse_formula(formula_text))
    except CellchemError:
        return ""


# a registry code given as a name (UNII 'm4i0d6vv5m', a vendor's 'st50308019'): letters and digits, no space
_WHOLE_CODE = re.compile(r"(?=[a-z]*\d)(?=\d*[a-z])[a-z0-9]{6,}")


def _shown(name: str) -> bool:
    return bool(name) and not _CAS.match(name) and ";" not in name and not _WHOLE_CODE.fullmatch(name)


def _display_name(common: str, synonyms: list[str], iupac: str, formula: str) -> str:
    """The name to show, Stock numbers in capitals (the source writes 'copper(ii) sulfate').

    >>> _display_name("copper(ii) sulfate pentahydrate", [], "", "CuH10O9S")
    'copper(II) sulfate pentahydrate'
    """
    name = _chosen_name(common, synonyms, iupac, formula)
    return re.sub(r"\(([ivx]+(?:,[ivx]+)*)\)", lambda m: m.group(0).upper(), name)


def _chosen_name(common: str, synonyms: list[str], iupac: str, formula: str) -> str:
    """The record's name to show: its common name; when that is a CAS RN, a registry code or
    PubChem's ion list ('calcium;dichloride;dihydrate'), the first other name that cellchem reads
    as the record's formula (the ion list read as words is one), else the first other name.

    >>> ions = "calcium;dichloride;dihydrate"
    >>> _chosen_name("m4i0d6vv5m", ["calcium chlorideultra pure"], ions, "CaCl2H4O2")
    'calcium dichloride dihydrate'
    """
    if _shown(common):
        return common
    others = [n for n in synonyms if _shown(n)] + ([iupac.replace(";", " ")] if iupac else [])
    try:
        key = counts_key(parse_formula(formula).counts)
    except CellchemError:
        key = None
    for name in others:
        try:
            read = parse_formula(read_name(name).formula)
        except CellchemError:
            continue
        if key is not None and not read.has_unknown_count and counts_key(read.counts) == key:
            return name
    return others[0] if others else common or iupac


def _is_number(text: str) -> bool:
    try:
        float(text)
    except ValueError:
        return False
    return True


def _digest(path: Path | str) -> str:
    db = sqlite3.connect(str(path))
    h = hashlib.sha256()
    for table in ("meta", "substances", "names"):
        for row in db.execute(f"SELECT * FROM {table} ORDER BY 1, 2"):
            h.update(repr(row).encode())
    db.close()
    return h.hexdigest()


def main() -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--check", action="store_true", help="rebuild in a temporary file and compare contents")
    ap.add_argument("-o", "--output", type=Path, default=OUT)
    args = ap.parse_args()
    if args.check:
        import tempfile

        with tempfile.TemporaryDirectory() as tmp:
            fresh = Path(tmp) / "substances.sqlite"
            build(fresh)
            same = _digest(fresh) == _digest(args.output)
        print(
            "the committed table matches its source" if same else "the committed table differs from a rebuild"
        )
        return 0 if same else 1
    partial = args.output.with_suffix(".partial")
    if partial.exists():
        partial.unlink()
    counts = build(partial)
    partial.replace(args.output)  # the old table stays usable until the new one is complete
    size = args.output.stat().st_size
    print(
        f"{args.output}: {counts['records']} substances ({counts['uncertain']} uncertain),"
        f" {counts['names']} names, {size / 1e6:.1f} MB"
    )
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
