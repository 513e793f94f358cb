"""The tree stays clean by the project's own ruff configuration (pyproject.toml)."""

import shutil
import subprocess
import sys
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[1]


def test_ruff_finds_nothing():
    beside = Path(sys.executable).parent / "ruff"
    ruff = str(beside) if beside.is_file() else shutil.which("ruff")
    if ruff is None:
        pytest.skip("ruff is not installed (pip install '.[test]' installs it)")
    done = subprocess.run([ruff, "check", "--no-cache", "."], cwd=ROOT, capture_output=True,
                          text=True, timeout=120)
    assert done.returncode == 0, done.stdout + done.stderr
