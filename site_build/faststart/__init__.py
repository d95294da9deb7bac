"""Stage (optional): the fast start.

Everything that lets the browser skip starting Python lives in this folder
and in ``site_src/static/engine/faststart/``: the trimmed standard library
(``stdlib.py``), the memory snapshot (``snapshot.py``, ``make_snapshot.mjs``),
its container (``container.py``; the reader is ``restore.mjs``), the
pre-compressed runtime (``compressed.py``) and FORMAT.md, which lists every
private Pyodide option and wrapped browser global used, with the Pyodide
version they were reviewed against.

``python3 build.py --no-faststart`` builds a site without any of it; so
does deleting the two ``faststart/`` folders. That site starts the normal
way (``loadPyodide`` + ``loadPackage``).
"""

from __future__ import annotations

import hashlib
import shutil
from pathlib import Path

from ..common import log
from ..paths import PACKAGES_DIR, PYODIDE_DIR

HERE = Path(__file__).absolute().parent

# Written into static/engine/names.json under "faststart".
FASTSTART_NAMES = {
    "format": 3,
    "magic": "NGSNAP03",
    "page_size": 4096,
    "info_file": "noblegap-snapshot.json",
    # Not ".gz": some static hosts would send Content-Encoding: gzip for it,
    # and the browser would hand the worker bytes it cannot check.
    "snapshot_file": "noblegap-snapshot.gzip",
    # Not a file of the site: the service worker unpacks the snapshot once
    # into its offline copy under this name, so later visits skip the gunzip.
    "unpacked_snapshot_file": "noblegap-snapshot.container",
    "stdlib_file": "noblegap-stdlib.zip",
    # What the fast start loads instead: the members the snapshot has not
    # imported (its sha256 is in the sidecar, checked before Pyodide reads it).
    "stdlib_rest_file": "noblegap-stdlib-rest.zip",
    # Runtime files shipped with a gzip twin (compressed.py); the fast start
    # fetches the twin and unpacks it in the worker.
    # The runtime's script (1.25 MB of JavaScript, 0.26 MB packed) is
    # imported from its unpacked text (start.mjs).
    "compressed": {"pyodide.asm.wasm": "pyodide.asm.wasm.gzip",
                   "pyodide.asm.mjs": "pyodide.asm.mjs.gzip"},
    # The id a snapshot must carry: both sides fill in this template.
    "build_id": "noblegap-snapshot/{format}|pyodide {pyodide}|lock {lock_sha256}",
}
# The large files of a first visit (site paths): the engine worker requests
# them as soon as it runs (static/engine/worker.js), before it has loaded the
# engine's scripts, and the fast start takes the responses.
FASTSTART_NAMES["early"] = [
    f"{PACKAGES_DIR}/{FASTSTART_NAMES['snapshot_file']}",
    f"{PYODIDE_DIR}/{FASTSTART_NAMES['compressed']['pyodide.asm.wasm']}",
    f"{PYODIDE_DIR}/{FASTSTART_NAMES['compressed']['pyodide.asm.mjs']}",
]

# The private snapshot options were reviewed for these Pyodide versions and
# build ids only (FORMAT.md); an unreviewed Pyodide builds a site without
# the fast start.
REVIEWED = {"314.0.8": "1e170351f97e56f0814b6a94f77bf4f6ec7d8835c8b8b26c6b5282c473979fc3"}


def build_id(pyodide: str, lock_sha256: str) -> str:
    """sha256 hex of the build id template filled in (engine/faststart/start.mjs does the same)."""
    text = FASTSTART_NAMES["build_id"].format(format=FASTSTART_NAMES["format"], pyodide=pyodide,
                                              lock_sha256=lock_sha256)
    return hashlib.sha256(text.encode()).hexdigest()


def available(pin: dict) -> bool:
    """Can this build make a fast start? (A reviewed Pyodide, and Node.)"""
    if pin["version"] not in REVIEWED:
        log(f"WARNING: no fast start: Pyodide {pin['version']} is not in site_build/faststart REVIEWED; "
            "the site starts the normal way until its private options are reviewed (FORMAT.md)")
        return False
    if shutil.which("node") is None:
        log("WARNING: no fast start: node is needed to make the memory snapshot")
        return False
    return True


def build(site: Path, pyodide_dir: Path, pin: dict, hooks) -> dict[str, dict[str, str]]:
    """The stage: trimmed standard library, memory snapshot, pre-compressed
    runtime, into ``site`` (which has its lock file, static files and
    names.json already). Returns {plain file: {"packed": gzip twin, "sha256": plain sha256}}
    for the service worker."""
    from . import compressed, snapshot, stdlib

    stdlib.write_stdlib(pyodide_dir, site, pin)
    snapshot.make_snapshot(site, pin, hooks)
    return compressed.write_compressed(site)
