"""The built site for the delivery, parity and browser tests: build once per
session, serve on loopback. (tests/core/ never uses this: the core's tests
never build the site.)

    from _site import ensure_site, serve_site
    site = ensure_site()            # Path to site/, rebuilt only if an input changed
    with serve_site() as base_url:  # "http://127.0.0.1:PORT/"
        ...

The build runs in a subprocess (``python3 build.py``), so the test process
keeps its own imports of noblegap untouched.
"""

from __future__ import annotations

import contextlib
import subprocess
import sys
import threading
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
SITE = ROOT / "site"
if str(ROOT) not in sys.path:
    sys.path.insert(0, str(ROOT))

from site_build import offline, serve  # noqa: E402
from site_build.__main__ import build_options  # noqa: E402

_checked = False


def build_site(site: Path, *args: str) -> Path:
    """``python3 build.py --site SITE ARGS`` (a subprocess); returns ``site``."""
    proc = subprocess.run([sys.executable, str(ROOT / "build.py"), "--site", str(site), *args], cwd=ROOT,
                          capture_output=True, text=True)
    if proc.returncode != 0:
        raise RuntimeError(f"build.py {' '.join(args)} failed:\n{proc.stdout}\n{proc.stderr}")
    return site


def ensure_site() -> Path:
    """Return site/, building it first unless it matches the current inputs."""
    global _checked
    if _checked and SITE.exists():
        return SITE
    if not offline.site_is_current(SITE, build_options()):
        proc = subprocess.run([sys.executable, str(ROOT / "build.py")], cwd=ROOT,
                              capture_output=True, text=True)
        if proc.returncode != 0:
            raise RuntimeError(f"python3 build.py failed:\n{proc.stdout}\n{proc.stderr}")
    _checked = True
    return SITE


@contextlib.contextmanager
def serve_site(site: Path | None = None):
    """Serve a built site on 127.0.0.1 (a free port); yields the base URL.

    The server sends the same Content-Security-Policy header as
    ``python3 build.py --serve``.
    """
    site = site or ensure_site()
    server = serve.make_server(site, port=0)
    thread = threading.Thread(target=server.serve_forever, daemon=True)
    thread.start()
    try:
        host, port = server.server_address[:2]
        yield f"http://{host}:{port}/"
    finally:
        server.shutdown()
        server.server_close()
        thread.join(timeout=5)
