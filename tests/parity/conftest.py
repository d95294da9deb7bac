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


MODES = ("normal", "snapshot")


def run_in_pyodide(cases, mode, tmp_dir):
    """tools/pyodide_run.mjs --mode MODE over ``cases``; its JSON report."""
    if shutil.which("node") is None:
        if os.environ.get("CI"):
            pytest.fail("node is required for the parity test in CI")
        pytest.skip("node is not installed")
    site = ensure_site()
    cases_file = tmp_dir / f"cases-{mode}.json"
    cases_file.write_text(json.dumps(cases))
    proc = subprocess.run(
        ["node", str(ROOT / "tools" / "pyodide_run.mjs"), "--mode", mode, str(site), str(cases_file)],
        capture_output=True, text=True, timeout=300,
    )
    if proc.returncode != 0:
        pytest.fail(f"tools/pyodide_run.mjs --mode {mode} failed ({proc.returncode}):\n{proc.stderr[-4000:]}")
    return json.loads(proc.stdout.strip().splitlines()[-1])


@pytest.fixture(scope="session")
def pyodide_runs(tmp_path_factory):
    """Every case of load_cases() run inside Pyodide under Node, in file order,
    once per start mode: ``normal`` (loadPackage from the lock file) and
    ``snapshot`` (the build's memory snapshot restored).

    Uses tools/pyodide_run.mjs, which loads site/ through the same
    static/engine.mjs as the browser worker.
    """
    tmp = tmp_path_factory.mktemp("parity")
    cases = load_cases()
    return {mode: run_in_pyodide(cases, mode, tmp) for mode in MODES}


@pytest.fixture(scope="session")
def pyodide_results(pyodide_runs):
    """The normal-start run (kept for tests written against one run)."""
    return pyodide_runs["normal"]
