"""Write the held-out stock-list workbooks with planted errors, and their ground truth.

Run from any folder with a Python that has openpyxl, molmass and chemicals:

    python evaluation/workbooks/heldout/make_heldout.py

Everything is drawn from one fixed random seed, and the workbook packages are written with fixed
timestamps, so a run writes byte-identical files every time.

What is written into files/ beside this script:

- three .xlsx workbooks and two .csv exports, laid out the way a hospital pathology store, a supplier's
  safety-data-sheet summary, a German supplier's price list, a university teaching-lab prep room and a UK
  supplier's catalogue export keep them;
- <file>.truth.csv: one row per planted error (exactly one per planted line);
- <file>.clean.csv: every data line that carries no planted error (mixture and product lines included).

The two files have the columns score_workbooks.py (one folder up) reads.

The scenario (Kestrel Moor Royal Infirmary, the University of Wendlebury, Tamsford Reagents, Halbmond
Laborchemie, Corvane Scientific, initials, codes, prices, dates) is invented. The substances are real: see
heldout_substances.csv, whose every formula and CAS RN is checked again here against the PyPI package
chemicals (PubChem-derived identifier tables). Molar masses are computed with molmass (IUPAC standard atomic
weights) and rounded to the decimals each file prints. EC numbers, UN numbers, signal words, hazard
statements and pictograms are illustrative (from memory) and not part of the evaluation.
"""

from __future__ import annotations

import argparse
import csv
import datetime as dt
import io
import random
import re
import sys
import zipfile
from collections import Counter
from dataclasses import dataclass, field
from pathlib import Path

from openpyxl import Workbook, load_workbook
from openpyxl.styles import Alignment, Font, PatternFill
from openpyxl.utils import get_column_letter

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE.parent))
from make_workbooks import (  # noqa: E402
    cas_check_ok,
    composition,
    formula_typos,
    molar_mass,
    split_water,
    swap_adjacent_digits,
)

SEED = 20250314
OUT = HERE / "files"
SUBSTANCES_CSV = HERE / "heldout_substances.csv"
FIXED_TIME = dt.datetime(2025, 3, 14, 8, 30, 0)

# planted errors per kind, by sub-kind (the sub-kind words are the ones score_workbooks.py groups by)
PLAN: list[tuple[str, list[object]]] = [
    ("a", [False] * 6 + [True] * 5),  # False: anhydrous CAS on a hydrate line; True: the reverse
    ("e", [None] * 10),
    ("g", [None] * 10),
    ("b", [None] * 10),
    ("h", ["formula"] * 4 + ["mm"] * 4 + ["cas"] * 3),
    ("c", [True] * 3 + [False] * 8),  # True: the transposition still passes the check digit
    ("d", ["count"] * 4 + ["drop"] * 3 + ["case"] * 3),
    ("f", [False] * 6 + [True] * 5),  # False: two digits swapped; True: another hydrate's molar mass
]

# ---------------------------------------------------------------------------------------------------------
# Substances
# ---------------------------------------------------------------------------------------------------------


@dataclass(frozen=True)
class Substance:
    key: str
    cls: str  # "i" inorganic, "o" organic
    formula: str
    cas: str
    names: tuple[str, ...]
    displays: tuple[str, ...]
    group: str
    confusions: tuple[str, ...]
    hazard: str
    un: str
    ec: str
    source: str

    @property
    def organic(self) -> bool:
        return self.cls == "o"

    @property
    def water(self) -> int:
        """Water of crystallisation in the formula (0 for none)."""
        if "·" not in self.formula:
            return 0
        last = self.formula.split("·")[-1]
        if not last.endswith("H2O"):
            return 0
        count = last[: -len("H2O")]
        return int(count) if count else 1

    @property
    def anhydrous_formula(self) -> str:
        if self.water == 0:
            return self.formula
        return "·".join(self.formula.split("·")[:-1])


def _split(text: str) -> tuple[str, ...]:
    return tuple(part.strip() for part in text.split(";") if part.strip())


def load() -> list[Substance]:
    with open(SUBSTANCES_CSV, newline="", encoding="utf-8") as fh:
        rows = list(csv.DictReader(line for line in fh if not line.startswith("#")))
    return [
        Substance(
            key=r["key"],
            cls=r["cls"],
            formula=r["formula"],
            cas=r["cas"],
            names=_split(r["names"]),
            displays=_split(r["displays"]),
            group=r["group"],
            confusions=_split(r["confusions"]),
            hazard=r["hazard"],
            un=r["un"],
            ec=r["ec"],
            source=r["source"],
        )
        for r in rows
    ]


def ec_check_ok(ec: str) -> bool:
    """EC number check digit: the sum of the first six digits weighted 1..6, modulo 11."""
    m = re.fullmatch(r"(\d{3})-(\d{3})-(\d)", ec)
    if not m:
        return False
    digits = m.group(1) + m.group(2)
    return sum((i + 1) * int(d) for i, d in enumerate(digits)) % 11 == int(m.group(3))


def witness_record(cas: str) -> object | None:
    """The chemicals record of a CAS RN, or None when it has none."""
    from chemicals.identifiers import search_chemical

    try:
        return search_chemical(cas)
    except Exception:  # the witness raises when it has no record
        return None


def verify(subs: list[Substance]) -> None:
    """Repeat the checks every record passed when it was written."""
    bad = []
    seen_cas: dict[str, str] = {}
    seen_names: dict[str, str] = {}
    for s in subs:
        if s.cas in seen_cas:
            bad.append(f"{s.key}: CAS RN {s.cas} also on {seen_cas[s.cas]}")
        seen_cas[s.cas] = s.key
        for n in s.names:
            if n.lower() in seen_names:
                bad.append(f"{s.key}: name {n!r} also on {seen_names[n.lower()]}")
            seen_names[n.lower()] = s.key
        if not cas_check_ok(s.cas):
            bad.append(f"{s.key}: check digit of {s.cas}")
        if s.ec and not ec_check_ok(s.ec):
            bad.append(f"{s.key}: check digit of EC {s.ec}")
        mine = composition(s.formula)
        for d in s.displays:
            if composition(d) != mine:
                bad.append(f"{s.key}: display {d} is not {s.formula}")
        for c in s.confusions:
            if c.lower() in {n.lower() for n in s.names}:
                bad.append(f"{s.key}: confusion {c!r} is one of its own names")
        rec = witness_record(s.cas)
        if rec is None:
            bad.append(f"{s.key}: no witness record for {s.cas}")
            continue
        if rec.CASs != s.cas or composition(rec.formula) != mine:
            bad.append(f"{s.key}: witness has {rec.CASs} {rec.formula}, record says {s.cas} {s.formula}")
    if bad:
        raise SystemExit("substance records disagree with the witness:\n" + "\n".join(bad))


def hill(sub: Substance) -> str:
    """Hill formula of the compound, hydrate water kept after a middle dot (as catalogues print it)."""
    counts = composition(sub.anhydrous_formula)
    order = ["C", "H"] + sorted(e for e in counts if e not in ("C", "H")) if "C" in counts else sorted(counts)
    text = "".join(e + (str(counts[e]) if counts[e] > 1 else "") for e in order if e in counts)
    if sub.water:
        text += "·" + (str(sub.water) if sub.water > 1 else "") + "H2O"
    return text


# ---------------------------------------------------------------------------------------------------------
# Pools of substances (keys without the ho_ prefix)
# ---------------------------------------------------------------------------------------------------------

