"""Build the static, self-contained site in ``site/``.

    python3 build.py                  build site/
    python3 build.py --serve          build, then serve site/ on 127.0.0.1:8000
    python3 build.py --offline        build from .cache/ only; never run npm or pip

Steps, each cached in ``.cache/`` so that a rebuild needs no network and
takes seconds:

1. Pyodide runtime: ``npm pack`` of the one version pinned in
   ``pins/pyodide.json``; the tarball's sha512 must equal the pinned npm
   integrity before anything is extracted.
2. PyPI wheels: ``pip download --no-deps --only-binary=:all:`` of exactly the
   versions in ``requirements-core.txt``; each file's sha256 must equal
   ``pins/wheels.json``.
3. The noblegap wheel, written by hand from ``core/noblegap`` plus
   ``data/*.csv`` (as ``noblegap/_data/``), byte for byte reproducible.
4. Byte-compilation of every wheel inside Pyodide under Node
   (``tools/pyodide_compile.mjs``), since a ``.pyc`` only loads in the Python
   minor version that wrote it.
5. ``site/packages/noblegap-lock.json``: a Pyodide lock file listing these
   wheels with their sha256, so the browser checks every download.
6. Pages: the core runs here on CPython; every calculator page is rendered
   with its example already computed.
7. Static files, the web-app manifest, and ``sw.js`` with the precache list
   and a cache name derived from the content hash; ``build-manifest.json``
   lists every file with sha256 and size.

5b. The engine's memory snapshot (``tools/make_snapshot.mjs``): Pyodide booted
   under Node with the lock's wheels unpacked (each checked against its
   sha256), noblegap imported and warmed, the WebAssembly memory saved and
   shipped gzip-compressed with a JSON sidecar (Pyodide version, lock hash,
   a known case); restored once under Node before the site is accepted. The
   browser restores it instead of starting Python, and falls back to the
   normal start when it does not match or does not answer correctly.
"""

from __future__ import annotations

import argparse
import base64
import email.parser
import gzip
import hashlib
import http.server
import json
import os
import re
import shutil
import subprocess
import sys
import tarfile
import tempfile
import tomllib
from functools import partial
from pathlib import Path

ROOT = Path(__file__).absolute().parent
CORE = ROOT / "core"
DATA = ROOT / "data"
SITE_SRC = ROOT / "site_src"
TEMPLATES = SITE_SRC / "templates"
STATIC = SITE_SRC / "static"
PINS = ROOT / "pins"
TOOLS = ROOT / "tools"
SITE = ROOT / "site"
CACHE = Path(os.environ.get("NOBLEGAP_CACHE", ROOT / ".cache"))

PACKAGES_DIR = "packages"
LOCK_NAME = "noblegap-lock.json"
MANIFEST_NAME = "build-manifest.json"
SNAPSHOT_INFO = "noblegap-snapshot.json"
# Not ".gz": some static hosts would send Content-Encoding: gzip for it, and
# the browser would then hand the worker bytes it cannot check or unpack.
SNAPSHOT_FILE = "noblegap-snapshot.gzip"
SNAPSHOT_FORMAT = 3
SNAPSHOT_MAGIC = b"NGSNAP03"
# What the snapshot is made with: a change to any of them makes a new one.
SNAPSHOT_TOOLS = (TOOLS / "make_snapshot.mjs", STATIC / "engine.mjs", STATIC / "restore.mjs")
# The memory snapshot uses loadPyodide options that Pyodide marks private
# (_makeSnapshot, _loadSnapshot) and a container layout of its own. They were
# reviewed for these Pyodide versions and build ids only; after a pin bump,
# re-check them (pyodide.d.ts, pyodide.asm.mjs makeSnapshot/restoreSnapshot)
# and add the new pair. An unreviewed Pyodide builds a site without snapshot.
SNAPSHOT_REVIEWED = {"314.0.8": "1e170351f97e56f0814b6a94f77bf4f6ec7d8835c8b8b26c6b5282c473979fc3"}
# Checked after every restore, in the build and in each browser.
SNAPSHOT_KNOWN_CASE = {"calc": "couple", "inputs": {"metal_a": "Zn", "metal_b": "Cu"},
                       "keys": ["anode", "delta_E_V", "headline"]}
SW_NAME = "sw.js"
SW_MARKER = '"__NOBLEGAP_BUILD__"'

# Files of a PyPI wheel that the site never imports.
WHEEL_DROP = {"pint": ["pint/testsuite/"]}

# Files at the site root rather than under static/: the service worker's
# scope is the folder it is served from, and the web-app manifest's
# start_url is resolved against its own URL.
ROOT_STATIC = {"sw.js", "manifest.webmanifest"}

CSP = (
    "default-src 'self'; script-src 'self' 'wasm-unsafe-eval'; worker-src 'self'; "
    "connect-src 'self'; img-src 'self' data: blob:; style-src 'self'; "
    "object-src 'none'; base-uri 'self'; form-action 'self'"
)

MIME_TYPES = {
    ".mjs": "text/javascript",
    ".js": "text/javascript",
    ".wasm": "application/wasm",
    ".webmanifest": "application/manifest+json",
    ".json": "application/json",
    ".whl": "application/zip",
    ".zip": "application/zip",
    ".gzip": "application/gzip",
    ".svg": "image/svg+xml",
}


class BuildError(RuntimeError):
    """A build step failed; the message says which and what to do."""


def log(msg: str) -> None:
    print(f"build: {msg}", file=sys.stderr, flush=True)


def sha256_file(path: Path) -> str:
    h = hashlib.sha256()
    with open(path, "rb") as f:
        for block in iter(lambda: f.read(1 << 20), b""):
            h.update(block)
    return h.hexdigest()


