"""The runtime shipped pre-compressed for the fast start.

``pyodide/pyodide.asm.wasm.gzip`` beside ``pyodide.asm.wasm``: the fast
start fetches the gzip file and compiles the runtime straight from the
browser's stream decompression (``restore.mjs``), so a plain static host
without compression sends 3.5 MB instead of 9.6 MB, and a host that
compresses anyway sends the same bytes (``application/gzip`` is not
compressed again; if it were, the browser would undo it). The plain file
stays for the normal start; the service worker does not precache it but
unpacks the gzip file into its cache under the plain name (``sw.js``). The
service worker does the same for the snapshot, under a name that is no file
of the site, so a later visit reads the container without unpacking it.
"""

from __future__ import annotations

import gzip
import json
import shutil
from pathlib import Path

from ..common import log, sha256_file
from ..paths import CACHE, PACKAGES_DIR, PYODIDE_DIR
from . import FASTSTART_NAMES


def write_compressed(site: Path) -> dict[str, dict[str, str]]:
    """Write each gzip twin (cached by content); returns {plain path: {"packed": gzip path,
    "sha256": the plain bytes' sha256}} in the site, the snapshot's unpacked name (not a
    file of the site, only of the offline copy) included. The service worker checks what
    it unpacks against that sha256 before it keeps it (sw.js)."""
    twins = {}
    for plain, packed in FASTSTART_NAMES["compressed"].items():
        source = site / PYODIDE_DIR / plain
        cached = CACHE / "compressed" / f"{sha256_file(source)[:32]}.gzip"
        if not cached.exists():
            cached.parent.mkdir(parents=True, exist_ok=True)
            tmp = cached.with_suffix(".tmp")
            tmp.write_bytes(gzip.compress(source.read_bytes(), compresslevel=9, mtime=0))
            tmp.replace(cached)
        shutil.copyfile(cached, site / PYODIDE_DIR / packed)
        twins[f"{PYODIDE_DIR}/{plain}"] = {"packed": f"{PYODIDE_DIR}/{packed}", "sha256": sha256_file(source)}
        log(f"{plain}: {source.stat().st_size / 1e6:.1f} MB, pre-compressed {cached.stat().st_size / 1e6:.1f} MB")
    info = json.loads((site / PACKAGES_DIR / FASTSTART_NAMES["info_file"]).read_text())
    twins[f"{PACKAGES_DIR}/{FASTSTART_NAMES['unpacked_snapshot_file']}"] = {
        "packed": f"{PACKAGES_DIR}/{FASTSTART_NAMES['snapshot_file']}", "sha256": info["raw_sha256"]}
    return twins