BUFFERS = (
    "tris hepes hepesna mops mes caps bistris glygly glycine barbitalna tea dea amp mea edta na4edta egta "
    "nah2po4_2 nah2po4 na2hpo4 na2hpo4_12 kh2po4 k2hpo4 naoac naoac_3 na3cit na3cit_2 citric citric_1"
).split()
SALTS = (
    "nacl kcl cacl2_2 cacl2 mgso4_7 mgso4 nahco3 na2co3 na2co3_10 nh4cl nh42so4 nh4hco3 na2so4 li2so4 "
    "li2so4_1 znso4_7 znso4 cuso4_5 cuso4 feso4_7 fecl3_6 fecl3 na4p2o7 na4p2o7_10 lacl3_7 na2seo3 naf "
    "nan3 ki naio3 na2s2o3_5 na2s2o3 na2s2o4 k2s2o5 na2sio3 na2sio3_9 h3bo3 borax na2b4o7 snp nh2ohhcl "
    "hydrazine_sulfate aps kps"
).split()
ACIDS_ALKALIS = "hcl h2so4 hno3 hclo4 acoh naoh nh4oh tca naocl".split()
CLINICAL = (
    "kox_1 tca ssa_2 picric pnp tmb nad gsh creatinine creatine creatine_1 uric bilirubin cholesterol napyr "
    "pyruvic dmab sulfanilic sulfanilamide ned dam phen phen_1 oxine 1naphthol 2naphthol calactate_5 "
    "pyridoxine dtt"
).split()
SUGARS_AA = "glucose sucrose lactose lactose_1 mannose trehalose glcnac urea asn lys glycine".split()
SOLVENTS = "ethanol methanol acetone ipa chcl3 isoamyl pyridine glycerol phenol".split()
STAINS = "mb eosiny haematoxylin safranin neutralred bpb phenolred tbo etbr".split()
HISTOLOGY = (
    "hcho glutaral chloral picric hgcl2 chromealum nh4alum naio4 h5io6 oso4 agno3 kmno4 borax h3bo3 "
    "nacl na2hpo4 nah2po4_2 kh2po4 cuso4_5 ethanol ipa methanol acetone chcl3 phenol"
).split()
MOLBIO = (
    "aps kps acrylamide bisacryl temed sds dtt bme gdnhcl pmsf ctab nadoc etbr bpb tris glycine edta isoamyl "
    "chcl3 phenol nacl mgso4_7 kcl hepes egta"
).split()
TEACHING = (
    "cuso4_5 cuso4 borax na2s2o3_5 kmno4 agno3 ki fecl3_6 nacl kcl cacl2_2 mgso4_7 nahco3 na2co3 na2co3_10 "
    "naoh hcl h2so4 hno3 h3bo3 glucose sucrose lactose_1 mannose urea ethanol ipa acetone methanol glycerol "
    "mb eosiny safranin neutralred tbo bpb phenolred naoac_3 citric_1 na3cit_2 tris glycine sds edta kh2po4 "
    "na2hpo4_12 nah2po4_2 znso4_7 feso4_7 nh4cl nh42so4 cacl2 1naphthol dmab sulfanilic acoh tca pnp "
    "creatinine uric na2s2o4 k2s2o5 naio3 na2sio3_9"
).split()

MIXTURES = [
    ("Neutral buffered formalin 10%", "Health hazard"),
    ("Harris haematoxylin solution", "Flammable"),
    ("Mayer's haemalum", "None"),
    ("Giemsa stain solution", "Toxic"),
    ("May-Grünwald stain", "Toxic"),
    ("Leishman's stain", "Flammable"),
    ("Schiff's reagent", "Corrosive"),
    ("Van Gieson's stain", "Toxic"),
    ("DPX mountant", "Flammable"),
    ("Immersion oil, type A", "None"),
    ("Paraffin wax, pastillated (m.p. 56-58 °C)", "None"),
    ("Industrial methylated spirit 99% (IMS)", "Flammable"),
    ("Agarose, molecular biology grade", "None"),
    ("Bovine serum albumin, fraction V", "None"),
    ("Polysorbate 20", "None"),
    ("Skimmed milk powder", "None"),
    ("Bradford protein assay reagent", "Corrosive"),
    ("Folin-Ciocalteu's phenol reagent", "Corrosive"),
    ("Drabkin's reagent", "Toxic"),
    ("Ehrlich's reagent", "Corrosive"),
    ("Benedict's solution (quantitative)", "None"),
    ("Seliwanoff's reagent", "Corrosive"),
    ("Barfoed's reagent", "Harmful"),
    ("Peptone, bacteriological", "None"),
    ("Yeast extract powder", "None"),
    ("Nutrient agar", "None"),
    ("MacConkey agar", "None"),
    ("Starch, soluble (potato)", "None"),
    ("Universal indicator solution pH 3-10", "Flammable"),
    ("pH buffer tablets pH 6.8", "None"),
    ("Silica gel, self-indicating (orange)", "None"),
    ("Petroleum ether 40-60", "Flammable"),
    ("Clearing agent, xylene substitute", "Flammable"),
    ("Carbol fuchsin (Ziehl-Neelsen)", "Toxic"),
    ("Lugol's iodine solution", "Harmful"),
]
HISTO_MIXTURES = MIXTURES[:12] + MIXTURES[32:34]
LAB_MIXTURES = MIXTURES[12:32] + [MIXTURES[34]]

# Grade words put after a name; all of them are words score_workbooks.py sets aside when it compares names.
GRADES = [
    " AR",
    " GPR",
    ", reagent grade",
    ", for molecular biology",
    ", ACS reagent",
    " 99+%",
    ", extra pure",
    " ≥99%",
    ", for analysis",
    ", Ph. Eur.",
    ", laboratory reagent",
    " LR",
]

# Illustrative hazard communication for the SDS summary (from memory, not checked, not evaluated):
# hazard word -> (signal word, pictograms, hazard statements)
HAZARD_TEXT = {
    "None": ("", "", "Not classified"),
    "Irritant": ("Warning", "GHS07", "H315, H319, H335"),
    "Harmful": ("Warning", "GHS07", "H302"),
    "Toxic": ("Danger", "GHS06", "H301, H311, H331"),
    "Corrosive": ("Danger", "GHS05", "H314"),
    "Flammable": ("Danger", "GHS02, GHS07", "H225, H319"),
    "Oxidising": ("Danger", "GHS03", "H272"),
    "Health hazard": ("Danger", "GHS08", "H350"),
    "Explosive": ("Danger", "GHS01", "H201"),
    "Environment": ("Warning", "GHS09", "H410"),
}
H_STATEMENTS = [
    ("H201", "Explosive; mass explosion hazard."),
    ("H225", "Highly flammable liquid and vapour."),
    ("H272", "May intensify fire; oxidiser."),
    ("H301", "Toxic if swallowed."),
    ("H302", "Harmful if swallowed."),
    ("H311", "Toxic in contact with skin."),
    ("H314", "Causes severe skin burns and eye damage."),
    ("H315", "Causes skin irritation."),
    ("H319", "Causes serious eye irritation."),
    ("H331", "Toxic if inhaled."),
    ("H335", "May cause respiratory irritation."),
    ("H350", "May cause cancer."),
    ("H410", "Very toxic to aquatic life with long lasting effects."),
]

LIQUIDS = set(SOLVENTS + ACIDS_ALKALIS + "hcho glutaral bme temed pyruvic mea dea tea amp".split()) - {
    "naoh",
    "tca",
}

# ---------------------------------------------------------------------------------------------------------
# Lines and sheets
# ---------------------------------------------------------------------------------------------------------


