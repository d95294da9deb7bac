"""The names Python and JavaScript share, written once.

The build emits them as ``static/engine/names.json`` (``write_names``);
the engine worker, the page script and the Node tools import that file, and
the build and the tests use :data:`NAMES` (or read the emitted file). The
fast start adds its own names under ``"faststart"``
(``site_build/faststart/__init__.py``), or ``null`` when the site has none.
"""

from __future__ import annotations

import json
from pathlib import Path

from .paths import PACKAGES_DIR, PYODIDE_DIR

NAMES_FILE = "static/engine/names.json"

NAMES = {
    # noblegap.api is called through this package; its warm-up and checks
    # through noblegap.engine_hooks.
    "engine_package": "noblegap",
    "hooks_module": "noblegap.engine_hooks",
    # site/<packages_dir>/<lock_file>, site/<pyodide_dir>/pyodide.mjs
    "packages_dir": PACKAGES_DIR,
    "pyodide_dir": PYODIDE_DIR,
    "lock_file": "noblegap-lock.json",
    # The worker protocol (static/engine/worker.js describes it).
    # notice: after ready, something the engine status line must say (the
    # fast start's deferred standard library had to be replaced).
    "messages": {"progress": "progress", "ready": "ready", "fatal": "fatal", "notice": "notice"},
    "calls": {"run": "run", "describe": "describe"},
    "modes": {"normal": "normal", "faststart": "snapshot"},
    # A file the service worker unpacked from its gzip twin and checked
    # against the build's sha256 carries that sha256 in this header (sw.js),
    # so a later visit need not hash it again (engine/faststart/start.mjs).
    "checked_header": "X-Noblegap-Checked-Sha256",
}


def site_names(stdlib_file: str, faststart: dict | None) -> dict:
    """NAMES for one built site: its standard library file and fast start (or None)."""
    return {**NAMES, "stdlib_file": stdlib_file, "faststart": faststart}


def write_names(site: Path, names: dict) -> None:
    out = site / NAMES_FILE
    out.parent.mkdir(parents=True, exist_ok=True)
    out.write_text(json.dumps(names, indent=1, sort_keys=True) + "\n")


def read_names(site: Path) -> dict:
    return json.loads((site / NAMES_FILE).read_text())
