"""The fast start in the built site: the snapshot's sidecar, its container,
its base, and the trimmed standard library (site_build/faststart/)."""

import hashlib
import json
import zipfile

import pytest

from _site import ensure_site
from site_build import paths, runtime
from site_build.common import BuildError
from site_build.faststart import FASTSTART_NAMES, REVIEWED, build_id
from site_build.faststart.container import SNAPSHOT_FORMAT, SNAPSHOT_MAGIC, SNAPSHOT_PAGE, snapshot_container
from site_build.faststart.snapshot import SNAPSHOT_INFO
from site_build.faststart.stdlib import STDLIB_FILE, STDLIB_REST_FILE
from site_build.names import NAMES, read_names


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


@pytest.fixture(scope="module")
def snapshot_info(site):
    return json.loads((site / paths.PACKAGES_DIR / SNAPSHOT_INFO).read_text())


def _container(site, info):
    import gzip

    data = gzip.decompress((site / paths.PACKAGES_DIR / info["file"]).read_bytes())
    assert data[:8] == SNAPSHOT_MAGIC
    length = int.from_bytes(data[8:12], "little")
    return data, json.loads(data[12:12 + length]), 12 + length


def test_snapshot_sidecar_matches_its_file_pyodide_and_lock(site, snapshot_info, manifest):
    info = snapshot_info
    pin = paths.load_pyodide_pin()
    path = site / paths.PACKAGES_DIR / info["file"]
    assert info["format"] == SNAPSHOT_FORMAT
    assert (info["pyodide"], info["python"]) == (pin["version"], pin["python"])
    assert info["pyodide_build_id"] == REVIEWED[pin["version"]]
    assert info["sha256"] == sha256(path) and info["size"] == path.stat().st_size
    lock_sha = sha256(site / paths.PACKAGES_DIR / NAMES["lock_file"])
    assert info["lock_sha256"] == lock_sha
    # the id engine.mjs computes from the Pyodide it loads and the lock it fetches
    expected_id = hashlib.sha256(
        f"noblegap-snapshot/{SNAPSHOT_FORMAT}|pyodide {pin['version']}|lock {lock_sha}".encode()).hexdigest()
    assert info["build_id"] == expected_id == build_id(pin["version"], lock_sha)
    # shipped compressed, listed in the manifest, so the service worker precaches it
    assert info["size"] < info["raw_size"] / 2
    assert f"{paths.PACKAGES_DIR}/{info['file']}" in manifest["files"]
    assert f"{paths.PACKAGES_DIR}/{SNAPSHOT_INFO}" in manifest["files"]
    assert not info["file"].endswith(".gz"), "a host could send Content-Encoding: gzip for .gz"


def test_snapshot_known_case_is_cpython_answer(snapshot_info):
    from noblegap import api

    case = snapshot_info["known_case"]
    assert (case["calc"], case["inputs"]) == ("couple", {"metal_a": "Zn", "metal_b": "Cu"})
    assert case["expect"]["anode"] == "Zn"
    assert case["expect"]["delta_E_V"] == pytest.approx(1.1037, abs=5e-5)
    result = api.run(case["calc"], case["inputs"])
    assert case["expect"]["headline"] == result["result"]["display"]["headline"]


def _leb128(data: bytes, at: int, signed: bool = False) -> tuple[int, int]:
    """(value, offset after it) of the LEB128 number at data[at]."""
    result = shift = 0
    while True:
        byte = data[at]
        at += 1
        result |= (byte & 0x7F) << shift
        shift += 7
        if not byte & 0x80:
            if signed and byte & 0x40:
                result -= 1 << shift
            return result, at


def _wasm_data_segments(wasm: bytes):
    """Active data segments of a WebAssembly binary, [(offset, bytes)]: an
    independent reader (restore.mjs has the browser's)."""
    def leb(at, signed=False):
        return _leb128(wasm, at, signed)

    assert wasm[:4] == b"\0asm"
    segments, at = [], 8
    while at < len(wasm):
        section, (size, body) = wasm[at], leb(at + 1)
        at = body + size
        if section != 11:
            continue
        count, p = leb(body)
        for _ in range(count):
            flags, p = leb(p)
            assert flags in (0, 1)
            offset = None
            if flags == 0:
                assert wasm[p] == 0x41
                offset, p = leb(p + 1, signed=True)
                assert wasm[p] == 0x0B
                p += 1
            length, p = leb(p)
            if offset is not None:
                segments.append((offset & 0xFFFFFFFF, wasm[p:p + length]))
            p += length
    return segments


