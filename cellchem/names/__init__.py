"""Inorganic names both ways: name -> formula and formula -> name.

Follows the IUPAC 2005 recommendations (Nomenclature of Inorganic Chemistry,
IR-5 compositional names, IR-8 acids, IR-9 coordination compounds) on top of
the ion catalog and the formula reader. Names are read as stores and
suppliers write them: any case, British and American spellings, legacy
-ous/-ic names, trade forms (bicarbonate), trivial names (borax), catalogue
inversions ("sulfate, copper(II), pentahydrate"), Stock numbers with a space,
in either case, or as Arabic digits or charge numbers, and grade, purity,
form and concentration words, which are set aside as qualifiers.

Names that leave a variable metal's charge open ("iron chloride") and names
cellchem does not know (organic names, mixtures, product codes) are refused
with a ``NameReadError`` that says why; for the first kind the message lists
the candidates with their formulas.

The package's modules, each one step (a module uses only those above it):

- ``folding``: normalising a name (case, spellings, Stock numbers);
- ``results``: what ``read_name`` returns (``NameReading``, ``Component``, ``Qualifier``);
- ``tables``: the naming tables of ``cellchem/data``, loaded and indexed;
- ``qualifiers``: grade, form, strength, purity and hydrate words set aside;
- ``complexes``: coordination entities by the additive rules, both ways;
- ``pieces``: a name's words read as ions, elements and groups;
- ``salts``: salts written from their ions; the acid family of an anion;
- ``compounds``: compounds the tables know, hydrates that exist;
- ``building``: the formula a reading of the words fixes;
- ``to_formula``: reading a name (``read_name``, ``formula_from_name``);
- ``to_name``: naming a formula (``name_from_formula``).

Names with a leading underscore are shared among these modules only.
"""

from ..errors import NameReadError
from .compounds import ion_sets, known_hydrates, same_substance
from .folding import fold_name
from .results import Component, NameReading, Qualifier
from .salts import acid_families, as_ions
from .tables import hydrate_word
from .to_formula import formula_from_name, name_core, read_name
from .to_name import name_from_formula

__all__ = [
    "Component",
    "NameReadError",
    "NameReading",
    "Qualifier",
    "acid_families",
    "as_ions",
    "fold_name",
    "formula_from_name",
    "hydrate_word",
    "ion_sets",
    "known_hydrates",
    "name_core",
    "name_from_formula",
    "read_name",
    "same_substance",
]
