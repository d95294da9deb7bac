"""Without the fast start the site starts the normal way: a site built with
``--no-faststart``, and the default site with its ``static/engine/faststart/``
folder deleted after the build (the fallback then says why)."""

from __future__ import annotations

import shutil
from urllib.parse import urlparse

import pytest

from conftest import wait_live
from noblegap import api

FALLBACK = "snapshot unusable"


def _couple_headline():
    return api.run("couple", api.get("couple").example)["result"]["display"]["headline"]


@pytest.fixture(scope="module")
def plain_server(tmp_path_factory):
    from _site import build_site, serve_site

    site = build_site(tmp_path_factory.mktemp("plain") / "site", "--no-faststart", "--offline")
    with serve_site(site) as base:
        yield base.rstrip("/")


@pytest.fixture(scope="module")
def cut_server(tmp_path_factory, site_dir):
    from _site import serve_site

    site = tmp_path_factory.mktemp("cut") / "site"
    shutil.copytree(site_dir, site)
    shutil.rmtree(site / "static" / "engine" / "faststart")
    with serve_site(site) as base:
        yield base.rstrip("/")


@pytest.fixture
def open_page(browser):
    """page(base): a fresh profile whose only reachable origin is ``base``."""
    contexts, errors, foreign = [], [], []

    def make(base):
        ctx = browser.new_context(viewport={"width": 800, "height": 1280})
        origin = urlparse(base).netloc

        def guard(route):
            parsed = urlparse(route.request.url)
            if parsed.scheme in ("data", "blob") or parsed.netloc == origin:
                route.continue_()
            else:
                foreign.append(route.request.url)
                route.abort()

        ctx.route("**/*", guard)
        contexts.append(ctx)
        pg = ctx.new_page()
        pg.on("pageerror", lambda exc: errors.append(str(exc)))
        return pg

    yield make
    for ctx in contexts:
        ctx.close()
    assert not foreign, f"requests to other origins: {foreign}"
    assert not errors, f"JavaScript errors on the page: {errors}"


def _open_couple(page, base):
    requests = []
    page.on("request", lambda request: requests.append(request.url))
    page.goto(f"{base}/couple.html")
    wait_live(page, 0)
    assert page.get_attribute("#result", "data-state") == "live"
    assert page.get_attribute("body", "data-engine-mode") == "normal"
    assert page.inner_text("#result .headline") == _couple_headline()
    return requests


def test_no_faststart_site_starts_normally(open_page, plain_server):
    page = open_page(plain_server)
    requests = _open_couple(page, plain_server)
    assert FALLBACK not in page.inner_text("#engine-status")
    assert not [u for u in requests if "snapshot" in u or "faststart" in u], requests


def test_no_faststart_site_computes_edits(open_page, plain_server):
    page = open_page(plain_server)
    page.goto(f"{plain_server}/couple.html")
    seq = wait_live(page, 0)
    page.select_option("#f-metal_a", "Mg")
    wait_live(page, seq)
    inputs = {**api.get("couple").example, "metal_a": "Mg"}
    assert page.inner_text("#result .headline") == api.run("couple", inputs)["result"]["display"]["headline"]


def test_site_with_faststart_folder_deleted_starts_normally(open_page, cut_server):
    page = open_page(cut_server)
    _open_couple(page, cut_server)
    status = page.inner_text("#engine-status")
    assert FALLBACK in status and "normal start" in status, status
