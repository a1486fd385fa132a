"""Write the stock-list and supplier-table workbooks with planted errors, and their ground truth.

Run from any folder with a Python that has openpyxl, molmass and (for the check) chemicals:

    python evaluation/workbooks/make_workbooks.py            # verify the substances, then write files/
    python evaluation/workbooks/make_workbooks.py --no-verify

Everything is drawn from one fixed random seed, so a run writes the same cells every time (the workbook
packages are also written with fixed timestamps, so the files are byte-identical between runs).

What is written into files/:

- eight .xlsx workbooks and two .csv exports, laid out the way a college stockroom, a prep room and two
  suppliers keep them (title rows, varied headings, extra columns, blank rows, partly filled lines,
  second sheets);
- <file>.truth.csv: one row per planted error (exactly one per planted line);
- <file>.clean.csv: every data line that carries no planted error.

The scenario (Harrowgate Vale Technical College, Brindlecombe Chemicals, Oskarsen Labware, the people's
initials, catalogue numbers and prices) is invented. The substances are real; see stock_substances.py.
"""

from __future__ import annotations

import argparse
import csv
import datetime as dt
import io
import itertools
import random
import re
import sys
import zipfile
from collections import Counter
from dataclasses import dataclass, field
from pathlib import Path

from molmass import Formula
from openpyxl import Workbook
from openpyxl.styles import Alignment, Font, PatternFill
from openpyxl.utils import get_column_letter

sys.path.insert(0, str(Path(__file__).resolve().parent))
from stock_substances import Substance, load

SEED = 20240917
HERE = Path(__file__).resolve().parent
OUT = HERE / "files"
FIXED_TIME = dt.datetime(2024, 9, 17, 9, 0, 0)
PLANTS_PER_KIND = 22

# ---------------------------------------------------------------------------------------------------------
# Chemistry helpers (molmass is the witness for every molar mass written)
# ---------------------------------------------------------------------------------------------------------


def composition(formula: str) -> dict[str, int]:
    """Element counts of a formula; parts joined by a middle dot or a full stop are added, a leading
    number multiplies its part (molmass reads "C2H2O4.2H2O" as a decimal count, so parts are split here)."""
    total: Counter[str] = Counter()
    for part in re.split(r"\s*[·.]\s*", formula.strip()):
        m = re.match(r"^(\d*)(.+)$", part)
        if not m:
            raise ValueError(f"cannot read {formula!r}")
        mult = int(m.group(1) or 1)
        for sym, item in Formula(m.group(2)).composition().items():
            total[sym] += mult * item.count
    return dict(total)


def molar_mass(formula: str) -> float:
    total = 0.0
    for part in re.split(r"\s*[·.]\s*", formula.strip()):
        m = re.match(r"^(\d*)(.+)$", part)
        assert m
        total += int(m.group(1) or 1) * Formula(m.group(2)).mass
    return total


def cas_check_ok(cas: str) -> bool:
    m = re.fullmatch(r"(\d{2,7})-(\d{2})-(\d)", cas)
    if not m:
        return False
    body = (m.group(1) + m.group(2))[::-1]
    return sum((i + 1) * int(d) for i, d in enumerate(body)) % 10 == int(m.group(3))


def hill(sub: Substance) -> str:
    """Hill formula of the salt part, hydrate water kept after a middle dot (as catalogues print it)."""
    salt = sub.anhydrous_formula.replace("·", "")
    text = Formula(salt).formula
    if sub.water:
        text += "·" + (str(sub.water) if sub.water > 1 else "") + "H2O"
    return text


def verify(subs: list[Substance]) -> None:
    """Repeat the checks every record passed when it was written: check digit, witness record, displays."""
    from chemicals.identifiers import search_chemical

    bad = []
    for s in subs:
        if not cas_check_ok(s.cas):
            bad.append(f"{s.key}: check digit of {s.cas}")
        mine = composition(s.formula)
        for d in s.displays:
            if composition(d) != mine:
                bad.append(f"{s.key}: display {d} is not {s.formula}")
        try:
            rec = search_chemical(s.cas)
        except Exception as exc:  # the witness raises when it has no record
            bad.append(f"{s.key}: no witness record for {s.cas} ({exc})")
            continue
        if rec.CASs != s.cas or composition(rec.formula) != mine:
            bad.append(f"{s.key}: witness has {rec.CASs} {rec.formula}, record says {s.cas} {s.formula}")
    if bad:
        raise SystemExit("substance records disagree with the witness:\n" + "\n".join(bad))


# ---------------------------------------------------------------------------------------------------------
# Pools of substances for each kind of sheet
# ---------------------------------------------------------------------------------------------------------

SOLVENTS = (
    "ethanol methanol acetone ipa npa butanol butan2ol tbuoh ibuoh pentanol etoac ether hexane heptane "
    "cyclohexane cyclohexene cyclohexanol toluene pxylene dcm chcl3 mecn dmso dmf thf dioxane glycerol eg "
    "acoh hcooh hcho bromobutane tbucl mebenzoate mesal isoamylac benzaldehyde"
).split()
INDICATORS = "phph mered btb bcg thymolblue ebt murexide fluorescein crystalviolet congored".split()
BUFFERS = "tris hepes mops pipes glycine bicine tricine imidazole edta khp".split()
SUGARS = (
    "glucose sucrose fructose lactose_1 lactose maltose_1 galactose mannitol sorbitol arabinose ribose "
    "inositol"
).split()
AMINO = (
    "alanine valine leucine isoleucine serine threonine proline phenylalanine tyrosine tryptophan aspartic "
    "glutamic glutamine lysinehcl arginine histidine cysteine methionine taurine balanine"
).split()
ORG_SALTS = (
    "naoac naoac_3 nh4oac kooac na3cit_2 na3cit citric citric_1 oxalic_2 oxalic naox nh4ox_1 kox_1 naformate "
    "mgoac_4 znoac_2 znoac cuoac_1 cuoac pboac_3 pboac rochelle tartaric nabenzoate ksorbate lactic sds "
    "nasal "
    "succinic malonic maleic fumaric adipic"
).split()
ORG_MISC = (
    "salicylic aspirin phenol aniline benzoic urea thiourea caffeine ascorbic naascorbate nicotinamide "
    "thymol "
    "vanillin naphthalene stearic oleic palmitic lauric hmta acetanilide paracetamol resorcinol hydroquinone "
    "catechol pyrogallol ninhydrin"
).split()
ACIDS_BASES = "h2so4 hcl hno3 h3po4 h3bo3 h2o2 naoh koh caoh2".split()
MEDIA_SALTS = (
    "nacl kcl mgso4_7 mgso4 cacl2_2 cacl2 na2hpo4_12 na2hpo4 nah2po4_2 nah2po4_1 nah2po4 kh2po4 k2hpo4 "
    "nahco3 na2co3 nh42so4 nh4cl feso4_7 znso4_7 cuso4_5 mgcl2 na2s2o3_5 borax h3bo3 na2moo4_2 coso4_7 "
    "mncl2 naoh hcl"
).split()

