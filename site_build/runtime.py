"""Stage: the Pyodide runtime.

``npm pack`` of the one version pinned in ``pins/pyodide.json``; the
tarball's sha512 must equal the pinned npm integrity before anything is
extracted. Cached in ``.cache/pyodide/<version>``.
"""

from __future__ import annotations

import base64
import hashlib
import shutil
import subprocess
import tarfile
from pathlib import Path

from .common import BuildError, log
from .paths import CACHE, PYODIDE_DIR


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


def copy_runtime(pyodide_dir: Path, site: Path, pin: dict) -> None:
    """The runtime files the site ships, byte for byte, into site/pyodide/."""
    (site / PYODIDE_DIR).mkdir(parents=True, exist_ok=True)
    for name in pin["site_files"]:
        shutil.copyfile(pyodide_dir / name, site / PYODIDE_DIR / name)


def copy_full_stdlib(pyodide_dir: Path, site: Path) -> str:
    """The npm package's whole standard library (a site without the fast start); its file name."""
    name = "python_stdlib.zip"
    shutil.copyfile(pyodide_dir / name, site / PYODIDE_DIR / name)
    return name