@dataclass
class Line:
    file: str
    sheet: str
    row: int = 0
    sub: Substance | None = None
    name: str = ""
    name_suffix: str = ""
    formula: str | None = None
    mm: float | None = None  # the printed molar mass
    mm_decimals: int = 2
    mm_as_text: str = ""  # "", "plain" ("58.44" typed as text) or "unit" ("58.44 g/mol")
    cas: str | None = None
    hyphenless_cas: bool = False  # typed without hyphens (a workbook keeps it as a number)
    extras: dict[str, object] = field(default_factory=dict)
    prev: Line | None = None  # the data line on the row directly above, if any
    plant: dict[str, str] | None = None
    locked: bool = False  # another line's planted error depends on this line staying correct

    @property
    def complete(self) -> bool:
        return bool(self.name and self.formula and self.mm is not None and self.cas)

    def mm_text(self, value: float | None = None) -> str:
        v = self.mm if value is None else value
        return "" if v is None else f"{v:.{self.mm_decimals}f}"

    @property
    def liquid(self) -> bool:
        if self.sub is not None:
            return self.sub.key[3:] in LIQUIDS
        words = (
            r"solution|reagent|stain|haemalum|oil|spirit|ether|formalin|mountant|agent|fuchsin|polysorbate|%"
        )
        return bool(re.search(words, self.name, re.I))


@dataclass
class SheetSpec:
    title: str
    titles: list[str]
    headers: list[tuple[str, str]]  # (heading, role or extra key)
    lines: list[Line] = field(default_factory=list)
    blank_after_titles: int = 1
    sections: dict[int, str] = field(default_factory=dict)  # index of the first line -> section title
    layout: list[tuple[str, object]] = field(default_factory=list)
    merge_title: bool = False
    autofilter: bool = False


@dataclass
class FileSpec:
    name: str
    sheets: list[SheetSpec]
    kind: str = "xlsx"  # xlsx | csv-comma | csv-semicolon
    encoding: str = "utf-8"
    newline: str = "\r\n"
    extra_sheets: list[tuple[str, list[list[str]]]] = field(default_factory=list)
    creator: str = ""


ROLE_KEYS = ("name", "formula", "mm", "cas")


class Maker:
    def __init__(self, subs: list[Substance]) -> None:
        self.rng = random.Random(SEED)
        self.subs = subs
        self.by_key = {s.key: s for s in subs}
        self.groups: dict[str, list[Substance]] = {}
        for s in subs:
            if s.group:
                self.groups.setdefault(s.group, []).append(s)
        self.files: list[FileSpec] = []

    def pool(self, *lists: list[str]) -> list[Substance]:
        keys: list[str] = []
        for lst in lists:
            for k in lst:
                full = "ho_" + k
                if full not in self.by_key:
                    raise SystemExit(f"pool names {k!r}, which is not in heldout_substances.csv")
                if full not in keys:
                    keys.append(full)
        return [self.by_key[k] for k in keys]

    def organic(self) -> list[Substance]:
        return [s for s in self.subs if s.organic]

    def inorganic(self) -> list[Substance]:
        return [s for s in self.subs if not s.organic]

    def siblings(self, sub: Substance) -> list[Substance]:
        return [s for s in self.groups.get(sub.group, []) if s.key != sub.key and s.water != sub.water]

    def draw(self, pool: list[Substance], n: int) -> list[Substance]:
        """n substances from pool, each once before any repeats."""
        out: list[Substance] = []
        while len(out) < n:
            batch = pool[:]
            self.rng.shuffle(batch)
            out.extend(batch[: n - len(out)])
        return out

    def formula_display(self, sub: Substance, style: str) -> str:
        """as-written: the record's formula or one of its displays; hill: organics in Hill order;
        typed: as-written with a full stop for the middle dot; spaced: ' · ' for the middle dot."""
        f = sub.formula
        r = self.rng.random()
        if style in ("hill", "spaced") and sub.organic:
            f = hill(sub)
        elif style in ("as-written", "typed") and sub.displays and r < 0.35:
            f = self.rng.choice(sub.displays)
        if "·" in f:
            if style == "typed" or (style == "as-written" and r > 0.85):
                f = f.replace("·", ".")
            elif style == "spaced":
                f = f.replace("·", " · ")
        return f

    def make_line(
        self,
        file: str,
        sheet: str,
        sub: Substance | None,
        *,
        decimals: int,
        fstyle: str,
        grade_p: float = 0.0,
        upper_p: float = 0.0,
        partial_p: float = 0.0,
        mixture: tuple[str, str] | None = None,
    ) -> Line:
        line = Line(file=file, sheet=sheet, sub=sub, mm_decimals=decimals)
        if sub is None:
            assert mixture is not None
            line.name = mixture[0]
            line.extras["hazard"] = mixture[1]
            return line
        line.name = self.rng.choice(sub.names)
        plain = not re.search(r"[,%(\d]", line.name) and "grade" not in line.name
        if plain and self.rng.random() < grade_p:
            line.name_suffix = self.rng.choice(GRADES)
        if self.rng.random() < upper_p:
            line.name, line.name_suffix = line.name.upper(), line.name_suffix.upper()
        line.formula = self.formula_display(sub, fstyle)
        line.mm = round(molar_mass(sub.formula), decimals)
        line.cas = sub.cas
        line.extras["hazard"] = sub.hazard
        if self.rng.random() < partial_p:
            missing = self.rng.choice([("mm",), ("cas",), ("formula",), ("mm", "cas"), ("formula", "mm")])
            for role in missing:
                setattr(line, role, None)
        return line

    def lines_for(self, file: str, sheet: str, subs: list[Substance], **kw: object) -> list[Line]:
        return [self.make_line(file, sheet, s, **kw) for s in subs]  # type: ignore[arg-type]

    def mixtures(self, file: str, sheet: str, choices: list[tuple[str, str]], n: int) -> list[Line]:
        return [
            self.make_line(file, sheet, None, decimals=2, fstyle="", mixture=m)
            for m in self.rng.sample(choices, n)
        ]

    def lay_out(self, sheet: SheetSpec, blank_p: float) -> None:
        """Assign sheet rows: titles, blank row(s), header, then data (sections and the odd blank row)."""
        for t in sheet.titles:
            sheet.layout.append(("title", t))
        for _ in range(sheet.blank_after_titles if sheet.titles else 0):
            sheet.layout.append(("blank", None))
        sheet.layout.append(("header", None))
        prev: Line | None = None
        for i, line in enumerate(sheet.lines):
            if i in sheet.sections:
                if i:
                    sheet.layout.append(("blank", None))
                sheet.layout.append(("section", sheet.sections[i]))
                prev = None
            elif i and self.rng.random() < blank_p:
                sheet.layout.append(("blank", None))
                prev = None
            sheet.layout.append(("line", line))
            line.row = len(sheet.layout)
            line.prev = prev
            prev = line


SORT_PREFIX = re.compile(
    r"^(?:\d+(?:,\d+)*-|(?:n|p|o|sec|tert|cis|trans|alpha|beta|myo|meso|di|tri|dl|d|l)(?:\([+-]\))?-|"
    r"[dl]\([+-]\)-)+",
    re.IGNORECASE,
)


def sort_key(ln: Line) -> str:
    return SORT_PREFIX.sub("", ln.name).lower()


# ---------------------------------------------------------------------------------------------------------
# The five files
# ---------------------------------------------------------------------------------------------------------