MIXTURES = [
    ("Universal indicator solution", "Harmful"),
    ("Universal indicator paper, pH 1-14", "None"),
    ("Litmus paper, blue", "None"),
    ("Litmus paper, red", "None"),
    ("Petroleum spirit 40-60", "Flammable"),
    ("Petroleum spirit 60-80", "Flammable"),
    ("Industrial methylated spirit 99% (IMS)", "Flammable"),
    ("Buffer solution pH 4.00", "None"),
    ("Buffer solution pH 7.00", "None"),
    ("Buffer solution pH 9.20", "None"),
    ("Agar, bacteriological", "None"),
    ("Nutrient broth", "None"),
    ("Starch, soluble", "None"),
    ("Benedict's reagent (qualitative)", "None"),
    ("Fehling's solution A", "Harmful"),
    ("Fehling's solution B", "Corrosive"),
    ("Biuret reagent", "Corrosive"),
    ("Limewater", "Irritant"),
    ("Liquid paraffin", "None"),
    ("Petroleum jelly, white", "None"),
    ("Glass wool", "Irritant"),
    ("Soda lime granules, self-indicating", "Corrosive"),
    ("Activated charcoal, granular", "None"),
    ("Sand, washed and dried", "None"),
    ("Lugol's iodine solution", "Harmful"),
    ("Gram stain kit", "Flammable"),
    ("Silicone oil, for heating baths", "None"),
    ("Steel wool, fine", "None"),
    ("Cotton wool, non-absorbent", "None"),
    ("Diatomaceous earth (filter aid)", "None"),
]

GRADES = [
    " AR",
    " GPR",
    ", LR",
    ", ACS reagent",
    " extra pure",
    ", for analysis",
    ", reagent grade",
    ", laboratory reagent",
    " 99%",
    " ≥99.5%",
]
GRADE_COLUMN = ["AR", "GPR", "LR", "ACS", "Reag. Ph. Eur.", "HPLC", "Technical", "Extra pure", "For analysis"]
SUPPLIERS = [
    "Brindlecombe Chemicals",
    "Oskarsen Labware",
    "Marrowby Scientific",
    "Quillfeather Reagents",
    "Ashcombe Lab Supply",
]
INITIALS = ["SM", "RT", "JKB", "AP", "LW", "HD", "NO'C", "EV"]
DEPTS = ["Chemistry", "Biology", "Applied Science", "Environmental", "Foundation"]


def formula_typos(
    formula: str, right: str, sub_kind: str, element_case: dict[str, str] | None = None
) -> list[tuple[str, str]]:
    """(typo, what was changed) for a formula: element symbols in the wrong case, a count
    changed or a subscript dropped (``sub_kind`` 'case', 'count' or 'drop'); only typos that
    are not the right formula's composition. ``element_case`` maps symbols to their
    miscased forms (default: ELEMENT_CASE)."""
    salt, water = split_water(formula)
    cands: list[tuple[str, str]] = []
    if sub_kind == "case":
        for el, up in (ELEMENT_CASE if element_case is None else element_case).items():
            for mt in re.finditer(el + r"(?![a-z])", salt):
                cands.append(
                    (
                        salt[: mt.start()] + up + salt[mt.end() :] + water,
                        f"element case: {el} written {up}",
                    )
                )
    elif sub_kind == "count":
        for mt in re.finditer(r"(?<=[A-Za-z)])\d+", salt):
            n = int(mt.group(0))
            for new in sorted({n + 1, n - 1} - {0, 1, n}):
                cands.append(
                    (
                        salt[: mt.start()] + str(new) + salt[mt.end() :] + water,
                        f"count {n} changed to {new}",
                    )
                )
        for mt in re.finditer(r"(?<=[a-z)])(?=[A-Z(]|$)", salt):
            cands.append((salt[: mt.start()] + "2" + salt[mt.start() :] + water, "count 1 changed to 2"))
    elif sub_kind == "drop":
        for mt in re.finditer(r"(?<=[A-Za-z)])\d+", salt):
            cands.append((salt[: mt.start()] + salt[mt.end() :] + water, f"subscript {mt.group(0)} dropped"))
    good = []
    for text, why in cands:
        try:
            if composition(text) == composition(right):
                continue
        except Exception:
            pass  # a typo that is no formula at all is a fine typo
        good.append((text, why))
    return good


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
    formula: str | None = None
    mm: float | None = None  # printed molar mass
    mm_decimals: int = 2
    mm_as_text: bool = False
    cas: str | None = None
    extras: dict[str, object] = field(default_factory=dict)
    name_suffix: str = ""
    prev: Line | None = None  # the data line on the row directly above, if any
    plant: dict | None = None
    locked: bool = False  # another line's planted error depends on this line staying correct
    hyphenless_cas: bool = False
    style: str = ""

    @property
    def complete(self) -> bool:
        return bool(self.name and self.formula and self.mm is not None and self.cas)

    def mm_text(self, value: float | None = None) -> str:
        v = self.mm if value is None else value
        return "" if v is None else f"{v:.{self.mm_decimals}f}"


@dataclass
class SheetSpec:
    title: str
    titles: list[str]
    headers: list[tuple[str, str]]  # (heading, role or extra key)
    lines: list[Line] = field(default_factory=list)
    blank_after_titles: int = 1
    layout: list[tuple[str, object]] = field(
        default_factory=list
    )  # ("title"|"blank"|"header"|"line"|"section", x)
    header_row: int = 0


@dataclass
class FileSpec:
    name: str
    sheets: list[SheetSpec]
    kind: str = "xlsx"  # xlsx | csv-comma | csv-semicolon
    extra_sheets: list[tuple[str, list[str]]] = field(default_factory=list)  # text-only sheets


HEADER_ROLES: list[dict[str, str]] = []  # the headings of the name, formula, mm and cas columns


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

    # -- substances ------------------------------------------------------------------------------------
    def pool(self, *lists: list[str]) -> list[Substance]:
        keys: list[str] = []
        for lst in lists:
            keys.extend(k for k in lst if k in self.by_key and k not in keys)
        return [self.by_key[k] for k in keys]

    def inorganic(self) -> list[Substance]:
        return [s for s in self.subs if not s.organic]

    def organic(self) -> list[Substance]:
        return [s for s in self.subs if s.organic]

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

    # -- cell values -----------------------------------------------------------------------------------
    def formula_display(self, sub: Substance, style: str) -> str:
        """style: 'as-written' (canonical or one of the displays), 'hill' (organics in Hill order),
        'dot' (full stop for the middle dot), 'spaced' (' · ')."""
        f = sub.formula
        r = self.rng.random()
        if style == "hill" and sub.organic:
            f = hill(sub)
        elif style == "as-written" and sub.displays and r < 0.35:
            f = self.rng.choice(sub.displays)
        if "·" in f:
            if style == "dot" or (style == "as-written" and r > 0.8):
                f = f.replace("·", ".")
            elif style == "spaced":
                f = f.replace("·", " · ")
        return f

    def name_for(self, sub: Substance, grade_p: float, upper_p: float = 0.0) -> tuple[str, str]:
        name = self.rng.choice(sub.names)
        suffix = ""
        plain = not any(ch in name for ch in ",%") and not re.search(r"\d", name) and "grade" not in name
        if plain and self.rng.random() < grade_p:
            suffix = self.rng.choice(GRADES)
        if self.rng.random() < upper_p:
            name, suffix = name.upper(), suffix.upper()
        return name, suffix

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
        partial_p: float = 0.06,
        mixture: tuple[str, str] | None = None,
    ) -> Line:
        line = Line(file=file, sheet=sheet, sub=sub, mm_decimals=decimals)
        if sub is None:
            assert mixture is not None
            line.name = mixture[0]
            line.extras["hazard"] = mixture[1]
            return line
        line.name, line.name_suffix = self.name_for(sub, grade_p, upper_p)
        line.formula = self.formula_display(sub, fstyle)
        line.mm = round(molar_mass(sub.formula), decimals)
        line.cas = sub.cas
        line.extras["hazard"] = sub.hazard
        if self.rng.random() < partial_p:
            # a line filled in only in part: one or two of formula, molar mass, CAS left empty
            missing = self.rng.choice([("mm",), ("cas",), ("formula",), ("mm", "cas"), ("formula", "mm")])
            for role in missing:
                setattr(line, role, None)
        return line

    # -- layouts ---------------------------------------------------------------------------------------
    def lay_out(self, sheet: SheetSpec, blank_p: float, sections: dict[int, str] | None = None) -> None:
        """Assign sheet rows: titles, blank row(s), header, then data with the odd blank row."""
        HEADER_ROLES.append({h: r for h, r in sheet.headers if r in ("name", "formula", "mm", "cas")})
        row = 0
        for t in sheet.titles:
            row += 1
            sheet.layout.append(("title", t))
        for _ in range(sheet.blank_after_titles if sheet.titles else 0):
            row += 1
            sheet.layout.append(("blank", None))
        row += 1
        sheet.header_row = row
        sheet.layout.append(("header", None))
        prev: Line | None = None
        for i, line in enumerate(sheet.lines):
            if sections and i in sections:
                row += 1
                sheet.layout.append(("section", sections[i]))
                prev = None
            elif i and self.rng.random() < blank_p:
                row += 1
                sheet.layout.append(("blank", None))
                prev = None
            row += 1
            line.row = row
            line.prev = prev
            sheet.layout.append(("line", line))
            prev = line


