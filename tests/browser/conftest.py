"""Browser fixtures: one local server of site/, Debian Chromium, no other origin.

Every request the page makes is checked: anything not to the local server is
aborted and recorded, and the test fails at teardown. Under CI=true a missing
Chromium or Playwright is an error, never a skip.
"""

from __future__ import annotations

import os
import sys
import time
from pathlib import Path
from urllib.parse import urlparse

import pytest

TESTS = Path(__file__).resolve().parents[1]
if str(TESTS) not in sys.path:
    sys.path.insert(0, str(TESTS))

CHROMIUM = "/usr/bin/chromium"
CHROMIUM_ARGS = [
    "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
    "--disable-background-networking", "--disable-component-update", "--disable-sync",
]
ENGINE_TIMEOUT_MS = 90_000


def _unavailable(reason):
    if os.environ.get("CI"):
        pytest.fail(f"browser tests must run under CI: {reason}")
    pytest.skip(reason)


@pytest.fixture(scope="session")
def site_dir():
    from _site import ensure_site
    return ensure_site()


@pytest.fixture(scope="session")
def server(site_dir):
    """The built site on loopback, with the same CSP header as build.py --serve."""
    from _site import serve_site
    with serve_site(site_dir) as base:
        yield base.rstrip("/")


@pytest.fixture(scope="session")
def browser():
    if not Path(CHROMIUM).exists():
        _unavailable(f"{CHROMIUM} not installed (apt-get install chromium)")
    try:
        from playwright.sync_api import sync_playwright
    except ImportError:
        _unavailable("playwright (python) is not installed")
    with sync_playwright() as p:
        b = p.chromium.launch(executable_path=CHROMIUM, args=CHROMIUM_ARGS)
        yield b
        b.close()


@pytest.fixture
def context(browser, server):
    """A fresh browser profile whose only reachable origin is the local server."""
    ctx = browser.new_context(viewport={"width": 800, "height": 1280})   # 10" portrait
    origin = urlparse(server).netloc
    foreign = []

    def guard(route):
        url = route.request.url
        parsed = urlparse(url)
        if parsed.scheme in ("data", "blob") or parsed.netloc == origin:
            route.continue_()
        else:
            foreign.append(url)
            route.abort()

    ctx.route("**/*", guard)
    ctx.foreign_requests = foreign
    yield ctx
    ctx.close()
    assert not foreign, f"requests to other origins: {foreign}"


@pytest.fixture
def page(context):
    pg = context.new_page()
    errors = []
    pg.on("pageerror", lambda exc: errors.append(str(exc)))
    pg.js_errors = errors
    yield pg
    assert not errors, f"JavaScript errors on the page: {errors}"


def wait_for(page, expression, timeout_ms=ENGINE_TIMEOUT_MS, arg=None):
    """Poll a JS expression until truthy.

    Playwright's wait_for_function compiles its predicate with eval, which the
    site's Content-Security-Policy rightly forbids; page.evaluate goes through
    the DevTools protocol and is not subject to it.
    """
    deadline = time.monotonic() + timeout_ms / 1000
    while True:
        value = page.evaluate(expression, arg)
        if value:
            return value
        if time.monotonic() > deadline:
            raise AssertionError(f"timed out after {timeout_ms} ms waiting for: {expression}")
        page.wait_for_timeout(50)


def wait_live(page, seq_after=0):
    """Wait until the engine is ready and a live result newer than seq_after shows
    (a whole one: not the headline phase of a typed edit, test_headline_first.py)."""
    wait_for(page,
             "(s) => { const r = document.getElementById('result');"
             " return !!document.body && document.body.dataset.engine === 'ready' && !!r &&"
             " (r.dataset.state === 'live' || r.dataset.state === 'error') &&"
             " r.dataset.phase !== 'headline' &&"
             " Number(r.dataset.resultSeq) > s; }", arg=seq_after)
    return int(page.get_attribute("#result", "data-result-seq"))
