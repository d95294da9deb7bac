"""The built site is complete, integrity-checked and self-contained."""

import hashlib
import html
import json
import re
import urllib.request
import zipfile

import pytest

from _site import build_module, ensure_site, serve_site

build = build_module()


@pytest.fixture(scope="module")
def site():
    return ensure_site()


@pytest.fixture(scope="module")
def manifest(site):
    return json.loads((site / build.MANIFEST_NAME).read_text())


@pytest.fixture(scope="module")
def lock(site):
    return json.loads((site / build.PACKAGES_DIR / build.LOCK_NAME).read_text())


def sha256(path):
    return hashlib.sha256(path.read_bytes()).hexdigest()


def test_site_is_built_from_current_inputs(site):
    assert build.site_is_current(site)


def test_every_lock_entry_matches_its_file(site, lock):
    assert lock["packages"], "the lock file lists no packages"
    for name, entry in lock["packages"].items():
        assert "://" not in entry["file_name"], f"{name} would be fetched from another origin"
        path = site / build.PACKAGES_DIR / entry["file_name"]
        assert path.is_file(), entry["file_name"]
        assert sha256(path) == entry["sha256"], entry["file_name"]
        for dep in entry["depends"]:
            assert dep in lock["packages"], f"{name} depends on {dep}, which is not in the lock"


def test_engine_package_depends_on_pint(lock):
    assert "pint" in lock["packages"]["noblegap"]["depends"]


def test_wheels_are_byte_compiled_and_complete(site, lock):
    for entry in lock["packages"].values():
        with zipfile.ZipFile(site / build.PACKAGES_DIR / entry["file_name"]) as zf:
            names = zf.namelist()
        assert not [n for n in names if n.endswith(".py")], entry["file_name"]
        assert [n for n in names if n.endswith(".pyc")], entry["file_name"]
    with zipfile.ZipFile(site / build.PACKAGES_DIR / lock["packages"]["noblegap"]["file_name"]) as zf:
        packaged = {n.rsplit("/", 1)[1] for n in zf.namelist() if n.startswith("noblegap/_data/")}
    assert packaged == {p.name for p in build.DATA.glob("*.csv")}


def test_core_wheel_is_reproducible():
    first = build.build_core_wheel().read_bytes()
    second = build.build_core_wheel().read_bytes()
    assert first == second


def test_build_manifest_lists_every_file(site, manifest):
    on_disk = {
        p.relative_to(site).as_posix()
        for p in site.rglob("*")
        if p.is_file() and p.name not in (build.MANIFEST_NAME, build.SW_NAME)
    }
    assert set(manifest["files"]) == on_disk
    for rel, meta in manifest["files"].items():
        path = site / rel
        assert path.stat().st_size == meta["size"], rel
        assert sha256(path) == meta["sha256"], rel


def test_service_worker_precaches_every_file(site, manifest):
    text = (site / build.SW_NAME).read_text()
    assert build.SW_MARKER not in text
    m = re.search(r"const BUILD = (\{.*?\});\n", text)
    assert m, "sw.js has no BUILD object"
    sw_build = json.loads(m.group(1))
    assert set(sw_build["files"]) == set(manifest["files"])
    assert sw_build["cache"] == manifest["cache"]
    assert manifest["content_sha256"][:16] in manifest["cache"]
    for page in ("index.html", "manifest.webmanifest", "pyodide/pyodide.asm.wasm",
                 "static/worker.js", "static/engine.mjs"):
        assert page in sw_build["files"], page


def test_every_calculator_has_a_page_with_the_csp(site):
    import noblegap.api as api

    pages = [build.calc_page(c) for c in api.describe()["calculators"]] + ["index.html"]
    for page in pages:
        text = (site / page).read_text()
        m = re.search(r'<meta http-equiv="Content-Security-Policy" content="([^"]*)"', text)
        assert m, f"{page} has no CSP meta element"
        assert html.unescape(m.group(1)) == build.CSP, page


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
                assert resp.headers["Content-Security-Policy"] == build.CSP
                assert resp.headers["Content-Type"].startswith(mime), path


# ---------------------------------------------------------------- memory snapshot


@pytest.fixture(scope="module")
def snapshot_info(site):
    return json.loads((site / build.PACKAGES_DIR / build.SNAPSHOT_INFO).read_text())