# ---------------------------------------------------------------------------------------------------------
# The ten files
# ---------------------------------------------------------------------------------------------------------


SORT_PREFIX = re.compile(
    r"^(?:\d+(?:,\d+)*-|(?:n|p|sec|tert|cis|trans|alpha|beta|myo|meso|di|tri|dl|d|l)(?:\([+-]\))?-|[dl]\([+-]\)-)+",
    re.IGNORECASE,
)


def sort_by_name(lines: list[Line]) -> list[Line]:
    """Alphabetical, as catalogues sort: locants, D/L and di-/tri- prefixes set aside."""
    return sorted(lines, key=lambda ln: SORT_PREFIX.sub("", ln.name).lower())


LIQUID_WORDS = re.compile(r"solution|reagent|oil|paraffin|spirit|acid \d|acid,? conc|%", re.IGNORECASE)


def is_liquid(ln: Line) -> bool:
    if ln.sub is not None and ln.sub.key in SOLVENTS + ACIDS_BASES + ["lactic"]:
        return ln.sub.key not in ("naoh", "koh", "caoh2", "h3bo3")
    return bool(LIQUID_WORDS.search(ln.name))


def add_mixtures(m: Maker, file: str, sheet: str, n: int, decimals: int) -> list[Line]:
    picks = m.rng.sample(MIXTURES, n)
    return [m.make_line(file, sheet, None, decimals=decimals, fstyle="", mixture=p) for p in picks]


