"""The committed demo files are what workbooks/make_demos.py builds."""

import importlib.util
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]


def test_demo_files_are_current(tmp_path):
    spec = importlib.util.spec_from_file_location("make_demos", ROOT / "workbooks" / "make_demos.py")
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    written = module.build(tmp_path)
    assert written
    for path in written:
        committed = ROOT / "workbooks" / path.name
        assert committed.exists(), f"{path.name} is not committed; run python workbooks/make_demos.py"
        assert committed.read_bytes() == path.read_bytes(), f"{path.name} is stale; run make_demos.py"