def normalize(name: str) -> str:
    """PEP 503 name: lower case, runs of ``-_.`` become one ``-``."""
    return re.sub(r"[-_.]+", "-", name).lower()


# ---------------------------------------------------------------- pins


def load_pyodide_pin() -> dict:
    return json.loads((PINS / "pyodide.json").read_text())


def load_wheel_pins() -> dict:
    return json.loads((PINS / "wheels.json").read_text())["wheels"]


def core_requirements() -> list[tuple[str, str]]:
    """(name, version) for each ``name==version`` line of requirements-core.txt."""
    reqs = []
    for raw in (ROOT / "requirements-core.txt").read_text().splitlines():
        line = raw.split("#", 1)[0].strip()
        if not line:
            continue
        m = re.fullmatch(r"([A-Za-z0-9][A-Za-z0-9._-]*)==([A-Za-z0-9.+!-]+)", line)
        if not m:
            raise BuildError(f"requirements-core.txt: {raw!r} is not an exact 'name==version' pin")
        reqs.append((m.group(1), m.group(2)))
    return reqs


def project_meta() -> dict:
    return tomllib.loads((ROOT / "pyproject.toml").read_text())["project"]


# ---------------------------------------------------------------- inputs stamp


def input_files() -> list[Path]:
    """Every file whose content the built site depends on."""
    files = [ROOT / "build.py", ROOT / "requirements-core.txt", ROOT / "pyproject.toml"]
    for base in (CORE / "noblegap", DATA, SITE_SRC, PINS, TOOLS):
        if base.exists():
            for p in base.rglob("*"):
                if p.is_file() and "__pycache__" not in p.parts and p.suffix != ".pyc":
                    files.append(p)
    return sorted(set(files))


def inputs_digest() -> str:
    """sha256 over the paths and contents of :func:`input_files`."""
    h = hashlib.sha256()
    for p in input_files():
        h.update(p.relative_to(ROOT).as_posix().encode() + b"\0")
        h.update(sha256_file(p).encode() + b"\n")
    return h.hexdigest()


def site_is_current(site: Path = SITE) -> bool:
    """True when ``site`` was built from exactly the current inputs."""
    manifest = site / MANIFEST_NAME
    if not manifest.exists():
        return False
    try:
        return json.loads(manifest.read_text()).get("inputs") == inputs_digest()
    except ValueError:
        return False


# ---------------------------------------------------------------- step 1: Pyodide


def fetch_pyodide(pin: dict, offline: bool) -> Path:
    """Extracted Pyodide files for the pinned version (cached)."""
    version = pin["version"]
    out = CACHE / "pyodide" / version
    stamp = out / ".integrity"
    if stamp.exists() and stamp.read_text() == pin["integrity"]:
        return out
    tgz = CACHE / "npm" / f"pyodide-{version}.tgz"
    if not tgz.exists():
        if offline:
            raise BuildError(f"--offline, but {tgz} is not cached; run once without --offline")
        tgz.parent.mkdir(parents=True, exist_ok=True)
        log(f"npm pack {pin['package']}@{version}")
        subprocess.run(
            ["npm", "pack", f"{pin['package']}@{version}", "--pack-destination", str(tgz.parent),
             "--silent"],
            check=True, stdout=subprocess.DEVNULL,
        )
    digest = hashlib.sha512(tgz.read_bytes()).digest()
    integrity = "sha512-" + base64.b64encode(digest).decode()
    if integrity != pin["integrity"]:
        tgz.unlink()
        raise BuildError(
            f"{tgz.name}: integrity {integrity} does not match pins/pyodide.json "
            f"({pin['integrity']}); the cached tarball was removed, rebuild to fetch it again"
        )
    if out.exists():
        shutil.rmtree(out)
    out.mkdir(parents=True)
    with tarfile.open(tgz) as tf:
        for name in pin["files"]:
            member = tf.getmember(f"package/{name}")
            src = tf.extractfile(member)
            if src is None:
                raise BuildError(f"{tgz.name}: package/{name} is not a regular file")
            (out / name).write_bytes(src.read())
    stamp.write_text(pin["integrity"])
    return out


# ---------------------------------------------------------------- step 2: PyPI wheels


def _cached_wheels(cache: Path, name: str, version: str) -> list[Path]:
    return [p for p in sorted(cache.glob("*.whl"))
            if normalize(p.name.split("-")[0]) == normalize(name) and p.name.split("-")[1] == version]


def fetch_wheels(offline: bool) -> list[Path]:
    """The pinned PyPI wheels, downloaded once and checked against pins/wheels.json."""
    pins = load_wheel_pins()
    cache = CACHE / "wheels"
    cache.mkdir(parents=True, exist_ok=True)
    wheels = []
    for name, version in core_requirements():
        found = _cached_wheels(cache, name, version)
        if not found:
            if offline:
                raise BuildError(f"--offline, but no wheel for {name}=={version} in {cache}")
            log(f"pip download {name}=={version}")
            subprocess.run(
                [sys.executable, "-m", "pip", "download", "--quiet", "--disable-pip-version-check",
                 "--no-deps", "--only-binary=:all:", "--dest", str(cache), f"{name}=={version}"],
                check=True,
            )
            found = _cached_wheels(cache, name, version)
        if len(found) != 1:
            raise BuildError(f"expected one wheel for {name}=={version} in {cache}, found {found}")
        wheel = found[0]
        if not wheel.name.endswith("-none-any.whl"):
            raise BuildError(f"{wheel.name} is not a pure-Python wheel; Pyodide cannot use it as is")
        expected = pins.get(wheel.name)
        actual = sha256_file(wheel)
        if expected is None:
            raise BuildError(f"pins/wheels.json has no sha256 for {wheel.name}; "
                             "run `python3 build.py --update-pins` and review the diff")
        if actual != expected:
            raise BuildError(f"{wheel.name}: sha256 {actual} differs from pins/wheels.json {expected}")
        wheels.append(wheel)
    return wheels