def build(m: Maker) -> None:
    rng = m.rng
    locations_chem = [
        "Store 1 / A",
        "Store 1 / B",
        "Store 1 / C",
        "Prep room / shelf 2",
        "Balance room",
        "Store 2",
    ]

    # 1. Chemistry stockroom ------------------------------------------------------------------------------
    f = "hvtc_chemistry_stockroom_2024.xlsx"
    inorg = SheetSpec(
        "Inorganic",
        [
            "Harrowgate Vale Technical College - Chemistry Stockroom",
            "Inorganic stock list. Stock check: S. Marlowe, 02/09/2024",
        ],
        [
            ("Item No.", "item"),
            ("Chemical", "name"),
            ("Formula", "formula"),
            ("MW", "mm"),
            ("CAS No.", "cas"),
            ("Qty", "qty"),
            ("Unit", "unit"),
            ("Location", "location"),
            ("Supplier", "supplier"),
            ("Hazard", "hazard"),
            ("Date opened", "date"),
        ],
    )
    subs = m.draw(m.inorganic(), 118)
    inorg.lines = [
        m.make_line(f, inorg.title, s, decimals=2, fstyle="as-written", grade_p=0.15) for s in subs
    ]
    inorg.lines += add_mixtures(m, f, inorg.title, 2, 2)
    inorg.lines = sort_by_name(inorg.lines)
    org = SheetSpec(
        "Organic",
        [
            "Harrowgate Vale Technical College - Chemistry Stockroom",
            "Organic stock list (solvents in cabinet F1/F2)",
        ],
        [
            ("Item No.", "item"),
            ("Chemical", "name"),
            ("Formula", "formula"),
            ("MW", "mm"),
            ("CAS No.", "cas"),
            ("Qty", "qty"),
            ("Unit", "unit"),
            ("Location", "location"),
            ("Supplier", "supplier"),
            ("Hazard", "hazard"),
        ],
    )
    subs = m.draw(m.pool(SOLVENTS, ORG_MISC, INDICATORS, ORG_SALTS), 108)
    org.lines = [m.make_line(f, org.title, s, decimals=2, fstyle="as-written", grade_p=0.1) for s in subs]
    org.lines += add_mixtures(m, f, org.title, 4, 2)
    org.lines = sort_by_name(org.lines)
    for sh, prefix in ((inorg, "IN"), (org, "OR")):
        for i, ln in enumerate(sh.lines, 1):
            ln.extras.update(
                item=f"{prefix}-{i:04d}",
                qty=rng.choice([25, 50, 100, 250, 500, 500, 1000, 2500]),
                unit="mL" if is_liquid(ln) else "g",
                location=rng.choice(locations_chem),
                supplier=rng.choice(SUPPLIERS),
                date=dt.date(2019, 1, 1) + dt.timedelta(days=rng.randrange(0, 2000))
                if rng.random() < 0.7
                else None,
            )
    m.lay_out(inorg, 0.03)
    m.lay_out(org, 0.03)
    m.files.append(FileSpec(f, [inorg, org]))

    # 2. Biology prep room -------------------------------------------------------------------------------
    f = "hvtc_biology_prep_room.xlsx"
    prep = SheetSpec(
        "Prep room stock",
        [
            "HVTC Biology prep room - chemical stock",
            "Buffers, sugars, amino acids and media salts. Keep this sheet up to date!",
        ],
        [
            ("Name of chemical", "name"),
            ("Mol. formula", "formula"),
            ("Mol. wt (g/mol)", "mm"),
            ("CAS-Nr.", "cas"),
            ("Amount", "amount"),
            ("Shelf", "location"),
            ("Supplier", "supplier"),
            ("Expiry", "date"),
        ],
    )
    subs = (
        m.draw(m.pool(BUFFERS, SUGARS, AMINO), 52)
        + m.draw(m.pool(MEDIA_SALTS), 40)
        + m.draw(m.pool(ORG_SALTS), 26)
    )
    prep.lines = [m.make_line(f, prep.title, s, decimals=2, fstyle="hill", grade_p=0.05) for s in subs]
    prep.lines = sort_by_name(prep.lines)
    stains = SheetSpec(
        "Media & stains",
        ["Media, stains and indicators"],
        [
            ("Name of chemical", "name"),
            ("Mol. formula", "formula"),
            ("Mol. wt (g/mol)", "mm"),
            ("CAS-Nr.", "cas"),
            ("Amount", "amount"),
            ("Shelf", "location"),
            ("Notes", "notes"),
        ],
    )
    subs = m.draw(m.pool(INDICATORS, ["glycerol", "ethanol", "sds", "urea", "phenol", "acoh"]), 16)
    stains.lines = [m.make_line(f, stains.title, s, decimals=2, fstyle="hill") for s in subs]
    stains.lines += add_mixtures(m, f, stains.title, 14, 2)
    rng.shuffle(stains.lines)
    for sh in (prep, stains):
        for ln in sh.lines:
            ln.extras.update(
                amount=f"{rng.choice([5, 10, 25, 50, 100, 250, 500, 1000])} {'mL' if is_liquid(ln) else 'g'}",
                location=rng.choice(["Shelf 1", "Shelf 2", "Shelf 3", "Fridge", "Cold room", "Cupboard D"]),
                supplier=rng.choice(SUPPLIERS),
                date=dt.date(2024, 6, 1) + dt.timedelta(days=rng.randrange(0, 1400))
                if rng.random() < 0.6
                else None,
                notes=rng.choice(["", "", "opened", "0.1% in water", "for Gram stain", "check expiry", ""]),
            )
    m.lay_out(prep, 0.02)
    m.lay_out(stains, 0.05)
    m.files.append(FileSpec(f, [prep, stains]))

    # 3. Brindlecombe price list --------------------------------------------------------------------------
    f = "brindlecombe_chemicals_price_list_2024.xlsx"
    price = SheetSpec(
        "Price list 2024",
        [
            "Brindlecombe Chemicals Ltd - Laboratory Reagents Price List 2024",
            "Prices in GBP excluding VAT. Valid from 1 March 2024. E&OE.",
        ],
        [
            ("Cat. No.", "catno"),
            ("Product description", "name"),
            ("Grade", "grade"),
            ("Formula", "formula"),
            ("Mol. wt.", "mm"),
            ("CAS No.", "cas"),
            ("Pack size", "pack"),
            ("Price (£)", "price"),
            ("Hazard", "hazard"),
        ],
    )
    subs = m.draw(m.organic(), 80) + m.draw(m.inorganic(), 52)
    price.lines = [m.make_line(f, price.title, s, decimals=2, fstyle="hill", partial_p=0.03) for s in subs]
    price.lines = sort_by_name(price.lines)
    for i, ln in enumerate(price.lines):
        ln.extras.update(
            catno=f"BC{10400 + 7 * i}",
            grade=rng.choice(GRADE_COLUMN),
            pack=rng.choice(["100 g", "250 g", "500 g", "1 kg", "500 mL", "1 L", "2.5 L"]),
            price=round(rng.uniform(6, 180), 2),
        )
    m.lay_out(price, 0.0)
    m.files.append(FileSpec(f, [price]))

    # 4. Oskarsen quotation -------------------------------------------------------------------------------
    f = "oskarsen_labware_quotation_Q2417.xlsx"
    quote = SheetSpec(
        "Quotation",
        [
            "Oskarsen Labware AS - Quotation Q-2417",
            "Customer: Harrowgate Vale Technical College, Science Faculty. Valid 30 days.",
        ],
        [
            ("Pos.", "pos"),
            ("Art.-Nr.", "catno"),
            ("Description", "name"),
            ("Chemical formula", "formula"),
            ("M (g/mol)", "mm"),
            ("CAS-Nr.", "cas"),
            ("Qty", "qty"),
            ("Unit price EUR", "price"),
            ("Total EUR", "total"),
        ],
    )
    subs = m.draw(m.pool(MEDIA_SALTS, BUFFERS, ORG_SALTS, INDICATORS), 64)
    quote.lines = [m.make_line(f, quote.title, s, decimals=2, fstyle="spaced", partial_p=0.0) for s in subs]
    for i, ln in enumerate(quote.lines, 1):
        ln.extras.update(
            pos=i * 10,
            catno=f"OSK-{rng.randrange(1000, 9999)}-{rng.choice(['100', '250', '500', '1K'])}",
            qty=rng.choice([1, 1, 2, 3, 5]),
            price=round(rng.uniform(8, 240), 2),
        )
    m.lay_out(quote, 0.0)
    m.files.append(FileSpec(f, [quote]))

    # 5. Flammables cabinet audit -------------------------------------------------------------------------
    f = "hvtc_flammables_cabinet_audit.xlsx"
    cab = SheetSpec(
        "Cabinet F1 & F2",
        ["Flammables cabinet audit - HVTC Science Block", "Audit date 14/05/2024"],
        [
            ("Substance", "name"),
            ("Formula", "formula"),
            ("Molar mass", "mm"),
            ("CAS", "cas"),
            ("Volume (mL)", "volume"),
            ("No. of bottles", "bottles"),
            ("Condition", "condition"),
            ("Cabinet", "location"),
        ],
    )
    subs = m.draw(m.pool(SOLVENTS), 52)
    cab.lines = [m.make_line(f, cab.title, s, decimals=1, fstyle="as-written", grade_p=0.1) for s in subs]
    cab.lines += add_mixtures(m, f, cab.title, 3, 1)
    cab.lines.sort(key=lambda ln: ln.extras.get("hazard", ""))
    acid = SheetSpec(
        "Acid & alkali cabinet",
        ["Acid & alkali cabinet (ventilated), HVTC Science Block"],
        [
            ("Substance", "name"),
            ("Formula", "formula"),
            ("Molar mass", "mm"),
            ("CAS", "cas"),
            ("Volume (mL)", "volume"),
            ("No. of bottles", "bottles"),
            ("Condition", "condition"),
        ],
    )
    subs = m.draw(
        m.pool(ACIDS_BASES, ["acoh", "hcooh", "lactic", "oxalic_2", "citric", "na2co3", "k2co3"]), 32
    )
    acid.lines = [m.make_line(f, acid.title, s, decimals=1, fstyle="as-written") for s in subs]
    for sh in (cab, acid):
        for ln in sh.lines:
            ln.extras.update(
                volume=rng.choice([100, 250, 500, 1000, 2500]),
                bottles=rng.choice([1, 1, 1, 2, 3, 4]),
                condition=rng.choice(["OK", "OK", "OK", "label faded", "cap cracked", "nearly empty"]),
                location=rng.choice(["F1", "F2"]),
            )
    m.lay_out(cab, 0.04)
    m.lay_out(acid, 0.0)
    m.files.append(FileSpec(f, [cab, acid]))

    # 6. Technician order requests ------------------------------------------------------------------------
    f = "hvtc_technician_order_requests.xlsx"
    orders = SheetSpec(
        "Requests 2024",
        ["Technician order requests 2024 - please fill in every column"],
        [
            ("Date", "date"),
            ("Requested by", "who"),
            ("Dept", "dept"),
            ("Item", "name"),
            ("Formula", "formula"),
            ("M.W.", "mm"),
            ("CAS Number", "cas"),
            ("Qty", "qty"),
            ("Supplier", "supplier"),
            ("Status", "status"),
        ],
    )
    subs = m.draw(m.organic(), 44) + m.draw(m.inorganic(), 30)
    rng.shuffle(subs)
    orders.lines = [
        m.make_line(f, orders.title, s, decimals=2, fstyle="as-written", partial_p=0.1) for s in subs
    ]
    day = dt.date(2024, 1, 8)
    for ln in orders.lines:
        day += dt.timedelta(days=rng.choice([0, 0, 1, 2, 3, 7]))
        ln.extras.update(
            date=day,
            who=rng.choice(INITIALS),
            dept=rng.choice(DEPTS),
            qty=rng.choice(["1 x 500 g", "2 x 100 g", "1 x 1 kg", "1 x 2.5 L", "3 x 25 g", "1 x 250 mL"]),
            supplier=rng.choice(SUPPLIERS + [""]),
            status=rng.choice(["ordered", "ordered", "received", "received", "back-ordered", "cancelled"]),
        )
    m.lay_out(orders, 0.0)
    m.files.append(FileSpec(f, [orders]))

    # 7. COSHH / SDS register -----------------------------------------------------------------------------
    f = "hvtc_coshh_sds_register.xlsx"
    sds = SheetSpec(
        "Register",
        ["COSHH / safety data sheet register", "Harrowgate Vale Technical College - all departments"],
        [
            ("Ref", "ref"),
            ("Substance name", "name"),
            ("Formula", "formula"),
            ("Molecular weight", "mm"),
            ("CAS RN", "cas"),
            ("Signal word", "signal"),
            ("Hazard", "hazard"),
            ("SDS version date", "date"),
            ("Location", "location"),
        ],
    )
    subs = m.draw(m.organic(), 72) + m.draw(m.inorganic(), 52)
    sds.lines = [m.make_line(f, sds.title, s, decimals=3, fstyle="dot", partial_p=0.04) for s in subs]
    sds.lines = sort_by_name(sds.lines)
    for i, ln in enumerate(sds.lines, 1):
        hz = str(ln.extras.get("hazard", ""))
        ln.extras.update(
            ref=f"SDS/{i:03d}",
            signal="Danger"
            if hz in ("Toxic", "Corrosive", "Health hazard")
            else ("Warning" if hz not in ("None", "") else ""),
            date=dt.date(2018, 1, 1) + dt.timedelta(days=rng.randrange(0, 2300)),
            location=rng.choice(["Chemistry", "Biology", "Both", "Chemistry store"]),
        )
    m.lay_out(sds, 0.0)
    readme = (
        "Read me",
        [
            "How to use this register",
            "One line per substance held anywhere on site.",
            "Keep the SDS PDF in the shared drive under the Ref number.",
            "Review every line at least every three years.",
        ],
    )
    m.files.append(FileSpec(f, [sds], extra_sheets=[readme]))

    # 8. Annexe stock take (older, messier) ---------------------------------------------------------------
    f = "hvtc_annexe_stocktake_2023.xlsx"
    take = SheetSpec(
        "Stock take",
        ["annexe lab stock take summer 2023"],
        [
            ("chemical", "name"),
            ("formula", "formula"),
            ("mw", "mm"),
            ("cas no", "cas"),
            ("qty", "qty"),
            ("where", "location"),
            ("notes", "notes"),
        ],
        blank_after_titles=2,
    )
    subs = m.draw(m.organic(), 44) + m.draw(m.inorganic(), 36)
    rng.shuffle(subs)
    take.lines = [
        m.make_line(
            f, take.title, s, decimals=rng.choice([1, 2]), fstyle="as-written", upper_p=0.15, partial_p=0.12
        )
        for s in subs
    ]
    take.lines += add_mixtures(m, f, take.title, 4, 2)
    rng.shuffle(take.lines)
    loft = SheetSpec(
        "Loft store",
        ["LOFT STORE (old stock - do not use without checking)"],
        [
            ("chemical", "name"),
            ("formula", "formula"),
            ("mw", "mm"),
            ("cas no", "cas"),
            ("qty", "qty"),
            ("notes", "notes"),
        ],
    )
    subs = m.draw(m.inorganic(), 18) + m.draw(m.organic(), 14)
    rng.shuffle(subs)
    loft.lines = [
        m.make_line(f, loft.title, s, decimals=2, fstyle="as-written", upper_p=0.2, partial_p=0.1)
        for s in subs
    ]
    for sh in (take, loft):
        for ln in sh.lines:
            ln.extras.update(
                qty=rng.choice(["500g", "1/2 full", "250 g", "2 x 500g", "100g", "1L", "approx 200 g", "?"]),
                location=rng.choice(["back shelf", "cupboard 3", "under sink", "prep", "fume cupboard"]),
                notes=rng.choice(["", "", "", "old label", "lumpy", "dispose?", "reorder", "damp"]),
            )
            if sh is take and ln.mm is not None and rng.random() < 0.08:
                ln.mm_as_text = True
            if ln.cas and rng.random() < 0.04:
                ln.hyphenless_cas = True
    m.lay_out(take, 0.05)
    m.lay_out(loft, 0.03)
    m.files.append(FileSpec(f, [take, loft]))

    # 9. Brindlecombe catalogue export (CSV, comma) ------------------------------------------------------
    f = "brindlecombe_catalogue_export.csv"
    exp = SheetSpec(
        "",
        ["Brindlecombe Chemicals catalogue export 14/06/2024"],
        [
            ("Catalogue number", "catno"),
            ("Product name", "name"),
            ("Molecular formula", "formula"),
            ("Molecular weight", "mm"),
            ("CAS number", "cas"),
            ("Pack", "pack"),
            ("Price GBP", "price"),
        ],
    )
    subs = m.draw(m.organic(), 44) + m.draw(m.inorganic(), 30)
    exp.lines = [m.make_line(f, "", s, decimals=2, fstyle="hill", grade_p=0.2, partial_p=0.03) for s in subs]
    exp.lines = sort_by_name(exp.lines)
    for i, ln in enumerate(exp.lines):
        ln.extras.update(
            catno=f"BC{20010 + 3 * i}",
            pack=rng.choice(["100g", "250g", "500g", "1kg", "500ml", "1l"]),
            price=f"{rng.uniform(5, 150):.2f}",
        )
    m.lay_out(exp, 0.0)
    m.files.append(FileSpec(f, [exp], kind="csv-comma"))

    # 10. Oskarsen price list (CSV, semicolon, decimal comma) --------------------------------------------
    f = "oskarsen_pricelist_eu.csv"
    eu = SheetSpec(
        "",
        [],
        [
            ("Article", "catno"),
            ("Description", "name"),
            ("Formula", "formula"),
            ("MW", "mm"),
            ("CAS-Nr.", "cas"),
            ("Pack", "pack"),
            ("Price EUR", "price"),
        ],
    )
    subs = m.draw(m.organic(), 42) + m.draw(m.inorganic(), 30)
    rng.shuffle(subs)
    eu.lines = [m.make_line(f, "", s, decimals=2, fstyle="spaced", grade_p=0.1, partial_p=0.03) for s in subs]
    for ln in eu.lines:
        ln.extras.update(
            catno=f"{rng.randrange(100000, 999999)}",
            pack=rng.choice(["100 g", "250 g", "500 g", "1 kg", "500 ml", "1 l"]),
            price=f"{rng.uniform(5, 150):.2f}".replace(".", ","),
        )
    m.lay_out(eu, 0.0)
    m.files.append(FileSpec(f, [eu], kind="csv-semicolon"))


