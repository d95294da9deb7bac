"""Stage: serving the built site on 127.0.0.1.

The same Content-Security-Policy header as the pages' meta element, the
right types for modules and WebAssembly, and no caching, so a rebuild shows
at the next reload. Used by ``build.py --serve``, the tests and the bench.
"""

from __future__ import annotations

import http.server
import os
import sys
from functools import partial
from pathlib import Path

from .pages import CSP, WORKER_CSP, WORKER_SCRIPT
from .paths import SITE

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


class SiteHandler(http.server.SimpleHTTPRequestHandler):
    """Static files with the site's CSP header and correct module/wasm types."""

    extensions_map = {**http.server.SimpleHTTPRequestHandler.extensions_map, **MIME_TYPES}

    def end_headers(self):
        worker = self.path.split("?", 1)[0].endswith("/" + WORKER_SCRIPT)
        self.send_header("Content-Security-Policy", WORKER_CSP if worker else CSP)
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


def serve_forever(site: Path, port: int) -> None:
    server = make_server(site, port)
    host, port = server.server_address[:2]
    print(f"Serving {site.name}/ at http://{host}:{port}/  (Ctrl-C to stop)", flush=True)
    try:
        server.serve_forever()
    except KeyboardInterrupt:
        pass
    finally:
        server.server_close()
