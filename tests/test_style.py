"""The code is ruff clean (DEVELOPERS.md, style)."""

import shutil
import subprocess
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[1]


@pytest.mark.skipif(shutil.which("ruff") is None, reason="ruff is installed with the test extra")
def test_ruff_check():
    out = subprocess.run(["ruff", "check", "."], cwd=ROOT, capture_output=True, text=True)
    assert out.returncode == 0, out.stdout + out.stderr


@pytest.mark.skipif(shutil.which("ruff") is None, reason="ruff is installed with the test extra")
def test_ruff_format():
    out = subprocess.run(["ruff", "format", "--check", "."], cwd=ROOT, capture_output=True, text=True)
    assert out.returncode == 0, out.stdout + out.stderr