# ---------------------------------------------------------------------------------------------------------
# Planting errors
# ---------------------------------------------------------------------------------------------------------

ELEMENT_CASE = {
    "Co": "CO",
    "Cu": "CU",
    "Ni": "NI",
    "Sn": "SN",
    "Cs": "CS",
    "Ca": "CA",
    "Ba": "BA",
    "Mg": "MG",
    "Mn": "MN",
    "Zn": "ZN",
    "Na": "NA",
    "Cl": "CL",
    "Pb": "PB",
    "Sr": "SR",
}


def split_water(formula: str) -> tuple[str, str]:
    """("CuSO4", "·5H2O") for "CuSO4·5H2O"; (formula, "") when there is no water of crystallisation."""
    mt = re.search(r"\s*[·.]\s*\d*H2O$", formula)
    return (formula[: mt.start()], formula[mt.start() :]) if mt else (formula, "")


def swap_adjacent_digits(text: str) -> list[tuple[str, int]]:
    """All adjacent digit swaps in text (within digit runs, or across a CAS hyphen) that change it."""
    out = []
    digits = [i for i, ch in enumerate(text) if ch.isdigit()]
    for a, b in itertools.pairwise(digits):
        if text[a] == text[b]:
            continue
        between = text[a + 1 : b]
        if between not in ("", "-"):
            continue
        s = list(text)
        s[a], s[b] = s[b], s[a]
        out.append(("".join(s), a))
    return out


