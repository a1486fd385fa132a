"""Runs every example in docs/grammar.md as a doctest.

The page is the user-facing statement of the formula notation; its examples
are the check that the page and the code agree.
"""

from __future__ import annotations

import doctest
from pathlib import Path

GRAMMAR = Path(__file__).resolve().parent.parent / "docs" / "grammar.md"


def test_grammar_page_examples_pass():
    results = doctest.testfile(
        str(GRAMMAR),
        module_relative=False,
        encoding="utf-8",
        optionflags=doctest.REPORT_NDIFF,
        raise_on_error=False,
        report=True,
    )
    # A page without examples would pass vacuously; it must have many.
    assert results.attempted >= 50, f"docs/grammar.md has only {results.attempted} examples"
    assert results.failed == 0, f"{results.failed} of {results.attempted} examples in docs/grammar.md failed"
