"""The built site is complete, integrity-checked and self-contained (fast start: test_faststart.py)."""

import gzip
import hashlib
import html
import json
import re
import urllib.request
import zipfile

import pytest

from _site import build_options, ensure_site, serve_site
from site_build import offline, pages, paths, wheels
from site_build.names import NAMES


@pytest.fixture(scope="module")
def site():
    return ensure_site()


@pytest.fixture(scope="module")
def manifest(site):
    return json.loads((site / paths.MANIFEST_NAME).read_text())


@pytest.fixture(scope="module")
def lock(site):
    return json.loads((site / paths.PACKAGES_DIR / NAMES["lock_file"]).read_text())


def sha256(path):
    return hashlib.sha256(path.read_bytes()).hexdigest()


def test_site_is_built_from_current_inputs(site):
    assert offline.site_is_current(site, build_options())


def test_every_lock_entry_matches_its_file(site, lock):
    assert lock["packages"], "the lock file lists no packages"
    for name, entry in lock["packages"].items():
        assert "://" not in entry["file_name"], f"{name} would be fetched from another origin"
        path = site / paths.PACKAGES_DIR / entry["file_name"]
        assert path.is_file(), entry["file_name"]
        assert sha256(path) == entry["sha256"], entry["file_name"]
        for dep in entry["depends"]:
            assert dep in lock["packages"], f"{name} depends on {dep}, which is not in the lock"


def test_engine_package_depends_on_pint(lock):
    assert "pint" in lock["packages"]["noblegap"]["depends"]


def test_wheels_are_byte_compiled_and_complete(site, lock):
    for entry in lock["packages"].values():
        with zipfile.ZipFile(site / paths.PACKAGES_DIR / entry["file_name"]) as zf:
            names = zf.namelist()
        assert not [n for n in names if n.endswith(".py")], entry["file_name"]
        assert [n for n in names if n.endswith(".pyc")], entry["file_name"]
    with zipfile.ZipFile(site / paths.PACKAGES_DIR / lock["packages"]["noblegap"]["file_name"]) as zf:
        packaged = {n.rsplit("/", 1)[1] for n in zf.namelist() if n.startswith("noblegap/_data/")}
    assert packaged == {p.name for p in paths.DATA.glob("*.csv")}


def test_core_wheel_is_reproducible():
    first = wheels.build_core_wheel().read_bytes()
    second = wheels.build_core_wheel().read_bytes()
    assert first == second


def test_build_manifest_lists_every_file(site, manifest):
    on_disk = {
        p.relative_to(site).as_posix()
        for p in site.rglob("*")
        if p.is_file() and p.name not in (paths.MANIFEST_NAME, offline.SW_NAME)
    }
    assert set(manifest["files"]) == on_disk
    for rel, meta in manifest["files"].items():
        path = site / rel
        assert path.stat().st_size == meta["size"], rel
        assert sha256(path) == meta["sha256"], rel


def test_service_worker_precaches_every_file(site, manifest):
    text = (site / offline.SW_NAME).read_text()
    assert offline.SW_MARKER not in text
    m = re.search(r"const BUILD = (\{.*?\});\n", text)
    assert m, "sw.js has no BUILD object"
    sw_build = json.loads(m.group(1))
    # a plain file with a gzip twin is served from the twin, never fetched twice
    unpack = sw_build["unpack"]
    assert set(sw_build["files"]) == set(manifest["files"]) - set(unpack)
    for plain, twin in unpack.items():
        packed = twin["packed"]
        assert packed in sw_build["files"], packed
        # the service worker keeps the unpacked bytes only if they have this sha256
        assert hashlib.sha256(gzip.decompress((site / packed).read_bytes())).hexdigest() == twin["sha256"], plain
        if plain in manifest["files"]:
            assert gzip.decompress((site / packed).read_bytes()) == (site / plain).read_bytes(), plain
        else:   # the snapshot, unpacked only into the offline copy
            info = json.loads((site / "packages" / "noblegap-snapshot.json").read_text())
            assert plain == "packages/noblegap-snapshot.container" and packed == f"packages/{info['file']}"
            assert twin["sha256"] == info["raw_sha256"]
    assert sw_build["cache"] == manifest["cache"]
    assert manifest["content_sha256"][:16] in manifest["cache"]
    for page in ("index.html", "manifest.webmanifest", "pyodide/pyodide.mjs",
                 "static/engine/worker.js", "static/engine/engine.mjs", "static/engine/names.json"):
        assert page in sw_build["files"], page


def test_every_calculator_has_a_page_with_the_csp(site):
    import noblegap.api as api

    names = [pages.calc_page(c) for c in api.describe()["calculators"]] + ["index.html"]
    for page in names:
        text = (site / page).read_text()
        m = re.search(r'<meta http-equiv="Content-Security-Policy" content="([^"]*)"', text)
        assert m, f"{page} has no CSP meta element"
        assert html.unescape(m.group(1)) == pages.CSP, page


OWN_FILES = (".html", ".js", ".mjs", ".css", ".json", ".webmanifest", ".svg")
# Namespace identifiers, never fetched.
NOT_REQUESTS = ("http://www.w3.org/",)


def test_no_url_to_another_origin(site):
    """Nothing outside site/pyodide names another origin.

    Pyodide's own files mention its CDN for packages missing from the lock;
    every package is in our lock with a relative file name (checked above),
    so that code path never runs.
    """
    offenders = []
    for path in site.rglob("*"):
        rel = path.relative_to(site).as_posix()
        if not path.is_file() or rel.startswith("pyodide/") or path.suffix not in OWN_FILES:
            continue
        for url in re.findall(r"""https?://[^\s"'<>)]+""", path.read_text()):
            if not url.startswith(NOT_REQUESTS):
                offenders.append(f"{rel}: {url}")
    assert offenders == []


def test_web_app_manifest_is_installable(site):
    data = json.loads((site / "manifest.webmanifest").read_text())
    assert data["name"] == "noblegap"
    assert data["start_url"] == "./index.html"
    assert data["display"] == "standalone"
    sizes = {icon["sizes"] for icon in data["icons"]}
    assert {"192x192", "512x512"} <= sizes
    for icon in data["icons"]:
        assert (site / icon["src"]).is_file(), icon["src"]


def test_server_sends_csp_and_types(site):
    with serve_site(site) as base:
        for path, mime in [("index.html", "text/html"), ("pyodide/pyodide.mjs", "text/javascript"),
                           ("pyodide/pyodide.asm.wasm", "application/wasm"),
                           ("manifest.webmanifest", "application/manifest+json")]:
            with urllib.request.urlopen(base + path, timeout=10) as resp:
                assert resp.headers["Content-Security-Policy"] == pages.CSP
                assert resp.headers["Content-Type"].startswith(mime), path