class Planter:
    def __init__(self, m: Maker) -> None:
        self.m = m
        self.rng = m.rng
        self.lines = [ln for fs in m.files for sh in fs.sheets for ln in sh.lines]
        self.organic_subs = [s for s in m.subs if s.organic]

    def free(self, ln: Line) -> bool:
        return (
            ln.plant is None and not ln.locked and ln.complete and not ln.hyphenless_cas and not ln.mm_as_text
        )

    def record(
        self, ln: Line, kind: str, role: str, original: str, planted: str, detail: str, source: str
    ) -> None:
        ln.plant = dict(
            kind=kind, role=role, original=original, planted=planted, detail=detail, source=source
        )

    def witness(self, sub: Substance) -> str:
        return (
            f"{sub.formula} {sub.cas} M={molar_mass(sub.formula):.3f} (molmass); "
            "CAS RN checked by check digit "
            f"and against the chemicals record of {sub.cas}"
        )

    # (a) CAS RN of the anhydrous salt on a hydrate's line, and the reverse
    def plant_a(self, ln: Line, want_reverse: bool) -> bool:
        sub = ln.sub
        assert sub
        sibs = self.m.siblings(sub)
        if sub.water and not want_reverse:
            targets = [s for s in sibs if s.water == 0] or sibs
            detail = (
                "anhydrous CAS RN on a hydrate line" if targets[0].water == 0 else "other hydrate's CAS RN"
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
            ln,
            "a",
            "cas",
            sub.cas,
            t.cas,
            f"{detail} ({t.formula})",
            self.witness(sub) + f"; planted {t.cas} is {t.formula}",
        )
        ln.cas = t.cas
        return True

    # (b) the CAS RN of the row above pasted one line down
    def plant_b(self, ln: Line) -> bool:
        p = ln.prev
        if p is None or p.plant is not None or not p.cas or p.cas == ln.cas or p.hyphenless_cas:
            return False
        assert ln.sub and p.sub
        self.record(
            ln,
            "b",
            "cas",
            ln.cas or "",
            p.cas,
            f"CAS RN of row {p.row} ({p.sub.formula})",
            self.witness(ln.sub) + f"; planted {p.cas} is {p.sub.formula} on the row above",
        )
        ln.cas = p.cas
        p.locked = True
        return True

    # (c) two adjacent digits of the CAS RN swapped
    def plant_c(self, ln: Line, want_pass: bool) -> bool:
        assert ln.sub and ln.cas
        swaps = swap_adjacent_digits(ln.cas)
        all_cas = {s.cas for s in self.m.subs}
        good = [
            (t, i)
            for t, i in swaps
            if (cas_check_ok(t) == want_pass) and t not in all_cas and not t.startswith("0")
        ]
        if not good:
            return False
        t, _ = self.rng.choice(good)
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
        f = ln.formula
        good = formula_typos(f, sub.formula, sub_kind)
        if not good:
            return False
        text, why = self.rng.choice(good)
        self.record(ln, "d", "formula", f, text, why, self.witness(sub))
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
            ln,
            "e",
            "formula",
            ln.formula,
            text,
            f"water of crystallisation ({sub.water} H2O) left out",
            self.witness(sub),
        )
        ln.formula = text
        return True

    # (f) a molar mass with two digits swapped, or the molar mass of another hydrate
    def plant_f(self, ln: Line, want_hydrate: bool) -> bool:
        sub = ln.sub
        assert sub and ln.mm is not None
        orig = ln.mm_text()
        if want_hydrate:
            sibs = self.m.siblings(sub)
            options = [(s.formula, molar_mass(s.formula)) for s in sibs]
            if sub.water and not any(s.water == 0 for s in sibs):
                options.append((sub.anhydrous_formula, molar_mass(sub.anhydrous_formula)))
            if not options:
                return False
            other, mass = self.rng.choice(options)
            new = round(mass, ln.mm_decimals)
            detail = f"molar mass of {other}"
        else:
            swaps = [
                (t, i)
                for t, i in swap_adjacent_digits(orig)
                if "-" not in orig and not t.startswith("0") and abs(float(t) - ln.mm) > 0.1
            ]
            if not swaps:
                return False
            t, _ = self.rng.choice(swaps)
            new = float(t)
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
        orig = ln.name + ln.name_suffix
        new = wrong + ln.name_suffix
        self.record(ln, "g", "name", orig, new, f"names another compound: {wrong}", self.witness(sub))
        ln.name = wrong
        return True

    # (h) organic lines: hydrogen count, neighbouring row's molar mass, another organic's CAS RN
    def plant_h(self, ln: Line, sub_kind: str) -> bool:
        sub = ln.sub
        assert sub and sub.organic and ln.formula
        if sub_kind == "formula":
            salt, water = split_water(ln.formula)
            # the H of the molecule, not of water of crystallisation or of an added HCl
            # only a count that is written out (C2H6O, CH3COOH): "HCHO" is left alone
            hs = [h for h in re.finditer(r"H(\d+)", salt)]
            if not hs:
                return False
            h = self.rng.choice(hs)
            n = int(h.group(1))
            options = [k for k in (n - 2, n - 1, n + 1, n + 2) if k >= 2]
            k = self.rng.choice(options)
            text = salt[: h.start()] + "H" + (str(k) if k > 1 else "") + salt[h.end() :] + water
            self.record(
                ln, "h", "formula", ln.formula, text, f"hydrogen count {n} changed to {k}", self.witness(sub)
            )
            ln.formula = text
            return True
        if sub_kind == "mm":
            p = ln.prev
            if p is None or p.plant is not None or p.mm is None or ln.mm is None or abs(p.mm - ln.mm) < 1.0:
                return False
            orig = ln.mm_text()
            new = round(p.mm, ln.mm_decimals)
            assert p.sub
            self.record(
                ln,
                "h",
                "molar_mass",
                orig,
                f"{new:.{ln.mm_decimals}f}",
                f"molar mass of row {p.row} ({p.sub.formula})",
                self.witness(sub),
            )
            ln.mm = new
            p.locked = True
            return True
        others = [s for s in self.organic_subs if s.cas != sub.cas]
        same_formula = [s for s in others if composition(s.formula) == composition(sub.formula)]
        t = (
            self.rng.choice(same_formula)
            if same_formula and self.rng.random() < 0.5
            else self.rng.choice(others)
        )
        self.record(
            ln,
            "h",
            "cas",
            ln.cas or "",
            t.cas,
            f"CAS RN of another organic ({t.names[0]}, {t.formula})",
            self.witness(sub) + f"; planted {t.cas} is {t.formula}",
        )
        ln.cas = t.cas
        return True

    def run(self) -> None:
        n = PLANTS_PER_KIND
        plans: list[tuple[str, list, object]] = []
        # (kind, list of sub-kinds cycled, candidate filter)
        half = n // 2
        plans.append(("a", [False] * half + [True] * (n - half), lambda ln: bool(self.m.siblings(ln.sub))))
        plans.append(("e", [None] * n, lambda ln: ln.sub.water > 0))
        plans.append(("g", [None] * n, lambda ln: not ln.sub.organic and bool(ln.sub.confusions)))
        plans.append(("b", [None] * n, lambda ln: ln.prev is not None))
        plans.append(("h", ["formula"] * 8 + ["mm"] * 7 + ["cas"] * (n - 15), lambda ln: ln.sub.organic))
        plans.append(("c", [True] * 4 + [False] * (n - 4), lambda ln: True))
        plans.append(("d", ["count"] * 8 + ["drop"] * 7 + ["case"] * (n - 15), lambda ln: not ln.sub.organic))
        plans.append(("f", [False] * half + [True] * (n - half), lambda ln: True))
        for kind, subkinds, ok in plans:
            for sk in subkinds:
                cands = [ln for ln in self.lines if ln.sub is not None and self.free(ln) and ok(ln)]
                self.rng.shuffle(cands)
                for ln in cands:
                    fn = getattr(self, f"plant_{kind}")
                    done = fn(ln) if sk is None else fn(ln, sk)
                    if done:
                        # the row below must not take this row's CAS RN or molar mass as its own plant
                        break
                else:
                    raise SystemExit(f"no line left to plant kind {kind} ({sk})")