def update_wheel_pins() -> None:
    """Rewrite pins/wheels.json from freshly downloaded wheels."""
    with tempfile.TemporaryDirectory() as tmp:
        specs = [f"{n}=={v}" for n, v in core_requirements()]
        subprocess.run(
            [sys.executable, "-m", "pip", "download", "--quiet", "--disable-pip-version-check",
             "--no-deps", "--only-binary=:all:", "--dest", tmp, *specs],
            check=True,
        )
        doc = json.loads((PINS / "wheels.json").read_text())
        doc["wheels"] = {p.name: sha256_file(p) for p in sorted(Path(tmp).glob("*.whl"))}
        (PINS / "wheels.json").write_text(json.dumps(doc, indent=2) + "\n")
    log("pins/wheels.json rewritten")


# ---------------------------------------------------------------- step 3: noblegap wheel


def _wheel_writer():
    sys.path.insert(0, str(TOOLS))
    try:
        import pyc_wheel
    finally:
        sys.path.remove(str(TOOLS))
    return pyc_wheel


def build_core_wheel() -> Path:
    """Write the noblegap wheel (source, py3-none-any) into the cache."""
    meta = project_meta()
    name, version = meta["name"], meta["version"]
    dist = f"{name}-{version}"
    members: dict[str, bytes] = {}
    pkg = CORE / "noblegap"
    for p in sorted(pkg.rglob("*")):
        if p.is_file() and "__pycache__" not in p.parts and p.suffix not in (".pyc", ".pyo"):
            rel = p.relative_to(CORE).as_posix()
            if rel.startswith("noblegap/_data/"):
                raise BuildError(f"core/{rel}: tables belong in data/, which build.py copies into _data/")
            members[rel] = p.read_bytes()
    for p in sorted(DATA.glob("*.csv")):
        members[f"noblegap/_data/{p.name}"] = p.read_bytes()
    requires = "".join(f"Requires-Dist: {d}\n" for d in meta.get("dependencies", []))
    members[f"{dist}.dist-info/METADATA"] = (
        "Metadata-Version: 2.1\n"
        f"Name: {name}\n"
        f"Version: {version}\n"
        f"Summary: {meta.get('description', '')}\n"
        f"Requires-Python: {meta.get('requires-python', '>=3.11')}\n"
        f"{requires}"
    ).encode()
    members[f"{dist}.dist-info/WHEEL"] = (
        "Wheel-Version: 1.0\nGenerator: noblegap build.py\nRoot-Is-Purelib: true\nTag: py3-none-any\n"
    ).encode()
    members[f"{dist}.dist-info/top_level.txt"] = b"noblegap\n"
    out_dir = CACHE / "build"
    out_dir.mkdir(parents=True, exist_ok=True)
    out = out_dir / f"{dist}-py3-none-any.whl"
    _wheel_writer().write_wheel(str(out), members, f"{dist}.dist-info")
    return out


# ---------------------------------------------------------------- step 4: byte-compile


def compile_wheels(pyodide_dir: Path, wheels: list[Path], pin: dict) -> list[Path]:
    """Byte-compile ``wheels`` inside Pyodide; cached by input content."""
    tool_hash = hashlib.sha256(
        (TOOLS / "pyc_wheel.py").read_bytes() + (TOOLS / "pyodide_compile.mjs").read_bytes()
    ).hexdigest()
    results: dict[Path, Path] = {}
    todo = []
    for wheel in wheels:
        drop = WHEEL_DROP.get(normalize(wheel.name.split("-")[0]), [])
        key = hashlib.sha256(
            f"{sha256_file(wheel)}|{pin['version']}|{tool_hash}|{json.dumps(drop)}".encode()
        ).hexdigest()[:32]
        cdir = CACHE / "pyc" / key
        hits = list(cdir.glob("*.whl")) if cdir.exists() else []
        if len(hits) == 1:
            results[wheel] = hits[0]
        else:
            todo.append((wheel, drop, cdir))
    if todo:
        if shutil.which("node") is None:
            raise BuildError("node is needed to byte-compile wheels inside Pyodide "
                             "(or pass --no-compile to ship source wheels)")
        with tempfile.TemporaryDirectory() as tmp:
            job = {
                "pyodide_dir": str(pyodide_dir),
                "out_dir": tmp,
                "wheels": [{"path": str(w), "drop": d} for w, d, _ in todo],
            }
            job_path = Path(tmp) / "job.json"
            job_path.write_text(json.dumps(job))
            log(f"byte-compiling {len(todo)} wheel(s) inside Pyodide {pin['version']}")
            proc = subprocess.run(
                ["node", str(TOOLS / "pyodide_compile.mjs"), str(job_path)],
                check=True, capture_output=True, text=True,
            )
            report = json.loads(proc.stdout.strip().splitlines()[-1])
            if report["python"] != pin["python"]:
                raise BuildError(f"Pyodide reports Python {report['python']}, "
                                 f"pins/pyodide.json says {pin['python']}")
            for wheel, _, cdir in todo:
                out_name = report["wheels"][wheel.name]
                if cdir.exists():
                    shutil.rmtree(cdir)
                cdir.mkdir(parents=True)
                shutil.copy2(Path(tmp) / out_name, cdir / out_name)
                results[wheel] = cdir / out_name
    return [results[w] for w in wheels]


