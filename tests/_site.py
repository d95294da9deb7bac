"""The built site for tests: build once per session, serve on loopback.

    from tests._site import ensure_site, serve_site
    site = ensure_site()            # Path to site/, rebuilt only if an input changed
    with serve_site() as base_url:  # "http://127.0.0.1:PORT/"
        ...

The build runs in a subprocess (``python3 build.py``), so the test process
keeps its own imports of noblegap untouched.
"""

from __future__ import annotations

import contextlib
import importlib.util
import subprocess
import sys
import threading
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
SITE = ROOT / "site"

_checked = False


def build_module():
    """build.py, imported as a module (it imports nothing of noblegap at import)."""
    mod = sys.modules.get("noblegap_build")
    if mod is None:
        spec = importlib.util.spec_from_file_location("noblegap_build", ROOT / "build.py")
        mod = importlib.util.module_from_spec(spec)
        sys.modules["noblegap_build"] = mod
        spec.loader.exec_module(mod)
    return mod


def ensure_site() -> Path:
    """Return site/, building it first unless it matches the current inputs."""
    global _checked
    if _checked and SITE.exists():
        return SITE
    if not build_module().site_is_current(SITE):
        proc = subprocess.run([sys.executable, str(ROOT / "build.py")], cwd=ROOT,
                              capture_output=True, text=True)
        if proc.returncode != 0:
            raise RuntimeError(f"python3 build.py failed:\n{proc.stdout}\n{proc.stderr}")
    _checked = True
    return SITE


@contextlib.contextmanager
def serve_site(site: Path | None = None):
    """Serve the built site on 127.0.0.1 (a free port); yields the base URL.

    The server sends the same Content-Security-Policy header as
    ``python3 build.py --serve``.
    """
    site = site or ensure_site()
    server = build_module().make_server(site, port=0)
    thread = threading.Thread(target=server.serve_forever, daemon=True)
    thread.start()
    try:
        host, port = server.server_address[:2]
        yield f"http://{host}:{port}/"
    finally:
        server.shutdown()
        server.server_close()
        thread.join(timeout=5)
