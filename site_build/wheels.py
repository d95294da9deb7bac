"""Stage: the wheels the engine loads, and the site's lock file.

* PyPI wheels: ``pip download --no-deps --only-binary=:all:`` of exactly the
  versions in ``requirements-core.txt``; each file's sha256 must equal
  ``pins/wheels.json``.
* The noblegap wheel, written by hand from ``core/noblegap`` plus
  ``data/*.csv`` (as ``noblegap/_data/``), byte for byte reproducible.
* Byte-compilation of every wheel inside Pyodide under Node
  (``pyodide_compile.mjs`` + ``pyc_wheel.py``, beside this file), since a
  ``.pyc`` only loads in the Python minor version that wrote it.
* ``packages/noblegap-lock.json``: a Pyodide lock file listing these wheels
  with their sha256, so the browser checks every download.
"""

from __future__ import annotations

import email.parser
import hashlib
import json
import os
import re
import shutil
import subprocess
import sys
import tempfile
import zipfile
from pathlib import Path

from .common import BuildError, log, normalize, sha256_file
from .names import NAMES
from .paths import CACHE, CORE, DATA, HERE, PINS, core_requirements, load_wheel_pins, project_meta

# Files of a PyPI wheel that the site never imports.
WHEEL_DROP = {"pint": ["pint/testsuite/"]}
COMPILE_TOOLS = (HERE / "pyc_wheel.py", HERE / "pyodide_compile.mjs")


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


def _wheel_writer():
    from . import pyc_wheel

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
                raise BuildError(f"core/{rel}: tables belong in data/, which the build copies into _data/")
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
    # One folder per content: builds in other checkouts sharing the cache
    # never overwrite the wheel this one is about to read.
    key = hashlib.sha256(b"".join(k.encode() + b"\0" + v + b"\0" for k, v in sorted(members.items())))
    out_dir = CACHE / "build" / key.hexdigest()[:32]
    out = out_dir / f"{dist}-py3-none-any.whl"
    if not out.exists():
        out_dir.mkdir(parents=True, exist_ok=True)
        tmp = out.with_name(f"{out.name}.{os.getpid()}.tmp")
        _wheel_writer().write_wheel(str(tmp), members, f"{dist}.dist-info")
        tmp.replace(out)
    return out


def compile_wheels(pyodide_dir: Path, wheels: list[Path], pin: dict) -> list[Path]:
    """Byte-compile ``wheels`` inside Pyodide; cached by input content."""
    tool_hash = hashlib.sha256(
        b"".join(p.read_bytes() for p in COMPILE_TOOLS)
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
                ["node", str(HERE / "pyodide_compile.mjs"), str(job_path)],
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


def _wheel_metadata(path: Path) -> tuple[str, str, list[str], list[str]]:
    """(name, version, requirement names, top-level imports) of a wheel."""
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
    (out_dir / NAMES["lock_file"]).write_text(json.dumps(lock, indent=1, sort_keys=True) + "\n")
    return lock