# ---------------------------------------------------------------- step 5: lock file


def _wheel_metadata(path: Path) -> tuple[str, str, list[str], list[str]]:
    """(name, version, requirement names, top-level imports) of a wheel."""
    import zipfile

    with zipfile.ZipFile(path) as zf:
        names = zf.namelist()
        meta_name = next(n for n in names if n.endswith(".dist-info/METADATA") and n.count("/") == 1)
        meta = email.parser.Parser().parsestr(zf.read(meta_name).decode())
        top_name = meta_name.replace("METADATA", "top_level.txt")
        if top_name in names:
            imports = [s.strip() for s in zf.read(top_name).decode().splitlines() if s.strip()]
        else:
            imports = sorted({
                n.split("/", 1)[0].removesuffix(".py").removesuffix(".pyc")
                for n in names
                if not n.split("/", 1)[0].endswith((".dist-info", ".data"))
                and (n.endswith((".py", ".pyc")) or "/" in n)
            })
    requires = []
    for req in meta.get_all("Requires-Dist") or []:
        spec, _, marker = req.partition(";")
        if "extra" in marker:
            continue
        m = re.match(r"\s*([A-Za-z0-9][A-Za-z0-9._-]*)", spec)
        if m:
            requires.append((normalize(m.group(1)), marker.strip()))
    return meta["Name"], meta["Version"], requires, imports


def write_lock(pyodide_dir: Path, wheels: list[Path], out_dir: Path) -> dict:
    """Copy ``wheels`` into ``out_dir`` and write the site's Pyodide lock file.

    The entries are written directly in Pyodide's lock format (the ``info``
    block copied from the pinned Pyodide's own lock, so the ABI check
    passes), each with the sha256 that the browser checks on download.
    """
    info = json.loads((pyodide_dir / "pyodide-lock.json").read_text())["info"]
    out_dir.mkdir(parents=True, exist_ok=True)
    entries = {}
    reqs = {}
    for wheel in wheels:
        name, version, requires, imports = _wheel_metadata(wheel)
        key = normalize(name)
        shutil.copy2(wheel, out_dir / wheel.name)
        entries[key] = {
            "name": key,
            "version": version,
            "file_name": wheel.name,
            "install_dir": "site",
            "sha256": sha256_file(wheel),
            "package_type": "package",
            "imports": imports,
            "depends": [],
        }
        reqs[key] = requires
    for key, requires in reqs.items():
        for dep, marker in requires:
            if dep in entries:
                entries[key]["depends"].append(dep)
            elif not marker:
                raise BuildError(f"{key} requires {dep}, which is not bundled; "
                                 "pin it in requirements-core.txt")
        entries[key]["depends"].sort()
    lock = {"info": info, "packages": dict(sorted(entries.items()))}
    (out_dir / LOCK_NAME).write_text(json.dumps(lock, indent=1, sort_keys=True) + "\n")
    return lock


# ---------------------------------------------------------------- step 5a: standard library

# The site's standard library: the members of the pinned python_stdlib.zip
# that the site can ever import (tools/stdlib_closure.py), in their own zip.
STDLIB_FILE = "noblegap-stdlib.zip"
STDLIB_TOOLS = (TOOLS / "stdlib_closure.mjs", TOOLS / "stdlib_closure.py")
PARITY_CASES = ROOT / "tests" / "parity" / "cases.json"


def stdlib_members(pyodide_dir: Path, packages: Path, pin: dict) -> list[str]:
    """The import closure of Pyodide's start plus the engine, as zip member names (cached)."""
    lock_sha = sha256_file(packages / LOCK_NAME)
    key = hashlib.sha256(
        b"".join(p.read_bytes() for p in STDLIB_TOOLS) + PARITY_CASES.read_bytes()
        + f"|{pin['version']}|{lock_sha}".encode()
    ).hexdigest()[:32]
    cached = CACHE / "stdlib" / f"{key}.json"
    if not cached.exists():
        if shutil.which("node") is None:
            raise BuildError("node is needed to find the standard library modules the site imports")
        log("finding the standard library modules the engine can import")
        proc = subprocess.run(["node", str(TOOLS / "stdlib_closure.mjs"), str(pyodide_dir),
                               str(packages / LOCK_NAME), str(PARITY_CASES)], capture_output=True, text=True)
        if proc.returncode != 0:
            raise BuildError(f"tools/stdlib_closure.mjs failed:\n{proc.stderr[-4000:]}")
        report = json.loads(proc.stdout.strip().splitlines()[-1])
        cached.parent.mkdir(parents=True, exist_ok=True)
        cached.write_text(json.dumps(report, indent=1) + "\n")
    return json.loads(cached.read_text())["members"]


def write_stdlib(pyodide_dir: Path, site: Path, pin: dict) -> dict:
    """site/pyodide/noblegap-stdlib.zip: the closure's members, byte for byte, in the original order.

    Deterministic (the original timestamps, deflate level 9). Every package
    a member lives in keeps its ``__init__.py``.
    """
    import zipfile

    members = set(stdlib_members(pyodide_dir, site / PACKAGES_DIR, pin))
    source = pyodide_dir / "python_stdlib.zip"
    out = site / "pyodide" / STDLIB_FILE
    with zipfile.ZipFile(source) as zin:
        names = set(zin.namelist())
        for name in sorted(members):
            parts = name.split("/")[:-1]
            for i in range(1, len(parts) + 1):
                init = "/".join(parts[:i]) + "/__init__.py"
                if init in names:
                    members.add(init)
        unknown = members - names
        if unknown:
            raise BuildError(f"python_stdlib.zip has no {sorted(unknown)[:3]}")
        with zipfile.ZipFile(out, "w") as zout:
            for info in zin.infolist():
                if info.filename not in members:
                    continue
                copy = zipfile.ZipInfo(info.filename, date_time=info.date_time)
                copy.external_attr = info.external_attr
                copy.compress_type = zipfile.ZIP_DEFLATED
                zout.writestr(copy, zin.read(info), compresslevel=9)
    full, kept = source.stat().st_size, out.stat().st_size
    log(f"standard library: {len(members)} of {len(names)} members, {kept / 1e6:.2f} of {full / 1e6:.2f} MB")
    return {"members": len(members), "size": kept}


