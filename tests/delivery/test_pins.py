"""Pinned versions agree everywhere: CPython, pins/, and the built site.

requirements-core.txt is the one list of runtime dependency versions. The
CPython side must have exactly those installed, pins/wheels.json must hold a
checksum for exactly those wheels, and the site must bundle exactly those
versions (plus noblegap itself at the pyproject version).
"""

import importlib.metadata
import json
import re
import tomllib

import pytest

from _site import ROOT, ensure_site
from site_build import paths
from site_build.common import normalize
from site_build.names import NAMES

REQUIREMENTS = paths.core_requirements()


@pytest.fixture(scope="module")
def site_lock():
    return json.loads((ensure_site() / paths.PACKAGES_DIR / NAMES["lock_file"]).read_text())


def test_requirements_are_exact_pins():
    assert REQUIREMENTS, "requirements-core.txt lists no packages"
    assert len({normalize(n) for n, _ in REQUIREMENTS}) == len(REQUIREMENTS)


@pytest.mark.parametrize("name,version", REQUIREMENTS, ids=[n for n, _ in REQUIREMENTS])
def test_cpython_has_the_pinned_version(name, version):
    assert importlib.metadata.version(name) == version


def test_pyproject_dependencies_match_requirements():
    deps = tomllib.loads((ROOT / "pyproject.toml").read_text())["project"]["dependencies"]
    pinned = {normalize(n): v for n, v in REQUIREMENTS}
    for dep in deps:
        m = re.fullmatch(r"([A-Za-z0-9._-]+)==(\S+)", dep)
        assert m, f"pyproject dependency {dep!r} is not an exact pin"
        assert pinned.get(normalize(m.group(1))) == m.group(2), dep


def test_wheel_checksums_cover_exactly_the_pins():
    names = {(normalize(f.split("-")[0]), f.split("-")[1]) for f in paths.load_wheel_pins()}
    assert names == {(normalize(n), v) for n, v in REQUIREMENTS}


def test_pyodide_pin_is_well_formed():
    pin = paths.load_pyodide_pin()
    assert re.fullmatch(r"\d+\.\d+\.\d+", pin["version"])
    assert re.fullmatch(r"sha512-[A-Za-z0-9+/]{86}==", pin["integrity"])
    assert set(pin["site_files"]) <= set(pin["files"])


def test_site_bundles_the_pinned_versions(site_lock):
    bundled = {name: entry["version"] for name, entry in site_lock["packages"].items()}
    expected = {normalize(n): v for n, v in REQUIREMENTS}
    expected["noblegap"] = tomllib.loads((ROOT / "pyproject.toml").read_text())["project"]["version"]
    assert bundled == expected
    for name, entry in site_lock["packages"].items():
        dist, version = entry["file_name"].split("-")[:2]
        assert (normalize(dist), version) == (name, entry["version"])


def test_site_lock_matches_the_pinned_pyodide(site_lock):
    pin = paths.load_pyodide_pin()
    assert site_lock["info"]["python"] == pin["python"]
    assert site_lock["info"]["abi_version"] == pin["abi_version"]