def test_snapshot_holds_the_package_files_python_may_still_read(site, snapshot_info, lock):
    data, header, offset = _container(site, snapshot_info)
    assert len(data) == snapshot_info["raw_size"]
    wheel_files = {}
    for entry in lock["packages"].values():
        with zipfile.ZipFile(site / paths.PACKAGES_DIR / entry["file_name"]) as zf:
            wheel_files.update({i.filename: zf.read(i) for i in zf.infolist() if not i.is_dir()})
    # left out: only compiled modules that were imported before the save
    imported = set(header["imported"])
    assert imported and imported <= set(wheel_files)
    assert all(name.endswith(".pyc") for name in imported)
    assert {"noblegap/api.pyc", "pint/__init__.pyc"} <= imported
    # everything else is stored, byte for byte: the data tables among it
    offset += header["prefix_size"] + header["base"]["gaps_size"]
    stored = {}
    for name, size in header["files"]:
        stored[name] = data[offset:offset + size]
        offset += size
    assert stored == {name: body for name, body in wheel_files.items() if name not in imported}
    assert "noblegap/_data/alloys.csv" in stored
    assert [name for name, _ in header["files"]] == sorted(stored)
    assert header["memory_offset"] == (offset + 15) // 16 * 16
    pages = sum(count for _, count in header["memory_runs"])
    assert len(data) == header["memory_offset"] + pages * header["page_size"]
    assert pages * header["page_size"] < header["memory_size"] / 2
    assert header["memory_size"] == snapshot_info["memory_size"]


def test_snapshot_base_is_the_runtimes_data_segments(site, snapshot_info):
    _, header, _ = _container(site, snapshot_info)
    wasm = (site / "pyodide" / "pyodide.asm.wasm").read_bytes()
    segments = _wasm_data_segments(wasm)
    end = max(offset + len(chunk) for offset, chunk in segments)
    image = bytearray(end)
    for offset, chunk in segments:
        image[offset:offset + len(chunk)] = chunk
    size = header["base"]["size"]
    assert size % header["page_size"] == 0 and 0 < end <= size < end + header["page_size"]
    image = bytes(image).ljust(size, b"\0")
    assert hashlib.sha256(image).hexdigest() == header["base"]["sha256"]
    # the gap list: exactly the bytes of [0, size) no segment covers
    covered = bytearray(size)
    for offset, chunk in segments:
        covered[offset:offset + len(chunk)] = b"\1" * len(chunk)
    data, header, at = _container(site, snapshot_info)
    at += header["prefix_size"]
    gaps = bytearray(size)
    for start, stop in _decode_runs(data[at:at + header["base"]["gaps_size"]]):
        gaps[start:stop] = b"\1" * (stop - start)
    assert all(c != g for c, g in zip(covered, gaps))


def _decode_runs(blob):
    """The gap list: LEB128 pairs (bytes since the previous gap's end, gap length)."""
    runs, at, end = [], 0, 0
    values = []
    while at < len(blob):
        value, at = _leb128(blob, at)
        values.append(value)
    for skip, length in zip(values[::2], values[1::2]):
        runs.append((end + skip, end + skip + length))
        end += skip + length
    return runs


def _rebuild(data, base_image):
    """Pyodide's memory from a container, the way restore.mjs applySnapshot does."""
    length = int.from_bytes(data[8:12], "little")
    header = json.loads(data[12:12 + length])
    page, prefix = header["page_size"], header["prefix_size"]
    out = bytearray(header["memory_size"])
    out[:prefix] = data[12 + length:12 + length + prefix]
    out[prefix:prefix + len(base_image)] = base_image
    at = header["memory_offset"]
    for first, count in header["memory_runs"]:
        for i in range(first, first + count):
            start = prefix + i * page
            chunk = data[at:at + page][:len(out) - start]
            out[start:start + len(chunk)] = bytes(x ^ y for x, y in zip(out[start:start + len(chunk)], chunk))
            at += page
    return header, bytes(out)


def test_snapshot_container_round_trip():
    pin = {"version": "0"}
    page = SNAPSHOT_PAGE
    prefix = b"snp\0" + (16).to_bytes(4, "little") + b"12345678"
    base = b"\x05" * 10 + bytes(page - 10) + b"\x07" * page + bytes(page)
    heap = (b"\x05" * 10 + bytes(page - 10)           # page 0: same as the base -> left out
            + b"\x07" * 100 + b"\x09" * (page - 100)  # page 1: differs from the base
            + bytes(page)                             # page 2: zeros -> left out
            + b"\x02" * 5 + bytes(page - 5)           # page 3: past the base
            + b"\x03" * 7)                            # a partial last page
    memory = prefix + heap
    files = {"a/b.py": b"xyz", "a/c.pyc": b"CODE-OF-C"}
    data = snapshot_container(files, memory, base[:2 * page], b"\x05\x07", pin, imported=["a/c.pyc"])
    header, rebuilt = _rebuild(data, base[:2 * page])
    assert header["files"] == [["a/b.py", 3]] and header["imported"] == ["a/c.pyc"]
    at = 12 + int.from_bytes(data[8:12], "little") + 16
    assert data[at:at + 5] == b"\x05\x07xyz" and b"CODE-OF-C" not in data
    assert header["base"]["gaps_size"] == 2
    assert header["base"]["size"] == 2 * page
    assert header["base"]["sha256"] == hashlib.sha256(base[:2 * page]).hexdigest()
    assert header["memory_runs"] == [[1, 1], [3, 2]]
    assert rebuilt == memory