def build(m: Maker) -> None:
    rng = m.rng

    # 1. Pathology reagent store (two sheets, title block, sections) -------------------------------------
    f = "kmri_pathology_reagent_store.xlsx"
    cb_headers = [
        ("Stock code", "code"),
        ("Chemical name", "name"),
        ("Grade", "grade"),
        ("Chem. formula", "formula"),
        ("Mol. wt. (g/mol)", "mm"),
        ("CAS Reg. No.", "cas"),
        ("Pack", "pack"),
        ("In stock", "qty"),
        ("Min.", "min"),
        ("Location", "location"),
        ("Expiry", "date"),
        ("Lot no.", "lot"),
    ]
    cb = SheetSpec(
        "Clinical Biochemistry",
        [
            "Kestrel Moor Royal Infirmary - Department of Pathology",
            "Clinical Biochemistry reagent store (Room B1.14) - stock register",
            "Doc. ref. PATH-CB-REG-07, version 12. Last full check 03/03/2025 (R.A. / T.O.)",
        ],
        cb_headers,
        merge_title=True,
    )
    sections = [
        ("BUFFERS AND BUFFER SALTS", "BUF", m.pool(BUFFERS), 18, 0),
        ("INORGANIC SALTS", "SAL", m.pool(SALTS), 24, 0),
        ("ACIDS AND ALKALIS", "ACA", m.pool(ACIDS_ALKALIS), 8, 0),
        ("CLINICAL CHEMISTRY REAGENTS", "CCR", m.pool(CLINICAL), 22, 2),
        ("SUGARS, AMINO ACIDS, UREA", "SAA", m.pool(SUGARS_AA), 14, 0),
        ("SOLVENTS (flammables cabinet FC-3)", "SOL", m.pool(SOLVENTS), 8, 0),
    ]
    for title, prefix, pool, n, nmix in sections:
        lines = m.lines_for(f, cb.title, m.draw(pool, n), decimals=2, fstyle="as-written", partial_p=0.05)
        lines += m.mixtures(f, cb.title, LAB_MIXTURES[5:11], nmix)
        lines.sort(key=sort_key)
        cb.sections[len(cb.lines)] = title
        for i, ln in enumerate(lines, 1):
            ln.extras.update(
                code=f"CB-{prefix}-{i:03d}",
                grade=rng.choice(["AR", "AR", "GPR", "Mol. biol.", "Ph. Eur.", "ACS", "Cell culture"]),
                pack=rng.choice(["100 g", "250 g", "500 g", "1 kg", "25 g", "5 g"])
                if not ln.liquid
                else rng.choice(["500 mL", "1 L", "2.5 L", "250 mL"]),
                qty=rng.choice([0, 1, 1, 2, 2, 3, 4, 6]),
                min=rng.choice([1, 1, 2, 2, 3]),
                location=rng.choice(
                    ["B1.14 shelf A", "B1.14 shelf B", "B1.14 shelf C", "Cold room 2", "FC-3"]
                ),
                date=dt.date(2025, 1, 1) + dt.timedelta(days=rng.randrange(0, 1100))
                if rng.random() < 0.8
                else None,
                lot=f"L{rng.randrange(2101, 2412)}-{rng.randrange(10, 999):03d}"
                if rng.random() < 0.7
                else None,
            )
        cb.lines.extend(lines)

    cp = SheetSpec(
        "Cellular Pathology",
        [
            "Kestrel Moor Royal Infirmary - Cellular Pathology",
            "Histology & cytology reagents (Lab C2; flammables in cabinet FC-1)",
        ],
        [
            ("Stock code", "code"),
            ("Chemical name", "name"),
            ("Chem. formula", "formula"),
            ("Mol. wt. (g/mol)", "mm"),
            ("CAS Reg. No.", "cas"),
            ("Pack", "pack"),
            ("Qty", "qty"),
            ("Location", "location"),
            ("Hazard", "hazard"),
            ("Expiry", "date"),
        ],
        merge_title=True,
    )
    subs = m.draw(m.pool(STAINS), 14) + m.draw(m.pool(HISTOLOGY), 34)
    rng.shuffle(subs)
    cp.lines = m.lines_for(f, cp.title, subs, decimals=2, fstyle="as-written", grade_p=0.1, partial_p=0.05)
    cp.lines += m.mixtures(f, cp.title, HISTO_MIXTURES, 8)
    rng.shuffle(cp.lines)
    for i, ln in enumerate(cp.lines, 1):
        ln.extras.update(
            code=f"CP-{i + 200:04d}",
            pack=rng.choice(["25 g", "100 g", "500 g", "10 g"])
            if not ln.liquid
            else rng.choice(["500 mL", "1 L", "2.5 L", "5 L"]),
            qty=rng.choice([1, 1, 2, 3, 4]),
            location=rng.choice(
                ["C2 stain shelf", "C2 fume cupboard", "FC-1", "C2 poisons cupboard", "C2 bench"]
            ),
            date=dt.date(2025, 2, 1) + dt.timedelta(days=rng.randrange(0, 900))
            if rng.random() < 0.75
            else None,
        )
    for sh in (cb, cp):
        m.lay_out(sh, 0.02)
    m.files.append(FileSpec(f, [cb, cp], creator="KMRI Pathology"))

    # 2. Supplier's SDS summary ---------------------------------------------------------------------------
    f = "tamsford_sds_summary_2025.xlsx"
    sds = SheetSpec(
        "SDS summary",
        [
            "Tamsford Reagents Ltd",
            "Safety data sheet summary - products supplied to Kestrel Moor Royal Infirmary and the "
            "University of Wendlebury, 2024/25",
            "Issued 14/03/2025. This summary does not replace the safety data sheet.",
        ],
        [
            ("Product no.", "catno"),
            ("Product name", "name"),
            ("Mol formula", "formula"),
            ("MW (g/mol)", "mm"),
            ("CAS #", "cas"),
            ("EC No.", "ec"),
            ("UN No.", "un"),
            ("Signal word", "signal"),
            ("Hazard statements", "hstat"),
            ("Pictograms", "picto"),
            ("SDS revision", "date"),
        ],
        merge_title=True,
        autofilter=True,
    )
    subs = m.draw(m.organic(), 62) + m.draw(m.inorganic(), 38)
    sds.lines = m.lines_for(f, sds.title, subs, decimals=3, fstyle="hill", grade_p=0.08, partial_p=0.02)
    sds.lines += m.mixtures(f, sds.title, MIXTURES, 4)
    sds.lines.sort(key=sort_key)
    for ln in sds.lines:
        signal, picto, hstat = HAZARD_TEXT[str(ln.extras.get("hazard", "None"))]
        sub = ln.sub
        ln.extras.update(
            catno=f"T{rng.randrange(10000, 99999)}",
            ec=(sub.ec or "-") if sub else "-",
            un=(f"UN{sub.un}" if sub.un else "not regulated") if sub else "see SDS",
            signal=signal,
            hstat=hstat,
            picto=picto,
            date=dt.date(2021, 6, 1) + dt.timedelta(days=rng.randrange(0, 1350)),
        )
    m.lay_out(sds, 0.0)
    key_sheet = ("H-statement key", [["Code", "Hazard statement"], *[list(h) for h in H_STATEMENTS]])
    m.files.append(FileSpec(f, [sds], extra_sheets=[key_sheet], creator="Tamsford Reagents Ltd"))

    # 3. German supplier's price list export (semicolons, decimal commas, cp1252) -----------------------
    f = "halbmond_preisliste_2025.csv"
    pl = SheetSpec(
        "",
        [],
        [
            ("Artikel-Nr.", "catno"),
            ("Bezeichnung", "name"),
            ("Qualität", "quality"),
            ("Summenformel", "formula"),
            ("Molmasse", "mm"),
            ("CAS-Nr.", "cas"),
            ("Gebinde", "pack"),
            ("Preis EUR", "price"),
            ("Lieferzeit", "delivery"),
        ],
    )
    subs = m.draw(m.organic(), 52) + m.draw(m.inorganic(), 36)
    pl.lines = m.lines_for(f, "", subs, decimals=2, fstyle="spaced", partial_p=0.02)
    numbers = sorted(rng.sample(range(1000, 9999), len(pl.lines)))
    rng.shuffle(pl.lines)
    for n, ln in zip(numbers, pl.lines, strict=True):
        ln.extras.update(
            catno=f"HM-{n}",
            quality=rng.choice(
                ["p.a.", "p.a.", "reinst", "zur Synthese", "Ph. Eur.", "für die Molekularbiologie"]
            ),
            pack=rng.choice(["100 g", "250 g", "500 g", "1 kg"])
            if not ln.liquid
            else rng.choice(["500 ml", "1 l", "2,5 l"]),
            price=f"{rng.uniform(9, 260):.2f}".replace(".", ","),
            delivery=rng.choice(["ab Lager", "ab Lager", "ab Lager", "1-2 Wochen", "auf Anfrage"]),
        )
    pl.lines.sort(key=lambda ln: str(ln.extras["catno"]))
    m.lay_out(pl, 0.0)
    m.files.append(FileSpec(f, [pl], kind="csv-semicolon", encoding="cp1252"))

    # 4. Teaching-lab prep room stock take (messy) --------------------------------------------------------
    f = "wendlebury_prep_room_stocktake.xlsx"
    take = SheetSpec(
        "Stocktake Sept 2024",
        ["UoW Biosciences - teaching labs prep room", "stocktake sept 2024 (counted by JH + MP)"],
        [
            ("description", "name"),
            ("formula", "formula"),
            ("mol wt", "mm"),
            ("CAS", "cas"),
            ("amount", "qty"),
            ("shelf", "location"),
            ("opened", "opened"),
            ("comments", "notes"),
        ],
        blank_after_titles=2,
    )
    subs = m.draw(m.pool(TEACHING), 60)
    subs += rng.sample(subs, 6)  # the same chemical found on a second shelf
    rng.shuffle(subs)
    take.lines = [
        m.make_line(
            f,
            take.title,
            s,
            decimals=rng.choice([1, 2, 2]),
            fstyle="typed",
            upper_p=0.2,
            partial_p=0.12,
        )
        for s in subs
    ]
    take.lines += m.mixtures(f, take.title, LAB_MIXTURES, 4)
    rng.shuffle(take.lines)
    cold = SheetSpec(
        "Cold room",
        ["COLD ROOM (4 °C) - enzymes, media, labile reagents"],
        [
            ("description", "name"),
            ("formula", "formula"),
            ("mol wt", "mm"),
            ("CAS", "cas"),
            ("amount", "qty"),
            ("comments", "notes"),
        ],
    )
    subs = m.draw(m.pool(MOLBIO, ["nad", "gsh", "napyr", "glcnac", "trehalose", "bilirubin", "tmb"]), 27)
    cold.lines = [
        m.make_line(f, cold.title, s, decimals=2, fstyle="typed", upper_p=0.1, partial_p=0.1) for s in subs
    ]
    cold.lines += m.mixtures(f, cold.title, LAB_MIXTURES[:5], 3)
    rng.shuffle(cold.lines)
    for sh in (take, cold):
        for ln in sh.lines:
            ln.extras.update(
                qty=rng.choice(["1L", "500ml", "2 x 2.5L", "1/2 bottle", "approx 300ml", "?"])
                if ln.liquid
                else rng.choice(
                    ["500g", "1/2 tub", "250 g", "2 x 500g", "100g", "approx 200g", "?", "3 tubs"]
                ),
                location=rng.choice(["A1", "A2", "A3", "B1", "B2", "under sink", "fume hood", "poisons cab"]),
                opened=rng.choice(["", "", "yes", "no", "2022", "Jan 24", dt.date(2023, 10, 2)]),
                notes=rng.choice(
                    ["", "", "", "", "caked", "label faded", "reorder", "check with MP", "2 bottles"]
                ),
            )
            if sh is take and ln.mm is not None and rng.random() < 0.12:
                ln.mm_as_text = rng.choice(["plain", "unit"])
            if ln.cas and rng.random() < 0.05:
                ln.hyphenless_cas = True
    m.lay_out(take, 0.06)
    m.lay_out(cold, 0.0)
    m.files.append(FileSpec(f, [take, cold], creator="prep room"))

    # 5. UK supplier's catalogue export (comma CSV with a title line) ------------------------------------
    f = "corvane_catalogue_export.csv"
    exp = SheetSpec(
        "",
        ["Corvane Scientific - catalogue export for University of Wendlebury (account 40-1187) 02/12/2024"],
        [
            ("Code", "catno"),
            ("Name", "name"),
            ("Formula", "formula"),
            ("Mol. weight", "mm"),
            ("CAS number", "cas"),
            ("Purity", "purity"),
            ("Pack", "pack"),
            ("Price GBP", "price"),
            ("Stock", "stock"),
        ],
        blank_after_titles=0,
    )
    subs = m.draw(m.organic(), 34) + m.draw(m.inorganic(), 24)
    exp.lines = m.lines_for(f, "", subs, decimals=2, fstyle="hill", grade_p=0.15, partial_p=0.03)
    exp.lines.sort(key=sort_key)
    for ln in exp.lines:
        ln.extras.update(
            catno=f"CVS-{rng.randrange(100000, 999999)}",
            purity=rng.choice(["≥99%", "≥98%", "99.5%", "ACS", "Mol. biol.", "97%", ""]),
            pack=rng.choice(["100g", "250g", "500g", "1kg"])
            if not ln.liquid
            else rng.choice(["500ml", "1l", "2.5l"]),
            price=f"{rng.uniform(6, 190):.2f}",
            stock=rng.choice(["In stock", "In stock", "In stock", "2-3 days", "Discontinued"]),
        )
    m.lay_out(exp, 0.0)
    m.files.append(FileSpec(f, [exp], kind="csv-comma", newline="\n"))