# ---------------------------------------------------------------- step 5b: memory snapshot


def _unpack_locked_wheels(packages: Path, lock: dict) -> dict[str, bytes]:
    """Every file of the lock's wheels (site-packages layout), each wheel checked first."""
    import zipfile

    files: dict[str, bytes] = {}
    for key, entry in sorted(lock["packages"].items()):
        path = packages / entry["file_name"]
        actual = sha256_file(path)
        if actual != entry["sha256"]:
            raise BuildError(f"{entry['file_name']}: sha256 {actual} does not match the lock ({entry['sha256']})")
        with zipfile.ZipFile(path) as zf:
            for info in zf.infolist():
                name = info.filename
                if info.is_dir():
                    continue
                if name.startswith("/") or ".." in name.split("/") or "\\" in name:
                    raise BuildError(f"{entry['file_name']}: unsafe member name {name!r}")
                data = zf.read(info)
                if name in files and files[name] != data:
                    raise BuildError(f"{entry['file_name']}: {name} differs from another wheel's copy")
                files[name] = data
    return dict(sorted(files.items()))


# 4 KiB: the memory's zero runs are often shorter than 64 KiB (and free heap
# blocks are zeroed before the save), so the container unpacks ~2 MB less.
SNAPSHOT_PAGE = 4096


def _xor(a: bytes, b: bytes) -> bytes:
    return (int.from_bytes(a, "little") ^ int.from_bytes(b, "little")).to_bytes(len(a), "little")