def test_snapshot_container_refuses_unknown_imported_files():
    memory = b"snp\0" + (16).to_bytes(4, "little") + bytes(8) + bytes(64)
    with pytest.raises(BuildError, match="not among the package files"):
        snapshot_container({"a.py": b""}, memory, b"", b"", {"version": "0"}, imported=["b.pyc"])


def test_snapshot_container_refuses_an_unknown_pyodide_header():
    with pytest.raises(BuildError, match="not a snapshot"):
        snapshot_container({}, b"snp\0" + (7).to_bytes(4, "little") + bytes(64), b"", b"", {"version": "0"})


def test_site_stdlib_is_a_byte_identical_subset_of_pyodides(site):
    pin = paths.load_pyodide_pin()
    official = runtime.fetch_pyodide(pin, offline=True) / "python_stdlib.zip"
    with zipfile.ZipFile(official) as full, zipfile.ZipFile(site / "pyodide" / STDLIB_FILE) as ours:
        names = ours.namelist()
        assert set(names) < set(full.namelist())
        assert names == [n for n in full.namelist() if n in set(names)]       # original order
        for name in names:
            assert ours.read(name) == full.read(name), name
    kept = set(names)
    # what the engine and Pyodide's start import, codecs looked up by name,
    # and sysconfig's data module (imported by a computed name)
    for needed in ["json/__init__.py", "json/decoder.py", "traceback.py", "linecache.py", "fractions.py",
                   "encodings/utf_8.py", "encodings/latin_1.py", "importlib/metadata/__init__.py",
                   "_pyodide/_base.py", "pyodide/ffi/__init__.py"]:
        assert needed in kept, needed
    assert any(n.startswith("_sysconfigdata_") for n in kept)
    # every package keeps its __init__.py
    for name in kept:
        parts = name.split("/")[:-1]
        for i in range(1, len(parts) + 1):
            init = "/".join(parts[:i]) + "/__init__.py"
            assert init in kept or init not in set(zipfile.ZipFile(official).namelist()), init
    assert "python_stdlib.zip" not in {p.name for p in (site / "pyodide").iterdir()}


def test_fast_start_stdlib_is_the_site_stdlib_less_what_the_snapshot_imported(site, snapshot_info):
    # The fast start loads only the members whose modules are not in the
    # saved memory: byte for byte, in the site stdlib's order, the file the
    # sidecar names by sha256; the engine's own imports are left out.
    rest_path = site / "pyodide" / STDLIB_REST_FILE
    assert snapshot_info["stdlib_rest_sha256"] == sha256(rest_path)
    with zipfile.ZipFile(site / "pyodide" / STDLIB_FILE) as full, zipfile.ZipFile(rest_path) as rest:
        names = rest.namelist()
        assert names == [n for n in full.namelist() if n in set(names)]
        for name in names:
            assert rest.read(name) == full.read(name), name
        left_out = set(full.namelist()) - set(names)
    for imported in ["json/__init__.py", "json/decoder.py", "fractions.py", "_pyodide/_base.py"]:
        assert imported in left_out, imported
    assert "pdb.py" in names and "doctest.py" in names       # in the closure, never imported by the engine
    assert rest_path.stat().st_size < 0.7 * (site / "pyodide" / STDLIB_FILE).stat().st_size


def test_early_requests_are_the_large_files_of_the_fast_start(site, manifest):
    # what the worker requests before loading the engine's scripts: files of
    # the site, in the offline copy's list, the fast start's and nothing else
    early = FASTSTART_NAMES["early"]
    assert early == [f"{paths.PACKAGES_DIR}/{FASTSTART_NAMES['snapshot_file']}",
                     f"{paths.PYODIDE_DIR}/{FASTSTART_NAMES['compressed']['pyodide.asm.wasm']}",
                     f"{paths.PYODIDE_DIR}/{FASTSTART_NAMES['compressed']['pyodide.asm.mjs']}"]
    # the rest of the standard library is not: it is fetched once the snapshot is here
    assert f"{paths.PYODIDE_DIR}/{STDLIB_REST_FILE}" not in early
    for path in early:
        assert (site / path).is_file() and path in manifest["files"], path


def test_names_json_is_the_builds_names_written_once(site):
    names = read_names(site)
    assert names["faststart"] == FASTSTART_NAMES
    assert names["stdlib_file"] == STDLIB_FILE == FASTSTART_NAMES["stdlib_file"]
    assert {k: v for k, v in names.items() if k not in ("faststart", "stdlib_file")} == NAMES
    assert (site / paths.PACKAGES_DIR / FASTSTART_NAMES["info_file"]).is_file()
    assert (site / paths.PACKAGES_DIR / FASTSTART_NAMES["snapshot_file"]).is_file()