# ---------------------------------------------------------------------------------------------------------
# Planting errors
# ---------------------------------------------------------------------------------------------------------

ELEMENT_CASE = {
    "Co": "CO",
    "Cu": "CU",
    "Ni": "NI",
    "Sn": "SN",
    "Ca": "CA",
    "Ba": "BA",
    "Mg": "MG",
    "Mn": "MN",
    "Zn": "ZN",
    "Na": "NA",
    "Cl": "CL",
    "Li": "LI",
    "Hg": "HG",
    "Os": "OS",
    "La": "LA",
    "Se": "SE",
    "Fe": "FE",
}


class Planter:
    def __init__(self, m: Maker) -> None:
        self.m = m
        self.rng = m.rng
        self.lines = [ln for fs in m.files for sh in fs.sheets for ln in sh.lines]
        self.organic_subs = [s for s in m.subs if s.organic]
        self.known_cas = {s.cas for s in m.subs}

    def free(self, ln: Line) -> bool:
        return ln.sub is not None and ln.plant is None and not ln.locked and ln.complete

    def record(
        self, ln: Line, kind: str, role: str, original: str, planted: str, detail: str, source: str
    ) -> None:
        ln.plant = dict(
            kind=kind, role=role, original=original, planted=planted, detail=detail, source=source
        )

    def witness(self, sub: Substance) -> str:
        return (
            f"{sub.formula} {sub.cas} M={molar_mass(sub.formula):.3f} (molmass); CAS RN checked by check "
            f"digit and against the chemicals record of {sub.cas}; formula and CAS RN from {sub.source}"
        )

    def same_group(self, a: Substance, b: Substance) -> bool:
        return bool(a.group) and a.group == b.group

    # (a) CAS RN of the anhydrous salt on a hydrate's line, and the reverse
    def plant_a(self, ln: Line, want_reverse: bool) -> bool:
        sub = ln.sub
        assert sub and not ln.hyphenless_cas
        sibs = self.m.siblings(sub)
        if sub.water and not want_reverse:
            targets = [s for s in sibs if s.water == 0] or sibs
            detail = (
                "anhydrous CAS RN on a hydrate line"
                if targets and targets[0].water == 0
                else "other hydrate's CAS RN"
            )
        elif sub.water == 0 and want_reverse:
            targets = [s for s in sibs if s.water > 0]
            detail = "hydrate's CAS RN on an anhydrous line"
        else:
            return False
        if not targets:
            return False
        t = self.rng.choice(targets)
        self.record(
            ln, "a", "cas", sub.cas, t.cas, f"{detail} ({t.formula})",
            self.witness(sub) + f"; planted {t.cas} is {t.formula}",
        )  # fmt: skip
        ln.cas = t.cas
        return True

    # (b) the CAS RN of the row above pasted one line down
    def plant_b(self, ln: Line) -> bool:
        p = ln.prev
        if p is None or p.sub is None or p.plant is not None or not p.cas or p.hyphenless_cas:
            return False
        assert ln.sub
        if p.cas == ln.cas or self.same_group(p.sub, ln.sub) or ln.hyphenless_cas:
            return False
        self.record(
            ln, "b", "cas", ln.cas or "", p.cas, f"CAS RN of row {p.row} ({p.sub.formula})",
            self.witness(ln.sub) + f"; planted {p.cas} is {p.sub.formula} on the row above",
        )  # fmt: skip
        ln.cas = p.cas
        p.locked = True
        return True

    # (c) two adjacent digits of the CAS RN swapped
    def plant_c(self, ln: Line, want_pass: bool) -> bool:
        assert ln.sub and ln.cas
        if ln.hyphenless_cas:
            return False
        good = [
            t
            for t, _ in swap_adjacent_digits(ln.cas)
            if cas_check_ok(t) == want_pass and t not in self.known_cas and not t.startswith("0")
        ]
        if want_pass:
            good = [
                t for t in good if witness_record(t) is None
            ]  # a number of no substance the witness knows
        if not good:
            return False
        t = self.rng.choice(good)
        detail = (
            "transposition that still passes the check digit"
            if want_pass
            else "transposition that fails the check digit"
        )
        self.record(ln, "c", "cas", ln.cas, t, detail, self.witness(ln.sub))
        ln.cas = t
        return True

    # (d) a formula typo on an inorganic line
    def plant_d(self, ln: Line, sub_kind: str) -> bool:
        sub = ln.sub
        assert sub and ln.formula
        good = formula_typos(ln.formula, sub.formula, sub_kind, ELEMENT_CASE)
        if not good:
            return False
        text, why = self.rng.choice(good)
        self.record(ln, "d", "formula", ln.formula, text, why, self.witness(sub))
        ln.formula = text
        return True

    # (e) the anhydrous formula on a hydrate's line
    def plant_e(self, ln: Line) -> bool:
        sub = ln.sub
        assert sub and ln.formula
        if not sub.water:
            return False
        text, water = split_water(ln.formula)
        if not water:
            return False
        self.record(
            ln, "e", "formula", ln.formula, text, f"water of crystallisation ({sub.water} H2O) left out",
            self.witness(sub),
        )  # fmt: skip
        ln.formula = text
        return True

    # (f) a molar mass with two digits swapped, or the molar mass of another hydrate (or the anhydrous salt)
    def plant_f(self, ln: Line, want_hydrate: bool) -> bool:
        sub = ln.sub
        assert sub and ln.mm is not None
        if ln.mm_as_text:
            return False
        orig = ln.mm_text()
        if want_hydrate:
            options = [(s.formula, molar_mass(s.formula)) for s in self.m.siblings(sub)]
            if sub.water and not any(s.water == 0 for s in self.m.siblings(sub)):
                options.append((sub.anhydrous_formula, molar_mass(sub.anhydrous_formula)))
            if not options:
                return False
            other, mass = self.rng.choice(options)
            new = round(mass, ln.mm_decimals)
            detail = f"molar mass of {other}"
        else:
            swaps = [
                t
                for t, _ in swap_adjacent_digits(orig)
                if not t.startswith("0") and abs(float(t) - ln.mm) > 0.1
            ]
            if not swaps:
                return False
            new = float(self.rng.choice(swaps))
            detail = "two adjacent digits swapped"
        self.record(ln, "f", "molar_mass", orig, f"{new:.{ln.mm_decimals}f}", detail, self.witness(sub))
        ln.mm = new
        return True

    # (g) a name that names another compound
    def plant_g(self, ln: Line) -> bool:
        sub = ln.sub
        assert sub
        if not sub.confusions:
            return False
        wrong = self.rng.choice(sub.confusions)
        if ln.name.isupper():
            wrong = wrong.upper()
        self.record(
            ln, "g", "name", ln.name + ln.name_suffix, wrong + ln.name_suffix,
            f"names another compound: {wrong}", self.witness(sub),
        )  # fmt: skip
        ln.name = wrong
        return True

    # (h) organic lines: hydrogen count, the molar mass of the row above, another organic's CAS RN
    def plant_h(self, ln: Line, sub_kind: str) -> bool:
        sub = ln.sub
        assert sub and sub.organic and ln.formula
        if sub_kind == "formula":
            salt, water = split_water(ln.formula)
            hs = list(re.finditer(r"H(\d+)", salt))
            if not hs:
                return False
            h = self.rng.choice(hs)
            n = int(h.group(1))
            k = self.rng.choice([k for k in (n - 2, n - 1, n + 1, n + 2) if k >= 2])
            text = salt[: h.start()] + "H" + str(k) + salt[h.end() :] + water
            self.record(
                ln, "h", "formula", ln.formula, text, f"hydrogen count {n} changed to {k}", self.witness(sub)
            )
            ln.formula = text
            return True
        if sub_kind == "mm":
            p = ln.prev
            if (
                p is None
                or p.sub is None
                or p.plant is not None
                or p.mm is None
                or ln.mm is None
                or ln.mm_as_text
                or p.mm_decimals != ln.mm_decimals
                or abs(p.mm - ln.mm) < 1.0
            ):
                return False
            orig = ln.mm_text()
            new = round(p.mm, ln.mm_decimals)
            self.record(
                ln, "h", "molar_mass", orig, f"{new:.{ln.mm_decimals}f}",
                f"molar mass of row {p.row} ({p.sub.formula})", self.witness(sub),
            )  # fmt: skip
            ln.mm = new
            p.locked = True
            return True
        if ln.hyphenless_cas:
            return False
        others = [s for s in self.organic_subs if s.cas != sub.cas and not self.same_group(s, sub)]
        same_formula = [s for s in others if composition(s.formula) == composition(sub.formula)]
        t = (
            self.rng.choice(same_formula)
            if same_formula and self.rng.random() < 0.6
            else self.rng.choice(others)
        )
        self.record(
            ln, "h", "cas", ln.cas or "", t.cas, f"CAS RN of another organic ({t.names[0]}, {t.formula})",
            self.witness(sub) + f"; planted {t.cas} is {t.formula}",
        )  # fmt: skip
        ln.cas = t.cas
        return True

    def run(self) -> None:
        filters = {
            "a": lambda ln: bool(self.m.siblings(ln.sub)),
            "e": lambda ln: ln.sub.water > 0,
            "g": lambda ln: not ln.sub.organic and bool(ln.sub.confusions),
            "b": lambda ln: ln.prev is not None,
            "h": lambda ln: ln.sub.organic,
            "c": lambda ln: True,
            "d": lambda ln: not ln.sub.organic,
            "f": lambda ln: True,
        }
        for kind, subkinds in PLAN:
            fn = getattr(self, f"plant_{kind}")
            for sk in subkinds:
                cands = [ln for ln in self.lines if self.free(ln) and filters[kind](ln)]
                self.rng.shuffle(cands)
                for ln in cands:
                    if fn(ln) if sk is None else fn(ln, sk):
                        break
                else:
                    raise SystemExit(f"no line left to plant kind {kind} ({sk})")