def _container(site, info):
    import gzip

    data = gzip.decompress((site / build.PACKAGES_DIR / info["file"]).read_bytes())
    assert data[:8] == build.SNAPSHOT_MAGIC
    length = int.from_bytes(data[8:12], "little")
    return data, json.loads(data[12:12 + length]), 12 + length


def test_snapshot_sidecar_matches_its_file_pyodide_and_lock(site, snapshot_info, manifest):
    info = snapshot_info
    pin = build.load_pyodide_pin()
    path = site / build.PACKAGES_DIR / info["file"]
    assert info["format"] == build.SNAPSHOT_FORMAT
    assert (info["pyodide"], info["python"]) == (pin["version"], pin["python"])
    assert info["pyodide_build_id"] == build.SNAPSHOT_REVIEWED[pin["version"]]
    assert info["sha256"] == sha256(path) and info["size"] == path.stat().st_size
    lock_sha = sha256(site / build.PACKAGES_DIR / build.LOCK_NAME)
    assert info["lock_sha256"] == lock_sha
    # the id engine.mjs computes from the Pyodide it loads and the lock it fetches
    expected_id = hashlib.sha256(
        f"noblegap-snapshot/{build.SNAPSHOT_FORMAT}|pyodide {pin['version']}|lock {lock_sha}".encode()).hexdigest()
    assert info["build_id"] == expected_id
    # shipped compressed, listed in the manifest, so the service worker precaches it
    assert info["size"] < info["raw_size"] / 2
    assert f"{build.PACKAGES_DIR}/{info['file']}" in manifest["files"]
    assert f"{build.PACKAGES_DIR}/{build.SNAPSHOT_INFO}" in manifest["files"]
    assert not info["file"].endswith(".gz"), "a host could send Content-Encoding: gzip for .gz"


def test_snapshot_known_case_is_cpython_answer(snapshot_info):
    from noblegap import api

    case = snapshot_info["known_case"]
    assert (case["calc"], case["inputs"]) == ("couple", {"metal_a": "Zn", "metal_b": "Cu"})
    assert case["expect"]["anode"] == "Zn"
    assert case["expect"]["delta_E_V"] == pytest.approx(1.1037, abs=5e-5)
    result = api.run(case["calc"], case["inputs"])
    assert case["expect"]["headline"] == result["result"]["display"]["headline"]


def test_snapshot_holds_exactly_the_locked_wheels_files(site, snapshot_info, lock):
    data, header, offset = _container(site, snapshot_info)
    assert len(data) == snapshot_info["raw_size"]
    expected = {}
    for entry in lock["packages"].values():
        with zipfile.ZipFile(site / build.PACKAGES_DIR / entry["file_name"]) as zf:
            for info in zf.infolist():
                if not info.is_dir():
                    expected[info.filename] = zf.read(info)
    got = {}
    for name, size in header["files"]:
        got[name] = data[offset:offset + size]
        offset += size
    assert got == expected
    # memory: 16-byte aligned after the files, only non-zero pages stored
    assert header["memory_offset"] % 16 == 0 and header["memory_offset"] >= offset
    pages = sum(count for _, count in header["memory_runs"])
    assert len(data) == header["memory_offset"] + pages * header["page_size"]
    assert pages * header["page_size"] < header["memory_size"]
    assert header["memory_size"] == snapshot_info["memory_size"]


def test_snapshot_container_round_trip():
    pin = {"version": "0"}
    page = build.SNAPSHOT_PAGE
    memory = bytes(page) + b"\x01" * 10 + bytes(page - 10) + bytes(2 * page) + b"\x02" * page
    data = build._snapshot_container({"a/b.py": b"xyz"}, memory, pin)
    length = int.from_bytes(data[8:12], "little")
    header = json.loads(data[12:12 + length])
    assert header["memory_runs"] == [[1, 1], [4, 1]]
    assert data[12 + length:12 + length + 3] == b"xyz"
    rebuilt = bytearray(header["memory_size"])
    at = header["memory_offset"]
    for first, count in header["memory_runs"]:
        rebuilt[first * page:(first + count) * page] = data[at:at + count * page]
        at += count * page
    assert bytes(rebuilt) == memory
