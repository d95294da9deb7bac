"""The site's standard library: the members of the pinned python_stdlib.zip
the site can ever import (``stdlib_closure.mjs`` + ``stdlib_closure.py``
beside this file), byte for byte, in their own zip; and the fast start's
share of it, the members whose modules the memory snapshot has not imported
(``write_rest_stdlib``).
"""

from __future__ import annotations

import hashlib
import json
import shutil
import subprocess
import zipfile
from pathlib import Path

from ..common import BuildError, log, sha256_file
from ..names import NAMES
from ..paths import CACHE, PACKAGES_DIR, PYODIDE_DIR
from . import FASTSTART_NAMES, HERE

STDLIB_FILE = FASTSTART_NAMES["stdlib_file"]
STDLIB_REST_FILE = FASTSTART_NAMES["stdlib_rest_file"]
STDLIB_TOOLS = (HERE / "stdlib_closure.mjs", HERE / "stdlib_closure.py")


def stdlib_members(pyodide_dir: Path, packages: Path, pin: dict) -> list[str]:
    """The import closure of Pyodide's start plus the engine, as zip member names (cached)."""
    lock = packages / NAMES["lock_file"]
    # the lock's sha256 covers the noblegap wheel, and so its cases.json
    key = hashlib.sha256(
        b"".join(p.read_bytes() for p in STDLIB_TOOLS)
        + f"|{pin['version']}|{sha256_file(lock)}".encode()
    ).hexdigest()[:32]
    cached = CACHE / "stdlib" / f"{key}.json"
    if not cached.exists():
        if shutil.which("node") is None:
            raise BuildError("node is needed to find the standard library modules the site imports")
        log("finding the standard library modules the engine can import")
        proc = subprocess.run(["node", str(HERE / "stdlib_closure.mjs"), str(pyodide_dir), str(lock)],
                              capture_output=True, text=True)
        if proc.returncode != 0:
            raise BuildError(f"site_build/faststart/stdlib_closure.mjs failed:\n{proc.stderr[-4000:]}")
        report = json.loads(proc.stdout.strip().splitlines()[-1])
        cached.parent.mkdir(parents=True, exist_ok=True)
        cached.write_text(json.dumps(report, indent=1) + "\n")
    return json.loads(cached.read_text())["members"]


def write_stdlib(pyodide_dir: Path, site: Path, pin: dict) -> str:
    """site/pyodide/noblegap-stdlib.zip: the closure's members, byte for byte, in the original order.

    Deterministic (the original timestamps, deflate level 9). Every package
    a member lives in keeps its ``__init__.py``.
    """
    members = set(stdlib_members(pyodide_dir, site / PACKAGES_DIR, pin))
    source = pyodide_dir / "python_stdlib.zip"
    out = site / PYODIDE_DIR / STDLIB_FILE
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
    return STDLIB_FILE


def write_rest_stdlib(site: Path, imported: list[str]) -> str:
    """site/pyodide/noblegap-stdlib-rest.zip: the site's standard library
    without the members whose modules the snapshot has imported (``imported``,
    from ``engine_hooks.imported_stdlib_members``); returns its sha256.

    The restored engine never reads those again: their code is in the saved
    memory, and ``engine_hooks.after_restore`` makes the import system re-read
    the zip's directory. Byte for byte, in the original order, deterministic.
    """
    source = site / PYODIDE_DIR / STDLIB_FILE
    out = site / PYODIDE_DIR / STDLIB_REST_FILE
    with zipfile.ZipFile(source) as zin:
        unknown = set(imported) - set(zin.namelist())
        if unknown:
            raise BuildError(f"the snapshot imported {sorted(unknown)[:3]}, which {STDLIB_FILE} does not hold")
        with zipfile.ZipFile(out, "w") as zout:
            for info in zin.infolist():
                if info.filename in imported:
                    continue
                copy = zipfile.ZipInfo(info.filename, date_time=info.date_time)
                copy.external_attr = info.external_attr
                copy.compress_type = zipfile.ZIP_DEFLATED
                zout.writestr(copy, zin.read(info), compresslevel=9)
    log(f"standard library for the fast start: {len(zin.namelist()) - len(set(imported))} members "
        f"not imported by the snapshot, {out.stat().st_size / 1e6:.2f} of {source.stat().st_size / 1e6:.2f} MB")
    return sha256_file(out)