# ---------------------------------------------------------------------------------------------------------
# Writing
# ---------------------------------------------------------------------------------------------------------


def cell_value(ln: Line, role: str, semicolon: bool = False) -> object:
    if role == "name":
        return ln.name + ln.name_suffix
    if role == "formula":
        return ln.formula
    if role == "mm":
        if ln.mm is None:
            return None
        text = ln.mm_text()
        if semicolon:
            return text.replace(".", ",")
        if ln.mm_as_text:
            return f"{text} g/mol"
        return ln.mm
    if role == "cas":
        if ln.cas and ln.hyphenless_cas:
            return ln.cas.replace("-", "")
        return ln.cas
    value = ln.extras.get(role)
    if role == "hazard" and value == "None":
        return ""  # nothing to declare: the cell is left empty
    return value


def write_xlsx(fs: FileSpec) -> None:
    wb = Workbook()
    wb.remove(wb.active)
    bold = Font(bold=True)
    fill = PatternFill("solid", fgColor="DDEBF7")
    for sh in fs.sheets:
        ws = wb.create_sheet(sh.title)
        ncol = len(sh.headers)
        row = 0
        for kind, obj in sh.layout:
            row += 1
            if kind == "title":
                ws.cell(row=row, column=1, value=obj).font = Font(bold=row == 1, size=14 if row == 1 else 11)
                if row == 1:
                    ws.merge_cells(start_row=row, start_column=1, end_row=row, end_column=min(ncol, 6))
            elif kind == "header":
                for c, (head, _) in enumerate(sh.headers, 1):
                    cell = ws.cell(row=row, column=c, value=head)
                    cell.font = bold
                    cell.fill = fill
                    cell.alignment = Alignment(wrap_text=True)
                ws.freeze_panes = ws.cell(row=row + 1, column=1)
            elif kind == "section":
                ws.cell(row=row, column=2, value=obj).font = bold
            elif kind == "line":
                ln = obj
                assert isinstance(ln, Line) and ln.row == row
                for c, (_, role) in enumerate(sh.headers, 1):
                    if role == "total":
                        q = get_column_letter(c - 2)
                        p = get_column_letter(c - 1)
                        ws.cell(row=row, column=c, value=f"={q}{row}*{p}{row}").number_format = "0.00"
                        continue
                    v = cell_value(ln, role)
                    if v is None or v == "":
                        continue
                    cell = ws.cell(row=row, column=c, value=v)
                    if role == "mm" and isinstance(v, float):
                        cell.number_format = "0." + "0" * ln.mm_decimals
                    elif role == "date":
                        cell.number_format = "DD/MM/YYYY"
                    elif role == "price":
                        cell.number_format = "0.00"
        widths = {"name": 42, "formula": 22, "mm": 10, "cas": 13}
        for c, (_, role) in enumerate(sh.headers, 1):
            ws.column_dimensions[get_column_letter(c)].width = widths.get(role, 12)
    for title, texts in fs.extra_sheets:
        ws = wb.create_sheet(title)
        for i, t in enumerate(texts, 1):
            ws.cell(row=i, column=1, value=t).font = Font(bold=i == 1)
        ws.column_dimensions["A"].width = 80
    wb.properties.creator = "HVTC science technicians"
    wb.properties.created = FIXED_TIME
    buf = io.BytesIO()
    wb.save(buf)
    fixed = rezip_fixed(buf.getvalue())
    (OUT / fs.name).write_bytes(fixed)


def rezip_fixed(data: bytes) -> bytes:
    """Rewrite the package with fixed member timestamps and a fixed modified date, so runs are identical."""
    src = zipfile.ZipFile(io.BytesIO(data))
    out = io.BytesIO()
    stamp = FIXED_TIME.strftime("%Y-%m-%dT%H:%M:%SZ")
    with zipfile.ZipFile(out, "w", zipfile.ZIP_DEFLATED) as dst:
        for info in src.infolist():
            body = src.read(info.filename)
            if info.filename == "docProps/core.xml":
                body = re.sub(
                    rb"(<dcterms:modified[^>]*>)[^<]*(</dcterms:modified>)",
                    lambda mt: mt.group(1) + stamp.encode() + mt.group(2),
                    body,
                )
            zi = zipfile.ZipInfo(info.filename, date_time=FIXED_TIME.timetuple()[:6])
            zi.compress_type = zipfile.ZIP_DEFLATED
            dst.writestr(zi, body)
    return out.getvalue()


def write_csv(fs: FileSpec) -> None:
    sh = fs.sheets[0]
    semicolon = fs.kind == "csv-semicolon"
    delim = ";" if semicolon else ","
    buf = io.StringIO()
    w = csv.writer(buf, delimiter=delim, lineterminator="\r\n")
    ncol = len(sh.headers)
    for kind, obj in sh.layout:
        if kind == "title":
            w.writerow([obj] + [""] * (ncol - 1))
        elif kind == "blank":
            w.writerow([""] * ncol)
        elif kind == "header":
            w.writerow([h for h, _ in sh.headers])
        elif kind == "line":
            ln = obj
            assert isinstance(ln, Line)
            vals = []
            for _, role in sh.headers:
                v = cell_value(ln, role, semicolon=semicolon)
                if isinstance(v, float):
                    v = ln.mm_text() if role == "mm" else f"{v}"
                vals.append("" if v is None else str(v))
            w.writerow(vals)
    text = buf.getvalue()
    if semicolon:
        (OUT / fs.name).write_bytes(b"\xef\xbb\xbf" + text.encode("utf-8"))
    else:
        (OUT / fs.name).write_bytes(text.encode("utf-8"))


def check_csv_rows(fs: FileSpec) -> None:
    """The CSV line number of every data line must be the row recorded for it."""
    raw = (OUT / fs.name).read_bytes().decode("utf-8-sig")
    lines = raw.split("\r\n")
    for ln in fs.sheets[0].lines:
        assert ln.name.split(",")[0] in lines[ln.row - 1], (fs.name, ln.row, ln.name)