def _snapshot_container(files: dict[str, bytes], memory: bytes, base: bytes, gaps: bytes, pin: dict,
                        imported: list[str] = ()) -> bytes:
    """MAGIC, u32 header length, header JSON, Pyodide's header, gap list, files, padding, heap pages.

    ``memory`` is Pyodide's memory snapshot (its own header, then the whole
    heap); ``base`` the runtime's heap when it was instantiated, before
    Python ran (static/restore.mjs describes the format). Each heap page is
    stored XOR the same page of the base (zeros past the base), and pages
    that come out all zero are left out (``memory_runs`` lists the [first
    page, count] runs kept). ``files`` are stored except ``imported``, the
    compiled modules imported before the memory was saved, which Python never
    reads again.
    """
    page = SNAPSHOT_PAGE
    prefix_size = int.from_bytes(memory[4:8], "little")
    if prefix_size % 4 or not 12 <= prefix_size < len(memory):
        raise BuildError(f"Pyodide's snapshot header is {prefix_size} bytes: not a snapshot this build knows")
    heap = memory[prefix_size:]
    zero = bytes(page)
    if len(base) % page:
        raise BuildError(f"the base image is {len(base)} bytes, not a whole number of {page}-byte pages")
    base_pages = len(base) // page
    if len(base) > len(heap):
        raise BuildError("the runtime's initial heap is larger than the snapshot's")
    runs: list[list[int]] = []
    kept = []
    for i in range(0, (len(heap) + page - 1) // page):
        chunk = heap[i * page:(i + 1) * page].ljust(page, b"\0")
        if i < base_pages:
            chunk = _xor(chunk, base[i * page:(i + 1) * page])
        if chunk == zero:
            continue
        kept.append(chunk)
        if runs and runs[-1][0] + runs[-1][1] == i:
            runs[-1][1] += 1
        else:
            runs.append([i, 1])
    prefix = memory[:prefix_size]
    left_out = set(imported)
    if not left_out <= set(files):
        raise BuildError(f"imported files not among the package files: {sorted(left_out - set(files))[:3]}")
    stored = {name: data for name, data in files.items() if name not in left_out}
    total = sum(len(d) for d in stored.values())
    offset = 0
    while True:
        header = json.dumps({
            "format": SNAPSHOT_FORMAT, "pyodide": pin["version"],
            "files": [[name, len(data)] for name, data in stored.items()],
            "imported": sorted(left_out),
            "prefix_size": prefix_size, "memory_offset": offset, "memory_size": len(memory),
            "page_size": page,
            "base": {"size": len(base), "sha256": hashlib.sha256(base).hexdigest(), "gaps_size": len(gaps)},
            "memory_runs": runs,
        }, separators=(",", ":")).encode()
        start = 12 + len(header) + prefix_size + len(gaps) + total
        aligned = (start + 15) // 16 * 16
        if aligned == offset:
            break
        offset = aligned
    parts = [SNAPSHOT_MAGIC, len(header).to_bytes(4, "little"), header, prefix, gaps, *stored.values(),
             b"\0" * (offset - start), *kept]
    return b"".join(parts)


def _known_case(api) -> dict:
    case = SNAPSHOT_KNOWN_CASE
    result = api.run(case["calc"], case["inputs"])
    if not result.get("ok"):
        raise BuildError(f"the snapshot's known case fails on CPython: {result}")
    expect = {k: result["result"]["display"]["headline"] if k == "headline" else result["result"][k]
              for k in case["keys"]}
    return {"calc": case["calc"], "inputs": case["inputs"], "expect": expect}


def make_snapshot(site: Path, pin: dict, api) -> dict | None:
    """Write packages/noblegap-snapshot.{gzip,json} into ``site``; cached in .cache/snapshot/.

    Returns the sidecar, or None (with a warning) when the pinned Pyodide is
    not one whose private snapshot options were reviewed.
    """
    reviewed = SNAPSHOT_REVIEWED.get(pin["version"])
    if reviewed is None:
        log(f"WARNING: no memory snapshot: Pyodide {pin['version']} is not in SNAPSHOT_REVIEWED; "
            "the site starts the normal way until its snapshot options are reviewed")
        return None
    if shutil.which("node") is None:
        raise BuildError("node is needed to make the engine's memory snapshot")
    packages = site / PACKAGES_DIR
    lock_bytes = (packages / LOCK_NAME).read_bytes()
    lock = json.loads(lock_bytes)
    files = _unpack_locked_wheels(packages, lock)
    lock_sha = hashlib.sha256(lock_bytes).hexdigest()
    tool_hash = hashlib.sha256(
        b"".join((p).read_bytes() for p in SNAPSHOT_TOOLS)
    ).hexdigest()
    key = hashlib.sha256(
        f"{lock_sha}|{pin['version']}|{tool_hash}|{SNAPSHOT_FORMAT}|{SNAPSHOT_PAGE}|"
        f"{sha256_file(site / 'pyodide' / STDLIB_FILE)}".encode()
    ).hexdigest()[:32]
    cdir = CACHE / "snapshot" / key
    memory_path, report_path, gz_path = cdir / "memory.bin", cdir / "report.json", cdir / SNAPSHOT_FILE
    if not (memory_path.exists() and report_path.exists() and gz_path.exists()):
        with tempfile.TemporaryDirectory() as tmp:
            fdir = Path(tmp) / "files"
            for name, data in files.items():
                (fdir / name).parent.mkdir(parents=True, exist_ok=True)
                (fdir / name).write_bytes(data)
            job = {"site_dir": str(site), "files_dir": str(fdir), "files": list(files),
                   "memory_out": str(Path(tmp) / "memory.bin"), "base_out": str(Path(tmp) / "base.bin"),
                   "gaps_out": str(Path(tmp) / "gaps.bin")}
            (Path(tmp) / "job.json").write_text(json.dumps(job))
            log(f"making the engine's memory snapshot inside Pyodide {pin['version']}")
            proc = subprocess.run(["node", str(TOOLS / "make_snapshot.mjs"), str(Path(tmp) / "job.json")],
                                  capture_output=True, text=True)
            if proc.returncode != 0:
                raise BuildError(f"tools/make_snapshot.mjs failed:\n{proc.stderr[-4000:]}")
            report = json.loads(proc.stdout.strip().splitlines()[-1])
            if (report["pyodide"], report["python"]) != (pin["version"], pin["python"]):
                raise BuildError(f"snapshot made in Pyodide {report['pyodide']} / Python {report['python']}, "
                                 f"pins/pyodide.json says {pin['version']} / {pin['python']}")
            if report["pyodide_build_id"] != reviewed:
                raise BuildError(f"Pyodide {pin['version']} has build id {report['pyodide_build_id']}, "
                                 f"SNAPSHOT_REVIEWED says {reviewed}: review the snapshot options again")
            if cdir.exists():
                shutil.rmtree(cdir)
            cdir.mkdir(parents=True)
            memory = (Path(tmp) / "memory.bin").read_bytes()
            container = _snapshot_container(files, memory, (Path(tmp) / "base.bin").read_bytes(),
                                            (Path(tmp) / "gaps.bin").read_bytes(), pin, report["imported_files"])
            gz_path.write_bytes(gzip.compress(container, compresslevel=9, mtime=0))
            shutil.copyfile(Path(tmp) / "memory.bin", memory_path)
            report["raw_size"] = len(container)
            report_path.write_text(json.dumps(report))
    report = json.loads(report_path.read_text())
    shutil.copyfile(gz_path, packages / SNAPSHOT_FILE)
    digest = hashlib.sha256(gz_path.read_bytes()).digest()
    build_id = hashlib.sha256(
        f"noblegap-snapshot/{SNAPSHOT_FORMAT}|pyodide {pin['version']}|lock {lock_sha}".encode()
    ).hexdigest()
    info = {
        "format": SNAPSHOT_FORMAT,
        "build_id": build_id,
        "pyodide": pin["version"],
        "pyodide_build_id": report["pyodide_build_id"],
        "python": report["python"],
        "lock_sha256": lock_sha,
        "file": SNAPSHOT_FILE,
        "sha256": digest.hex(),
        "sha256_b64": base64.b64encode(digest).decode(),
        "size": gz_path.stat().st_size,
        "raw_size": report["raw_size"],
        "memory_size": report["memory_size"],
        "package_files": len(files),
        "known_case": _known_case(api),
    }
    (packages / SNAPSHOT_INFO).write_text(json.dumps(info, indent=1) + "\n")
    verify_snapshot(site, info)
    log(f"snapshot: {info['raw_size'] / 1e6:.1f} MB raw, {info['size'] / 1e6:.1f} MB gzip "
        f"({len(files) - len(report['imported_files'])} of {len(files)} package files, "
        f"memory {info['memory_size'] / 1e6:.1f} MB)")
    return info


def verify_snapshot(site: Path, info: dict) -> None:
    """Restore the snapshot under Node through static/engine.mjs; the known case must match."""
    case = info["known_case"]
    with tempfile.TemporaryDirectory() as tmp:
        cases = Path(tmp) / "cases.json"
        cases.write_text(json.dumps([{"calc": case["calc"], "inputs": case["inputs"]}]))
        proc = subprocess.run(["node", str(TOOLS / "pyodide_run.mjs"), "--mode", "snapshot", str(site), str(cases)],
                              capture_output=True, text=True)
    if proc.returncode != 0:
        raise BuildError(f"the memory snapshot does not restore under Node:\n{proc.stderr[-4000:]}")
    result = json.loads(proc.stdout.strip().splitlines()[-1])["results"][0]
    got = {k: result["result"]["display"]["headline"] if k == "headline" else result["result"][k]
           for k in case["expect"]}
    if got != case["expect"]:
        raise BuildError(f"the restored snapshot answers {got}, CPython {case['expect']}")


# ---------------------------------------------------------------- step 6: pages


def import_core():
    """Import noblegap (from core/, not any installed copy) on CPython."""
    sys.path.insert(0, str(CORE))
    for mod in [m for m in sys.modules if m == "noblegap" or m.startswith("noblegap.")]:
        del sys.modules[mod]
    import noblegap.api

    return noblegap.api


def _template(env, name: str):
    if not (TEMPLATES / name).exists():
        raise BuildError(f"site_src/templates/{name} is missing")
    return env.get_template(name)


def render_pages(site: Path, site_globals: dict, api) -> list[str]:
    import jinja2

    env = jinja2.Environment(
        loader=jinja2.FileSystemLoader(str(TEMPLATES)),
        autoescape=jinja2.select_autoescape(["html", "xml"]),
        undefined=jinja2.StrictUndefined,
        keep_trailing_newline=True,
    )
    # site and csp are the documented globals; nav and version are the same
    # facts under the names the page templates use.
    env.globals.update(site=site_globals, csp=CSP, nav=site_globals["calculators"],
                       version=site_globals["version"])
    desc = api.describe()
    written = []
    for calc in desc["calculators"]:
        example = calc.get("example", {})
        result = api.run(calc["name"], example)
        if not result.get("ok"):
            raise BuildError(f"calculator {calc['name']!r}: its example fails on CPython: {result}")
        json.dumps(result, allow_nan=False)
        html = _template(env, "calc.html").render(
            calc=calc, example_inputs=example, example_result=result, page=calc_page(calc),
            page_name=calc["name"],
        )
        (site / calc_page(calc)).write_text(html)
        written.append(calc_page(calc))
    html = _template(env, "index.html").render(
        calculators=desc["calculators"], page="index.html", page_name="index")
    (site / "index.html").write_text(html)
    written.append("index.html")
    # Job records (issue 12): the saved jobs and the joint schedule pages.
    for name in JOB_PAGES:
        html = _template(env, name).render(calculators=desc["calculators"], page=name,
                                           page_name=name.removesuffix(".html"))
        (site / name).write_text(html)
        written.append(name)
    for extra in desc.get("pages", []):
        html = _template(env, extra["template"]).render(
            **{"page": extra["out"], "page_name": extra["out"].removesuffix(".html"),
               **extra.get("context", {})})
        (site / extra["out"]).write_text(html)
        written.append(extra["out"])
    return written


JOB_PAGES = ("jobs.html", "schedule.html")


def copy_examples(site: Path) -> None:
    """data/examples/*.csv (templates a user downloads) -> site/examples/."""
    for p in sorted((DATA / "examples").glob("*.csv")):
        (site / "examples").mkdir(exist_ok=True)
        shutil.copyfile(p, site / "examples" / p.name)


def calc_page(calc: dict) -> str:
    return calc.get("page") or f"{calc['name']}.html"


def site_globals_for(api, pin: dict) -> dict:
    desc = api.describe()
    meta = project_meta()
    static_css = sorted(p.name for p in STATIC.glob("*.css")) if STATIC.exists() else []
    return {
        "name": "noblegap",
        "version": meta["version"],
        "pyodide_version": pin["version"],
        "python_version": pin["python"],
        "calculators": [
            {"name": c["name"], "title": c.get("title", c["name"]),
             "summary": c.get("summary", ""), "page": calc_page(c)}
            for c in desc["calculators"]
        ],
        "pages": [
            {"out": p["out"], "title": p.get("context", {}).get("title", p["out"])}
            for p in desc.get("pages", [])
        ],
        "assets": {
            "app_js": "static/app.js",
            "worker_js": "static/worker.js",
            "css": [f"static/{n}" for n in static_css],
            "manifest": "manifest.webmanifest",
            "sw": SW_NAME,
            "icon_svg": "static/icon.svg",
            "icon_png": "static/icon-192.png",
            "lock": f"{PACKAGES_DIR}/{LOCK_NAME}",
            "pyodide": "pyodide/",
        },
        "csp": CSP,
    }


# ---------------------------------------------------------------- step 7: static, manifest, sw


def copy_static(site: Path) -> None:
    if not STATIC.exists():
        return
    for p in sorted(STATIC.rglob("*")):
        if not p.is_file() or p.name.startswith("."):
            continue
        rel = p.relative_to(STATIC)
        if rel.as_posix() == SW_NAME:
            continue
        dest = site / rel if rel.as_posix() in ROOT_STATIC else site / "static" / rel
        dest.parent.mkdir(parents=True, exist_ok=True)
        shutil.copyfile(p, dest)


def write_manifest_and_sw(site: Path, inputs: str, pin: dict) -> dict:
    files = {}
    for p in sorted(site.rglob("*")):
        rel = p.relative_to(site).as_posix()
        if p.is_file() and rel not in (MANIFEST_NAME, SW_NAME):
            files[rel] = {"sha256": sha256_file(p), "size": p.stat().st_size}
    content = hashlib.sha256(
        "".join(f"{k}\0{v['sha256']}\n" for k, v in files.items()).encode()
    ).hexdigest()
    version = project_meta()["version"]
    cache_name = f"noblegap-{version}-{content[:16]}"
    manifest = {
        "name": "noblegap",
        "version": version,
        "pyodide": pin["version"],
        "inputs": inputs,
        "content_sha256": content,
        "cache": cache_name,
        "files": files,
    }
    sw_src = STATIC / SW_NAME
    if sw_src.exists():
        text = sw_src.read_text()
        if text.count(SW_MARKER) != 1:
            raise BuildError(f"site_src/static/{SW_NAME} must contain {SW_MARKER} exactly once")
        build = {"cache": cache_name, "files": sorted(files)}
        (site / SW_NAME).write_text(text.replace(SW_MARKER, json.dumps(build, separators=(",", ":"))))
    (site / MANIFEST_NAME).write_text(json.dumps(manifest, indent=1) + "\n")
    return manifest


# ---------------------------------------------------------------- driver


def build(site: Path = SITE, offline: bool = False, compile_pyc: bool = True, snapshot: bool = True) -> dict:
    """Build the whole site into ``site``; returns the build manifest."""
    inputs = inputs_digest()
    pin = load_pyodide_pin()
    pyodide_dir = fetch_pyodide(pin, offline)
    wheels = fetch_wheels(offline) + [build_core_wheel()]
    if compile_pyc:
        wheels = compile_wheels(pyodide_dir, wheels, pin)
    api = import_core()
    site_globals = site_globals_for(api, pin)

    tmp = site.with_name(site.name + ".tmp")
    if tmp.exists():
        shutil.rmtree(tmp)
    tmp.mkdir(parents=True)
    try:
        (tmp / "pyodide").mkdir()
        for name in pin["site_files"]:
            shutil.copyfile(pyodide_dir / name, tmp / "pyodide" / name)
        write_lock(pyodide_dir, wheels, tmp / PACKAGES_DIR)
        write_stdlib(pyodide_dir, tmp, pin)
        copy_static(tmp)
        copy_examples(tmp)
        if snapshot:
            make_snapshot(tmp, pin, api)
        render_pages(tmp, site_globals, api)
        manifest = write_manifest_and_sw(tmp, inputs, pin)
    except BaseException:
        shutil.rmtree(tmp, ignore_errors=True)
        raise
    if site.exists():
        shutil.rmtree(site)
    tmp.rename(site)
    total = sum(f["size"] for f in manifest["files"].values())
    log(f"site/ ready: {len(manifest['files'])} files, {total / 1e6:.1f} MB, cache {manifest['cache']}")
    return manifest


class SiteHandler(http.server.SimpleHTTPRequestHandler):
    """Static files with the site's CSP header and correct module/wasm types."""

    extensions_map = {**http.server.SimpleHTTPRequestHandler.extensions_map, **MIME_TYPES}

    def end_headers(self):
        self.send_header("Content-Security-Policy", CSP)
        self.send_header("Cache-Control", "no-cache")
        self.send_header("X-Content-Type-Options", "nosniff")
        super().end_headers()

    def log_message(self, format, *args):
        if os.environ.get("NOBLEGAP_SERVE_LOG"):
            super().log_message(format, *args)


class SiteServer(http.server.ThreadingHTTPServer):
    daemon_threads = True

    def handle_error(self, request, client_address):
        # A browser that drops a download half way (a reload, a closed tab)
        # is routine, not a server error.
        if isinstance(sys.exc_info()[1], (BrokenPipeError, ConnectionResetError)):
            return
        super().handle_error(request, client_address)


def make_server(site: Path = SITE, port: int = 8000) -> SiteServer:
    """An HTTP server for ``site`` on 127.0.0.1 (``port=0`` picks a free port)."""
    handler = partial(SiteHandler, directory=str(site))
    return SiteServer(("127.0.0.1", port), handler)


def main(argv=None) -> int:
    parser = argparse.ArgumentParser(description="Build the noblegap static site into site/.")
    parser.add_argument("--serve", action="store_true", help="serve site/ on 127.0.0.1 after building")
    parser.add_argument("--port", type=int, default=8000, help="port for --serve (default 8000)")
    parser.add_argument("--offline", action="store_true", help="use .cache/ only; never run npm or pip")
    parser.add_argument("--no-compile", action="store_true",
                        help="ship source wheels instead of byte-compiling them inside Pyodide")
    parser.add_argument("--no-snapshot", action="store_true",
                        help="ship no memory snapshot (every visit starts Python the normal way)")
    parser.add_argument("--update-pins", action="store_true",
                        help="rewrite pins/wheels.json from requirements-core.txt, then exit")
    args = parser.parse_args(argv)
    try:
        if args.update_pins:
            update_wheel_pins()
            return 0
        build(offline=args.offline, compile_pyc=not args.no_compile, snapshot=not args.no_snapshot)
    except (BuildError, subprocess.CalledProcessError) as exc:
        print(f"build failed: {exc}", file=sys.stderr)
        return 1
    if args.serve:
        server = make_server(SITE, args.port)
        host, port = server.server_address[:2]
        print(f"Serving site/ at http://{host}:{port}/  (Ctrl-C to stop)", flush=True)
        try:
            server.serve_forever()
        except KeyboardInterrupt:
            pass
        finally:
            server.server_close()
    return 0


if __name__ == "__main__":
    sys.exit(main())