# ---------------------------------------------------------------------------------------------------------
# Checks in memory
# ---------------------------------------------------------------------------------------------------------


def line_faults(ln: Line) -> list[str]:
    """The roles in which a compound line disagrees with its substance."""
    sub = ln.sub
    assert sub is not None
    try:
        ok_formula = ln.formula is None or composition(ln.formula) == composition(sub.formula)
    except Exception:  # a planted typo that reads as no formula
        ok_formula = False
    ok_mm = ln.mm is None or abs(ln.mm - molar_mass(sub.formula)) <= 0.5 * 10**-ln.mm_decimals + 1e-9
    ok_cas = ln.cas is None or ln.cas == sub.cas
    ok_name = ln.name.lower() in {n.lower() for n in sub.names}
    return [
        r
        for r, ok in (("formula", ok_formula), ("molar_mass", ok_mm), ("cas", ok_cas), ("name", ok_name))
        if not ok
    ]


def self_check(m: Maker) -> None:
    """A clean compound line agrees with its substance; a planted line differs in its planted cell only."""
    for fs in m.files:
        for sh in fs.sheets:
            for ln in sh.lines:
                if ln.sub is None:
                    assert ln.plant is None and ln.formula is None and ln.mm is None and ln.cas is None
                    continue
                bad = line_faults(ln)
                if ln.plant is None:
                    assert not bad, (fs.name, sh.title, ln.row, bad)
                else:
                    assert bad == [ln.plant["role"]], (fs.name, sh.title, ln.row, bad, ln.plant)


