"""The engine's memory snapshot, made at build time under Node and restored
once under Node before the site is accepted.

``make_snapshot.mjs`` boots the pinned Pyodide with the private option
``_makeSnapshot`` (FORMAT.md lists every private API the fast start uses),
writes the lock's wheels (unpacked here, each checked against its sha256)
into site-packages, runs ``noblegap.engine_hooks.warm_up()`` and saves the
WebAssembly memory; ``container.py`` stores it as a delta against the
runtime's data segments, gzip-compressed, with a JSON sidecar (Pyodide
version, lock hash, build id, the known case).
"""

from __future__ import annotations

import base64
import gzip
import hashlib
import json
import shutil
import subprocess
import tempfile
import zipfile
from pathlib import Path

from ..common import BuildError, log, sha256_file
from ..names import NAMES
from ..paths import CACHE, HERE as BUILD_HERE, PACKAGES_DIR, PYODIDE_DIR, STATIC
from . import FASTSTART_NAMES, HERE, REVIEWED, build_id
from .container import SNAPSHOT_FORMAT, SNAPSHOT_PAGE, snapshot_container
from .stdlib import STDLIB_FILE, write_rest_stdlib

SNAPSHOT_INFO = FASTSTART_NAMES["info_file"]
SNAPSHOT_FILE = FASTSTART_NAMES["snapshot_file"]
# What the snapshot is made with: a change to any of them makes a new one.
SNAPSHOT_TOOLS = (HERE / "make_snapshot.mjs", STATIC / "engine" / "engine.mjs",
                  STATIC / "engine" / "faststart" / "start.mjs", STATIC / "engine" / "faststart" / "restore.mjs")


def _unpack_locked_wheels(packages: Path, lock: dict) -> dict[str, bytes]:
    """Every file of the lock's wheels (site-packages layout), each wheel checked first."""
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


def make_snapshot(site: Path, pin: dict, hooks) -> dict:
    """Write packages/noblegap-snapshot.{gzip,json} into ``site``; cached in .cache/snapshot/.

    ``hooks`` is noblegap.engine_hooks on CPython (the known case's answer).
    Returns the sidecar. Only for a reviewed Pyodide (``available``).
    """
    reviewed = REVIEWED[pin["version"]]
    packages = site / PACKAGES_DIR
    lock_bytes = (packages / NAMES["lock_file"]).read_bytes()
    lock = json.loads(lock_bytes)
    files = _unpack_locked_wheels(packages, lock)
    lock_sha = hashlib.sha256(lock_bytes).hexdigest()
    tool_hash = hashlib.sha256(
        b"".join(p.read_bytes() for p in SNAPSHOT_TOOLS)
    ).hexdigest()
    key = hashlib.sha256(
        f"{lock_sha}|{pin['version']}|{tool_hash}|{SNAPSHOT_FORMAT}|{SNAPSHOT_PAGE}|"
        f"{sha256_file(site / PYODIDE_DIR / STDLIB_FILE)}".encode()
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
            proc = subprocess.run(["node", str(HERE / "make_snapshot.mjs"), str(Path(tmp) / "job.json")],
                                  capture_output=True, text=True)
            if proc.returncode != 0:
                raise BuildError(f"site_build/faststart/make_snapshot.mjs failed:\n{proc.stderr[-4000:]}")
            report = json.loads(proc.stdout.strip().splitlines()[-1])
            if (report["pyodide"], report["python"]) != (pin["version"], pin["python"]):
                raise BuildError(f"snapshot made in Pyodide {report['pyodide']} / Python {report['python']}, "
                                 f"pins/pyodide.json says {pin['version']} / {pin['python']}")
            if report["pyodide_build_id"] != reviewed:
                raise BuildError(f"Pyodide {pin['version']} has build id {report['pyodide_build_id']}, "
                                 f"site_build/faststart REVIEWED says {reviewed}: review the snapshot options again")
            if cdir.exists():
                shutil.rmtree(cdir)
            cdir.mkdir(parents=True)
            memory = (Path(tmp) / "memory.bin").read_bytes()
            container = snapshot_container(files, memory, (Path(tmp) / "base.bin").read_bytes(),
                                            (Path(tmp) / "gaps.bin").read_bytes(), pin, report["imported_files"])
            gz_path.write_bytes(gzip.compress(container, compresslevel=9, mtime=0))
            shutil.copyfile(Path(tmp) / "memory.bin", memory_path)
            report["raw_size"] = len(container)
            report["raw_sha256"] = hashlib.sha256(container).hexdigest()
            report_path.write_text(json.dumps(report))
    report = json.loads(report_path.read_text())
    shutil.copyfile(gz_path, packages / SNAPSHOT_FILE)
    stdlib_rest_sha = write_rest_stdlib(site, report["imported_stdlib"])
    digest = hashlib.sha256(gz_path.read_bytes()).digest()
    info = {
        "format": SNAPSHOT_FORMAT,
        "build_id": build_id(pin["version"], lock_sha),
        "pyodide": pin["version"],
        "pyodide_build_id": report["pyodide_build_id"],
        "python": report["python"],
        "lock_sha256": lock_sha,
        "file": SNAPSHOT_FILE,
        "sha256": digest.hex(),
        "sha256_b64": base64.b64encode(digest).decode(),
        "size": gz_path.stat().st_size,
        "raw_size": report["raw_size"],
        "raw_sha256": report["raw_sha256"],
        "memory_size": report["memory_size"],
        "package_files": len(files),
        "stdlib_rest_sha256": stdlib_rest_sha,
        "known_case": hooks.known_case(),
    }
    (packages / SNAPSHOT_INFO).write_text(json.dumps(info, indent=1) + "\n")
    verify_snapshot(site, info)
    log(f"snapshot: {info['raw_size'] / 1e6:.1f} MB raw, {info['size'] / 1e6:.1f} MB gzip "
        f"({len(files) - len(report['imported_files'])} of {len(files)} package files, "
        f"memory {info['memory_size'] / 1e6:.1f} MB)")
    return info


def verify_snapshot(site: Path, info: dict) -> None:
    """Restore the snapshot under Node through static/engine/; the known case must match."""
    case = info["known_case"]
    with tempfile.TemporaryDirectory() as tmp:
        cases = Path(tmp) / "cases.json"
        cases.write_text(json.dumps([{"calc": case["calc"], "inputs": case["inputs"]}]))
        proc = subprocess.run(["node", str(BUILD_HERE / "pyodide_run.mjs"), "--mode", "snapshot", str(site), str(cases)],
                              capture_output=True, text=True)
    if proc.returncode != 0:
        raise BuildError(f"the memory snapshot does not restore under Node:\n{proc.stderr[-4000:]}")
    report = json.loads(proc.stdout.strip().splitlines()[-1])
    if report["mode"] != NAMES["modes"]["faststart"]:
        raise BuildError(f"the snapshot was not used under Node: {report['note']}")
    result = report["results"][0]
    got = {k: result["result"]["display"]["headline"] if k == "headline" else result["result"][k]
           for k in case["expect"]}
    if got != case["expect"]:
        raise BuildError(f"the restored snapshot answers {got}, CPython {case['expect']}")
