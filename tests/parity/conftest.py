"""Fixtures for the CPython-vs-Pyodide parity test."""

import json
import os
import shutil
import subprocess
from pathlib import Path

import pytest

from _site import ROOT, ensure_site

CASES_FILE = Path(__file__).resolve().parent / "cases.json"


def load_cases():
    """cases.json, then each calculator's own example (as describe() gives it)."""
    import noblegap.api as api

    cases = json.loads(CASES_FILE.read_text())
    for calc in api.describe()["calculators"]:
        cases.append({"calc": calc["name"], "inputs": calc.get("example", {}), "example": True})
    return cases


@pytest.fixture(scope="session")
def pyodide_results(tmp_path_factory):
    """Every case of load_cases() run inside Pyodide under Node, in file order.

    Uses tools/pyodide_run.mjs, which loads site/ through the same
    static/engine.mjs as the browser worker.
    """
    if shutil.which("node") is None:
        if os.environ.get("CI"):
            pytest.fail("node is required for the parity test in CI")
        pytest.skip("node is not installed")
    site = ensure_site()
    cases_file = tmp_path_factory.mktemp("parity") / "cases.json"
    cases_file.write_text(json.dumps(load_cases()))
    proc = subprocess.run(
        ["node", str(ROOT / "tools" / "pyodide_run.mjs"), str(site), str(cases_file)],
        capture_output=True, text=True, timeout=300,
    )
    if proc.returncode != 0:
        pytest.fail(f"tools/pyodide_run.mjs failed ({proc.returncode}):\n{proc.stderr[-4000:]}")
    report = json.loads(proc.stdout.strip().splitlines()[-1])
    return report