# ---------------------------------------------------------------------------------------------------------
# Writing
# ---------------------------------------------------------------------------------------------------------


def cell_value(ln: Line, role: str, decimal_comma: bool = False) -> object:
    if role == "name":
        return ln.name + ln.name_suffix
    if role == "formula":
        return ln.formula
    if role == "mm":
        if ln.mm is None:
            return None
        text = ln.mm_text()
        if decimal_comma:
            return text.replace(".", ",")
        if ln.mm_as_text == "plain":
            return text
        if ln.mm_as_text == "unit":
            return f"{text} g/mol"
        return ln.mm
    if role == "cas":
        if ln.cas and ln.hyphenless_cas:
            return int(ln.cas.replace("-", ""))
        return ln.cas
    value = ln.extras.get(role)
    if role == "hazard" and value == "None":
        return ""
    return value


def write_xlsx(fs: FileSpec) -> None:
    wb = Workbook()
    wb.remove(wb.active)
    bold = Font(bold=True)
    fill = PatternFill("solid", fgColor="E2EFDA")
    for sh in fs.sheets:
        ws = wb.create_sheet(sh.title)
        ncol = len(sh.headers)
        header_row = 0
        for row, (kind, obj) in enumerate(sh.layout, 1):
            if kind == "title":
                cell = ws.cell(row=row, column=1, value=obj)
                cell.font = Font(bold=row == 1, size=14 if row == 1 else 10, italic=row > 2)
                if row == 1 and sh.merge_title:
                    ws.merge_cells(start_row=1, start_column=1, end_row=1, end_column=min(ncol, 8))
            elif kind == "header":
                header_row = row
                for c, (head, _) in enumerate(sh.headers, 1):
                    cell = ws.cell(row=row, column=c, value=head)
                    cell.font = bold
                    cell.fill = fill
                    cell.alignment = Alignment(wrap_text=True, vertical="top")
                ws.freeze_panes = ws.cell(row=row + 1, column=1)
            elif kind == "section":
                col = next(c for c, (_, r) in enumerate(sh.headers, 1) if r == "name")
                ws.cell(row=row, column=col, value=obj).font = Font(bold=True, italic=True)
            elif kind == "line":
                ln = obj
                assert isinstance(ln, Line) and ln.row == row
                for c, (_, role) in enumerate(sh.headers, 1):
                    v = cell_value(ln, role)
                    if v is None or v == "":
                        continue
                    cell = ws.cell(row=row, column=c, value=v)
                    if role == "mm" and isinstance(v, float):
                        cell.number_format = "0." + "0" * ln.mm_decimals
                    elif isinstance(v, dt.date):
                        cell.number_format = "DD/MM/YYYY"
                    elif role == "cas" and isinstance(v, int):
                        cell.number_format = "0"
        if sh.autofilter:
            ws.auto_filter.ref = f"A{header_row}:{get_column_letter(ncol)}{len(sh.layout)}"
        widths = {"name": 44, "formula": 22, "mm": 11, "cas": 13, "hstat": 20, "notes": 16}
        for c, (_, role) in enumerate(sh.headers, 1):
            ws.column_dimensions[get_column_letter(c)].width = widths.get(role, 12)
    for title, rows in fs.extra_sheets:
        ws = wb.create_sheet(title)
        for r, values in enumerate(rows, 1):
            for c, v in enumerate(values, 1):
                ws.cell(row=r, column=c, value=v).font = Font(bold=r == 1)
        ws.column_dimensions["A"].width = 10
        ws.column_dimensions["B"].width = 60
    wb.properties.creator = fs.creator
    wb.properties.lastModifiedBy = fs.creator
    wb.properties.created = FIXED_TIME
    wb.properties.modified = FIXED_TIME
    buf = io.BytesIO()
    wb.save(buf)
    (OUT / fs.name).write_bytes(rezip_fixed(buf.getvalue()))


def rezip_fixed(data: bytes) -> bytes:
    """Rewrite the package with fixed member timestamps and a fixed modified date, so runs are identical."""
    src = zipfile.ZipFile(io.BytesIO(data))
    out = io.BytesIO()
    stamp = FIXED_TIME.strftime("%Y-%m-%dT%H:%M:%SZ").encode()
    with zipfile.ZipFile(out, "w", zipfile.ZIP_DEFLATED) as dst:
        for info in src.infolist():
            body = src.read(info.filename)
            if info.filename == "docProps/core.xml":
                for tag in (rb"dcterms:modified", rb"dcterms:created"):
                    body = re.sub(
                        rb"(<" + tag + rb"[^>]*>)[^<]*(</" + tag + rb">)",
                        lambda mt: mt.group(1) + stamp + mt.group(2),
                        body,
                    )
            zi = zipfile.ZipInfo(info.filename, date_time=FIXED_TIME.timetuple()[:6])
            zi.compress_type = zipfile.ZIP_DEFLATED
            dst.writestr(zi, body)
    return out.getvalue()


def write_csv(fs: FileSpec) -> None:
    sh = fs.sheets[0]
    semicolon = fs.kind == "csv-semicolon"
    buf = io.StringIO()
    w = csv.writer(buf, delimiter=";" if semicolon else ",", lineterminator=fs.newline)
    for kind, obj in sh.layout:
        if kind == "title":
            w.writerow([obj])
        elif kind == "blank":
            w.writerow([])
        elif kind == "header":
            w.writerow([h for h, _ in sh.headers])
        elif kind == "line":
            ln = obj
            assert isinstance(ln, Line)
            vals = []
            for _, role in sh.headers:
                v = cell_value(ln, role, decimal_comma=semicolon)
                if isinstance(v, float):
                    v = ln.mm_text()
                vals.append("" if v is None else str(v))
            w.writerow(vals)
    (OUT / fs.name).write_bytes(buf.getvalue().encode(fs.encoding))


