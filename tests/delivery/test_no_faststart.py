"""A site without the fast start: ``--no-faststart``, and a checkout whose two
``faststart/`` folders were deleted, both build a complete site that starts
the normal way (the browser side: tests/browser/test_start_without_faststart.py)."""

import json
import os
import shutil
import subprocess
import sys

import pytest

from _site import ROOT, build_site
from site_build import paths
from site_build.names import read_names

FASTSTART_FILES = ("static/engine/faststart", "packages/noblegap-snapshot.json",
                   "packages/noblegap-snapshot.gzip", "pyodide/noblegap-stdlib.zip")


def _check_plain(site):
    names = read_names(site)
    assert names["faststart"] is None
    assert names["stdlib_file"] == "python_stdlib.zip"
    assert (site / paths.PYODIDE_DIR / names["stdlib_file"]).is_file()
    for rel in FASTSTART_FILES:
        assert not (site / rel).exists(), rel
    manifest = json.loads((site / paths.MANIFEST_NAME).read_text())
    assert not [f for f in manifest["files"] if "faststart" in f or "snapshot" in f]
    for rel in ("static/engine/worker.js", "static/engine/engine.mjs", "couple.html", "sw.js"):
        assert (site / rel).is_file(), rel


@pytest.fixture(scope="module")
def plain_site(tmp_path_factory):
    return build_site(tmp_path_factory.mktemp("plain") / "site", "--no-faststart", "--offline")


def test_no_faststart_builds_a_site_without_it(plain_site):
    _check_plain(plain_site)


def test_pyodide_run_refuses_a_fast_start_the_site_does_not_have(plain_site, tmp_path):
    if shutil.which("node") is None:
        if os.environ.get("CI"):
            pytest.fail("node is required in CI")
        pytest.skip("node is not installed")
    cases = tmp_path / "cases.json"
    cases.write_text(json.dumps([{"calc": "couple", "inputs": {"metal_a": "Zn", "metal_b": "Cu"}}]))
    proc = subprocess.run(["node", str(ROOT / "site_build" / "pyodide_run.mjs"), "--mode", "snapshot",
                           str(plain_site), str(cases)], capture_output=True, text=True, timeout=300)
    assert proc.returncode == 1 and "without the fast start" in proc.stderr


def test_deleting_the_faststart_folders_leaves_a_working_build(tmp_path):
    checkout = tmp_path / "checkout"
    checkout.mkdir()
    for name in ("core", "data", "site_src", "pins", "site_build"):
        shutil.copytree(ROOT / name, checkout / name, ignore=shutil.ignore_patterns("__pycache__"))
    for name in ("build.py", "pyproject.toml", "requirements-core.txt"):
        shutil.copy2(ROOT / name, checkout / name)
    shutil.rmtree(checkout / "site_build" / "faststart")
    shutil.rmtree(checkout / "site_src" / "static" / "engine" / "faststart")
    env = {**os.environ, "NOBLEGAP_CACHE": str(paths.CACHE)}     # the downloads are shared
    proc = subprocess.run([sys.executable, "build.py", "--offline"], cwd=checkout, env=env,
                          capture_output=True, text=True, timeout=600)
    assert proc.returncode == 0, proc.stderr
    assert "no fast start" in proc.stderr
    _check_plain(checkout / "site")