def write_truth(fs: FileSpec) -> tuple[int, int]:
    truth_rows = []
    clean_rows = []
    for sh in fs.sheets:
        col_of = {role: get_column_letter(i) for i, (_, role) in enumerate(sh.headers, 1)}
        for ln in sh.lines:
            if ln.plant:
                p = ln.plant
                role_key = {"name": "name", "formula": "formula", "molar_mass": "mm", "cas": "cas"}[p["role"]]
                truth_rows.append(
                    [
                        fs.name,
                        sh.title,
                        ln.row,
                        p["kind"],
                        col_of[role_key],
                        p["role"],
                        p["original"],
                        p["planted"],
                        p["source"],
                        p["detail"],
                        ln.sub.key if ln.sub else "",
                    ]
                )
            else:
                clean_rows.append([fs.name, sh.title, ln.row])
    with open(OUT / f"{fs.name}.truth.csv", "w", newline="", encoding="utf-8") as fh:
        w = csv.writer(fh)
        w.writerow(
            [
                "file",
                "sheet",
                "row",
                "kind",
                "planted_cell_column",
                "planted_role",
                "original_value",
                "planted_value",
                "source",
                "detail",
                "substance",
            ]
        )
        w.writerows(truth_rows)
    with open(OUT / f"{fs.name}.clean.csv", "w", newline="", encoding="utf-8") as fh:
        w = csv.writer(fh)
        w.writerow(["file", "sheet", "row"])
        w.writerows(clean_rows)
    return len(truth_rows), len(clean_rows)


def self_check(m: Maker) -> None:
    """Every clean compound line must agree with itself; every planted line must differ in one cell only."""
    for fs in m.files:
        for sh in fs.sheets:
            for ln in sh.lines:
                if ln.sub is None:
                    continue
                sub = ln.sub
                try:
                    ok_formula = ln.formula is None or composition(ln.formula) == composition(sub.formula)
                except Exception:  # a planted typo that reads as no formula
                    ok_formula = False
                ok_mm = (
                    ln.mm is None or abs(ln.mm - molar_mass(sub.formula)) <= 0.5 * 10**-ln.mm_decimals + 1e-9
                )
                ok_cas = ln.cas is None or ln.cas == sub.cas
                ok_name = ln.name.lower() in {n.lower() for n in sub.names}
                bad = [
                    r
                    for r, ok in (
                        ("formula", ok_formula),
                        ("molar_mass", ok_mm),
                        ("cas", ok_cas),
                        ("name", ok_name),
                    )
                    if not ok
                ]
                if ln.plant is None:
                    assert not bad, (fs.name, ln.row, bad)
                else:
                    assert bad == [ln.plant["role"]], (fs.name, ln.row, bad, ln.plant)


def read_back(subs: list[Substance]) -> None:
    """Read the written files again, as a user's program would, and check them against the truth files:
    every planted cell holds its planted value, every clean compound line agrees with the record its CAS RN
    (or its name) points to, and every filled data row is listed exactly once."""
    by_cas = {s.cas: s for s in subs}
    by_name: dict[str, Substance] = {}
    for s in subs:
        for n in s.names:
            by_name.setdefault(n.lower(), s)
    for truth in sorted(OUT.glob("*.truth.csv")):
        name = truth.name[: -len(".truth.csv")]
        path = OUT / name
        with open(truth, newline="", encoding="utf-8") as fh:
            planted = list(csv.DictReader(fh))
        with open(OUT / f"{name}.clean.csv", newline="", encoding="utf-8") as fh:
            clean = list(csv.DictReader(fh))
        tables = read_tables(path)
        listed: set[tuple[str, int]] = set()
        for r in planted + clean:
            key = (r["sheet"], int(r["row"]))
            assert key not in listed, (name, key)
            listed.add(key)
        for sheet, (_, rows) in tables.items():
            for rownum, cells in rows.items():
                if any(v is not None and str(v).strip() for v in cells.values()):
                    assert (sheet, rownum) in listed, (name, sheet, rownum, "filled row not listed")
        for r in planted:
            header, rows = tables[r["sheet"]]
            value = rows[int(r["row"])].get(r["planted_cell_column"])
            if r["planted_role"] == "molar_mass":
                assert abs(float(str(value).replace(",", ".")) - float(r["planted_value"])) < 1e-9, (name, r)
            else:
                assert str(value).strip() == r["planted_value"], (name, r, value)
        for r in clean:
            header, rows = tables[r["sheet"]]
            cells = rows[int(r["row"])]
            role_col = {role: col for col, role in header.items()}
            nm = str(cells.get(role_col["name"], "")).strip()
            formula = cells.get(role_col["formula"])
            mm = cells.get(role_col["mm"])
            cas = cells.get(role_col["cas"])
            if cas:
                cas = str(cas)
                if "-" not in cas:
                    cas = f"{cas[:-3]}-{cas[-3:-1]}-{cas[-1]}"
                sub = by_cas[cas]
            else:
                sub = by_name.get(nm.lower())
                if sub is None:
                    for grade in GRADES:
                        if nm.lower().endswith(grade.lower()):
                            sub = by_name.get(nm[: -len(grade)].lower())
                if sub is None:
                    assert not formula and not mm, (name, r, nm)  # a mixture or product line
                    continue
            bare = nm
            for grade in GRADES:
                if bare.lower().endswith(grade.lower()):
                    bare = bare[: -len(grade)]
            known = {n.lower() for n in sub.names}
            assert nm.lower() in known or bare.lower() in known, (name, r, nm, sub.key)
            if formula:
                assert composition(str(formula)) == composition(sub.formula), (name, r, formula)
            if mm not in (None, ""):
                text = str(mm).replace(" g/mol", "").replace(",", ".")
                decimals = len(text.split(".")[1]) if "." in text else 0
                assert abs(float(text) - molar_mass(sub.formula)) <= 0.5 * 10**-decimals + 0.0051, (
                    name,
                    r,
                    mm,
                )


def read_tables(path: Path) -> dict[str, tuple[dict[str, str], dict[int, dict[str, object]]]]:
    """{sheet: ({column letter: role}, {row: {column letter: value}})} for the rows below each header row."""
    from openpyxl import load_workbook

    roles = {}
    for fs_headers in HEADER_ROLES:
        roles.update(fs_headers)
    out: dict[str, tuple[dict[str, str], dict[int, dict[str, object]]]] = {}
    if path.suffix == ".xlsx":
        wb = load_workbook(path)
        sheets = [(ws.title, [[c.value for c in row] for row in ws.iter_rows()]) for ws in wb.worksheets]
    else:
        raw = path.read_bytes().decode("utf-8-sig")
        delim = ";" if raw.splitlines()[0].count(";") > raw.splitlines()[0].count(",") else ","
        sheets = [("", list(csv.reader(io.StringIO(raw), delimiter=delim)))]
    for title, grid in sheets:
        header_idx = next((i for i, row in enumerate(grid) if any(v in roles for v in row if v)), None)
        if header_idx is None:
            continue
        header = {get_column_letter(i + 1): roles[v] for i, v in enumerate(grid[header_idx]) if v in roles}
        rows: dict[int, dict[str, object]] = {}
        for i in range(header_idx + 1, len(grid)):
            rows[i + 1] = {
                get_column_letter(j + 1): v
                for j, v in enumerate(grid[i])
                if get_column_letter(j + 1) in header
            }
        out[title] = (header, rows)
    return out


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
    total_lines = total_plants = 0
    kinds: Counter[str] = Counter()
    organic = compound = 0
    for fs in m.files:
        if fs.kind == "xlsx":
            write_xlsx(fs)
        else:
            write_csv(fs)
            check_csv_rows(fs)
        planted, clean = write_truth(fs)
        total_lines += planted + clean
        total_plants += planted
        for sh in fs.sheets:
            for ln in sh.lines:
                if ln.plant:
                    kinds[ln.plant["kind"]] += 1
                if ln.sub is not None:
                    compound += 1
                    organic += ln.sub.organic
        print(f"{fs.name}: {planted + clean} lines, {planted} planted")
    read_back(subs)
    print(f"total: {total_lines} lines, {total_plants} planted; by kind: {dict(sorted(kinds.items()))}")
    print(f"compound lines: {compound}, organic {organic} ({100 * organic / compound:.0f} %)")


if __name__ == "__main__":
    main()