def write_truth(fs: FileSpec) -> tuple[int, int]:
    truth_rows = []
    clean_rows = []
    for sh in fs.sheets:
        col_of = {role: get_column_letter(i) for i, (_, role) in enumerate(sh.headers, 1)}
        for ln in sh.lines:
            if ln.plant:
                p = ln.plant
                role_key = {"name": "name", "formula": "formula", "molar_mass": "mm", "cas": "cas"}[p["role"]]
                assert ln.sub
                truth_rows.append(
                    [fs.name, sh.title, ln.row, p["kind"], col_of[role_key], p["role"], p["original"],
                     p["planted"], p["source"], p["detail"], ln.sub.key]
                )  # fmt: skip
            else:
                clean_rows.append([fs.name, sh.title, ln.row])
    with open(OUT / f"{fs.name}.truth.csv", "w", newline="", encoding="utf-8") as fh:
        w = csv.writer(fh)
        w.writerow(
            ["file", "sheet", "row", "kind", "planted_cell_column", "planted_role", "original_value",
             "planted_value", "source", "detail", "substance"]
        )  # fmt: skip
        w.writerows(truth_rows)
    with open(OUT / f"{fs.name}.clean.csv", "w", newline="", encoding="utf-8") as fh:
        w = csv.writer(fh)
        w.writerow(["file", "sheet", "row"])
        w.writerows(clean_rows)
    return len(truth_rows), len(clean_rows)


# ---------------------------------------------------------------------------------------------------------
# Reading the written files back
# ---------------------------------------------------------------------------------------------------------


def read_tables(fs: FileSpec) -> dict[str, tuple[dict[str, str], dict[int, dict[str, object]]]]:
    """{sheet: ({column letter: role}, {row: {column letter: value}})} for the rows below each header row,
    the header row found by its headings as a reader would find it."""
    path = OUT / fs.name
    out: dict[str, tuple[dict[str, str], dict[int, dict[str, object]]]] = {}
    if fs.kind == "xlsx":
        wb = load_workbook(path)
        grids = [(ws.title, [[c.value for c in row] for row in ws.iter_rows()]) for ws in wb.worksheets]
    else:
        text = path.read_bytes().decode(fs.encoding)
        grids = [
            (
                "",
                list(
                    csv.reader(
                        io.StringIO(text, newline=""), delimiter=";" if fs.kind == "csv-semicolon" else ","
                    )
                ),
            )
        ]
    specs = {sh.title: sh for sh in fs.sheets}
    for title, grid in grids:
        if title not in specs:
            continue
        sh = specs[title]
        roles = {h: r for h, r in sh.headers if r in ROLE_KEYS}
        header_idx = next(i for i, row in enumerate(grid) if sum(1 for v in row if v in roles) == len(roles))
        header = {get_column_letter(i + 1): roles[v] for i, v in enumerate(grid[header_idx]) if v in roles}
        rows: dict[int, dict[str, object]] = {}
        for i in range(header_idx + 1, len(grid)):
            rows[i + 1] = {get_column_letter(j + 1): v for j, v in enumerate(grid[i]) if v not in (None, "")}
        out[title] = (header, rows)
    return out


def strip_grade(name: str) -> str:
    for grade in GRADES:
        if name.lower().endswith(grade.lower()):
            return name[: -len(grade)]
    return name


def read_back(m: Maker) -> None:
    """Read the written files again, as a user's program would, and check them against the truth files:
    every planted cell holds its planted value, every clean compound line agrees with the record its CAS RN
    (or its name) points to, and every filled row below the header is a listed data line or a section row."""
    by_cas = {s.cas: s for s in m.subs}
    by_name: dict[str, Substance] = {}
    for s in m.subs:
        for n in s.names:
            by_name[n.lower()] = s
    for fs in m.files:
        with open(OUT / f"{fs.name}.truth.csv", newline="", encoding="utf-8") as fh:
            planted = list(csv.DictReader(fh))
        with open(OUT / f"{fs.name}.clean.csv", newline="", encoding="utf-8") as fh:
            clean = list(csv.DictReader(fh))
        tables = read_tables(fs)
        listed: set[tuple[str, int]] = set()
        for r in planted + clean:
            key = (r["sheet"], int(r["row"]))
            assert key not in listed, (fs.name, key)
            listed.add(key)
        sections = {
            (sh.title, i + 1) for sh in fs.sheets for i, (k, _) in enumerate(sh.layout) if k == "section"
        }
        for sheet, (_, rows) in tables.items():
            for rownum, cells in rows.items():
                if cells:
                    assert (sheet, rownum) in listed or (sheet, rownum) in sections, (fs.name, sheet, rownum)
        for r in planted:
            header, rows = tables[r["sheet"]]
            value = rows[int(r["row"])].get(r["planted_cell_column"])
            if r["planted_role"] == "molar_mass":
                assert abs(float(str(value).replace(",", ".")) - float(r["planted_value"])) < 1e-9, (
                    fs.name,
                    r,
                )
            else:
                assert str(value).strip() == r["planted_value"], (fs.name, r, value)
        for r in clean:
            header, rows = tables[r["sheet"]]
            cells = rows[int(r["row"])]
            col = {role: c for c, role in header.items()}
            name = str(cells.get(col["name"], "")).strip()
            formula = cells.get(col["formula"])
            mm = cells.get(col["mm"])
            cas = cells.get(col["cas"])
            if cas:
                cas = str(cas)
                if "-" not in cas:
                    cas = f"{cas[:-3]}-{cas[-3:-1]}-{cas[-1]}"
                sub = by_cas[cas]
            else:
                sub = by_name.get(name.lower()) or by_name.get(strip_grade(name).lower())
                if sub is None:
                    assert not formula and not mm, (fs.name, r, name)  # a mixture or product line
                    continue
            known = {n.lower() for n in sub.names}
            assert name.lower() in known or strip_grade(name).lower() in known, (fs.name, r, name, sub.key)
            if formula:
                assert composition(str(formula)) == composition(sub.formula), (fs.name, r, formula)
            if mm is not None:
                text = str(mm).replace(" g/mol", "").replace(",", ".")
                decimals = len(text.split(".")[1]) if "." in text else 0
                assert abs(float(text) - molar_mass(sub.formula)) <= 0.5 * 10**-decimals + 1e-9, (
                    fs.name,
                    r,
                    mm,
                )


# ---------------------------------------------------------------------------------------------------------


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument(
        "--no-verify", action="store_true", help="skip the check of the substances against chemicals"
    )
    args = ap.parse_args()
    subs = load()
    if not args.no_verify:
        verify(subs)
    m = Maker(subs)
    build(m)
    Planter(m).run()
    self_check(m)
    OUT.mkdir(exist_ok=True)
    kinds: Counter[str] = Counter()
    total = planted_total = compound = organic = 0
    used: set[str] = set()
    for fs in m.files:
        if fs.kind == "xlsx":
            write_xlsx(fs)
        else:
            write_csv(fs)
        planted, clean = write_truth(fs)
        total += planted + clean
        planted_total += planted
        for sh in fs.sheets:
            for ln in sh.lines:
                if ln.plant:
                    kinds[ln.plant["kind"]] += 1
                if ln.sub is not None:
                    compound += 1
                    organic += ln.sub.organic
                    used.add(ln.sub.key)
        print(f"{fs.name}: {planted + clean} lines, {planted} planted")
    read_back(m)
    print(
        f"total: {total} lines, {planted_total} planted, {total - planted_total} clean; "
        f"by kind: {dict(sorted(kinds.items()))}"
    )
    print(
        f"compound lines: {compound} (organic {organic}, {100 * organic / compound:.0f} %); "
        f"product lines: {total - compound}"
    )
    print(f"substances used: {len(used)} of {len(subs)}")


if __name__ == "__main__":
    main()
