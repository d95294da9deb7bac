"""Fixtures for the CPython-vs-Pyodide parity test."""

import json
import os
import shutil
import subprocess

import pytest

from _site import ROOT, build_site, ensure_site


def load_cases():
    """core/noblegap/cases.json, then each calculator's own example (engine_hooks.cases)."""
    from noblegap import engine_hooks

    return engine_hooks.cases()


# normal and snapshot: the two starts of the built site/; no-faststart: a
# site built with --no-faststart (its only start is the normal one).
MODES = ("normal", "snapshot", "no-faststart")


def run_in_pyodide(cases, mode, tmp_dir, site=None):
    """site_build/pyodide_run.mjs --mode MODE over ``cases``; its JSON report."""
    if shutil.which("node") is None:
        if os.environ.get("CI"):
            pytest.fail("node is required for the parity test in CI")
        pytest.skip("node is not installed")
    site = site or ensure_site()
    cases_file = tmp_dir / f"cases-{mode}.json"
    cases_file.write_text(json.dumps(cases))
    proc = subprocess.run(
        ["node", str(ROOT / "site_build" / "pyodide_run.mjs"), "--mode", mode, str(site), str(cases_file)],
        capture_output=True, text=True, timeout=300,
    )
    if proc.returncode != 0:
        pytest.fail(f"site_build/pyodide_run.mjs --mode {mode} failed ({proc.returncode}):\n{proc.stderr[-4000:]}")
    return json.loads(proc.stdout.strip().splitlines()[-1])


@pytest.fixture(scope="session")
def pyodide_runs(tmp_path_factory):
    """Every case of load_cases() run inside Pyodide under Node, in file order,
    once per start: ``normal`` (loadPackage from the lock file), ``snapshot``
    (the build's memory snapshot restored) and ``no-faststart`` (the normal
    start of a site built without the fast start).

    Uses site_build/pyodide_run.mjs, which loads a built site through the
    same static/engine/ modules as the browser worker.
    """
    tmp = tmp_path_factory.mktemp("parity")
    cases = load_cases()
    runs = {mode: run_in_pyodide(cases, mode, tmp) for mode in ("normal", "snapshot")}
    plain = build_site(tmp / "site-no-faststart", "--no-faststart", "--offline")
    runs["no-faststart"] = run_in_pyodide(cases, "normal", tmp, site=plain)
    return runs


@pytest.fixture(scope="session")
def pyodide_results(pyodide_runs):
    """The normal-start run (kept for tests written against one run)."""
    return pyodide_runs["normal"]
