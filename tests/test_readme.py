"""The examples in README.md run and give what README says.

A `>>>` line is run; the lines after it up to the next blank line, `>>>` or
fence are the expected output: a Python repr, or `CellchemError: <message>`
for a refusal (README shows refusals that way rather than as tracebacks).
"""

import re
from pathlib import Path

import pytest

import cellchem
from cellchem import CellchemError

README = Path(__file__).resolve().parents[1] / "README.md"


def _examples():
    text = README.read_text(encoding="utf-8")
    blocks = re.findall(r"```python\n(.*?)```", text, re.S)
    for block in blocks:
        lines = block.splitlines()
        i = 0
        while i < len(lines):
            line = lines[i]
            if line.startswith(">>> "):
                source = line[4:]
                expected = []
                i += 1
                while i < len(lines) and lines[i].strip() and not lines[i].startswith(">>> "):
                    expected.append(lines[i])
                    i += 1
                yield source, "\n".join(expected)
            else:
                i += 1


EXAMPLES = list(_examples())


def test_readme_has_examples():
    assert len(EXAMPLES) >= 15


@pytest.mark.parametrize("source,expected", EXAMPLES, ids=[s for s, _ in EXAMPLES])
def test_readme_example(source, expected):
    namespace = {name: getattr(cellchem, name) for name in cellchem.__all__}
    from fractions import Fraction

    namespace["Fraction"] = Fraction
    # statements that set names for later examples
    for earlier, _ in EXAMPLES[: EXAMPLES.index((source, expected))]:
        if re.match(r"^[a-z_]+ = ", earlier.split(";")[0]):
            exec(earlier.split(";")[0], namespace)
    code = source.split("#")[0].strip() if "#" in source and not source.strip().startswith("{") else source
    if expected.startswith("CellchemError: "):
        with pytest.raises(CellchemError) as info:
            exec(code, namespace)
        assert str(info.value) == expected[len("CellchemError: ") :]
        return
    if ";" in code:
        stmt, code = code.split(";", 1)
        exec(stmt, namespace)
    if re.match(r"^[a-z_]+ = ", code):
        exec(code, namespace)
        assert expected == ""
        return
    assert repr(eval(code.strip(), namespace)) == expected
