"""The fast start: the engine restored from the build's memory snapshot, and
the visible fallback to the normal start when the snapshot is unusable.

Each test uses a fresh browser profile (the ``context`` fixture), so the
service worker of an earlier test cannot answer for the routed URLs.
"""

from __future__ import annotations

import gzip
import hashlib
import json

import pytest

from conftest import wait_for, wait_live
from noblegap import api
from site_build.names import NAMES

SNAPSHOT_INFO = "**/packages/noblegap-snapshot.json"
SNAPSHOT_FILE = "**/packages/noblegap-snapshot.gzip"
FALLBACK = "snapshot unusable"


def _headline(result):
    return result["result"]["display"]["headline"]


def _couple_headline():
    return _headline(api.run("couple", api.get("couple").example))


def _live_couple(page, server):
    page.goto(f"{server}/couple.html")
    wait_live(page, 0)
    assert page.get_attribute("#result", "data-state") == "live"
    return page.inner_text("#result .headline")


def _statuses(page):
    """Every engine status text the page shows, from the first progress message on."""
    page.add_init_script("""
        (() => {
          window.__statusLog = [];
          const note = () => {
            const s = document.getElementById('engine-status');
            if (s) window.__statusLog.push(s.textContent);
          };
          const start = () => {
            const s = document.getElementById('engine-status');
            if (!s) return;
            new MutationObserver(note).observe(s, {childList: true, characterData: true, subtree: true});
          };
          document.addEventListener('DOMContentLoaded', start);
        })();
    """)


def test_snapshot_starts_and_answers_like_cpython(page, server):
    headline = _live_couple(page, server)
    assert page.get_attribute("body", "data-engine-mode") == "snapshot"
    assert headline == _couple_headline()
    assert FALLBACK not in page.inner_text("#engine-status")


def test_snapshot_engine_computes_edits_like_cpython(page, server):
    page.goto(f"{server}/couple.html")
    seq = wait_live(page, 0)
    assert page.get_attribute("body", "data-engine-mode") == "snapshot"
    inputs = {**api.get("couple").example, "metal_a": "Mg", "metal_b": "Au"}
    page.select_option("#f-metal_a", "Mg")
    seq = wait_live(page, seq)
    page.select_option("#f-metal_b", "Au")
    wait_live(page, seq)
    assert page.inner_text("#result .headline") == _headline(api.run("couple", inputs))


def _fallback_checks(page, server):
    _statuses(page)
    headline = _live_couple(page, server)
    assert page.get_attribute("body", "data-engine-mode") == "normal"
    assert headline == _couple_headline()
    status = page.inner_text("#engine-status")
    assert FALLBACK in status and "normal start" in status, status
    log = page.evaluate("() => window.__statusLog")
    assert any(FALLBACK in s for s in log), log


def test_garbage_snapshot_falls_back_visibly(page, context, server):
    context.route(SNAPSHOT_FILE, lambda route: route.fulfill(
        status=200, body=b"\x00garbage, not a snapshot" * 1000, content_type="application/gzip"))
    _fallback_checks(page, server)


def test_truncated_snapshot_falls_back_visibly(page, context, server, site_dir):
    data = (site_dir / "packages" / "noblegap-snapshot.gzip").read_bytes()
    context.route(SNAPSHOT_FILE, lambda route: route.fulfill(
        status=200, body=data[: len(data) // 2], content_type="application/gzip"))
    _fallback_checks(page, server)


def test_valid_gzip_of_other_bytes_falls_back_visibly(page, context, server, site_dir):
    info = json.loads((site_dir / "packages" / "noblegap-snapshot.json").read_text())
    body = gzip.compress(b"\0" * info["raw_size"])   # right size, wrong content
    context.route(SNAPSHOT_FILE, lambda route: route.fulfill(
        status=200, body=body, content_type="application/gzip"))
    _fallback_checks(page, server)


def test_mismatched_build_id_falls_back_visibly(page, context, server, site_dir):
    info = json.loads((site_dir / "packages" / "noblegap-snapshot.json").read_text())
    info["build_id"] = "0" * 64
    context.route(SNAPSHOT_INFO, lambda route: route.fulfill(
        status=200, body=json.dumps(info), content_type="application/json"))
    _fallback_checks(page, server)


def test_wrong_known_answer_falls_back_visibly(page, context, server, site_dir):
    info = json.loads((site_dir / "packages" / "noblegap-snapshot.json").read_text())
    info["known_case"]["expect"]["anode"] = "Cu"
    context.route(SNAPSHOT_INFO, lambda route: route.fulfill(
        status=200, body=json.dumps(info), content_type="application/json"))
    _fallback_checks(page, server)


def _serve_rewritten_container(context, site_dir, change):
    """Serve a container whose header ``change`` edits, with a sidecar that
    matches it (size and sha256), so only the header's content is wrong."""
    import hashlib

    info = json.loads((site_dir / "packages" / "noblegap-snapshot.json").read_text())
    data = gzip.decompress((site_dir / "packages" / info["file"]).read_bytes())
    length = int.from_bytes(data[8:12], "little")
    header = json.loads(data[12:12 + length])
    change(header)
    new_header = json.dumps(header, separators=(",", ":")).encode()
    assert len(new_header) <= length
    new_header = new_header.ljust(length)            # same length: offsets stay valid
    body = gzip.compress(data[:12] + new_header + data[12 + length:], mtime=0)
    info.update(size=len(body), sha256=hashlib.sha256(body).hexdigest())
    context.route(SNAPSHOT_INFO, lambda route: route.fulfill(
        status=200, body=json.dumps(info), content_type="application/json"))
    context.route(SNAPSHOT_FILE, lambda route: route.fulfill(
        status=200, body=body, content_type="application/gzip"))


def test_snapshot_made_against_other_data_segments_falls_back_visibly(page, context, server, site_dir):
    def change(header):
        header["base"]["sha256"] = "0" * 64
    _serve_rewritten_container(context, site_dir, change)
    _fallback_checks(page, server)
    assert "data segments differ" in page.inner_text("#engine-status")


def test_snapshot_listing_a_file_outside_site_packages_falls_back_visibly(page, context, server, site_dir):
    def change(header):
        name = header["files"][0][0]
        header["files"][0][0] = "../" + name[3:]       # same length
    _serve_rewritten_container(context, site_dir, change)
    _fallback_checks(page, server)
    assert "bad file" in page.inner_text("#engine-status")


def test_other_standard_library_is_replaced_visibly(page, context, server, site_dir):
    # The fast start's standard library (only what the snapshot has not
    # imported) is fetched after the first result and must be the one the
    # sidecar names: other bytes are refused, the site's whole standard
    # library is loaded in its place, and the status line says so. A call
    # that imports from it (a typo's suggestions need difflib) still works.
    other = (site_dir / "pyodide" / "noblegap-stdlib.zip").read_bytes()[:4096]
    context.route("**/pyodide/noblegap-stdlib-rest.zip", lambda route: route.fulfill(
        status=200, body=other, headers={"Content-Type": "application/zip"}))
    page.goto(f"{server}/pair.html?alloy_a=kryptonite&alloy_b=5083&environment=marine_splash")
    wait_for(page, "() => document.getElementById('engine-status').textContent"
                   ".includes('noblegap-stdlib-rest.zip is not the one')")
    assert page.get_attribute("body", "data-engine-mode") == "snapshot"
    assert "whole standard library was loaded instead" in page.inner_text("#engine-status")
    wait_for(page, "() => document.getElementById('result').dataset.state === 'error'")
    assert "Did you mean: Graphite?" in page.inner_text("form")


def test_a_first_call_that_needs_the_deferred_standard_library_is_answered(page, server):
    # The rest of the standard library arrives after the engine is ready; a
    # shared link whose first answer imports from it (a typo's suggestions
    # need difflib) is answered again once it is there, never with an error.
    page.goto(f"{server}/pair.html?alloy_a=kryptonite&alloy_b=5083&environment=marine_splash")
    wait_for(page, "() => document.getElementById('result').dataset.state === 'error'")
    assert page.get_attribute("body", "data-engine-mode") == "snapshot"
    assert "Did you mean: Graphite?" in page.inner_text("form")
    assert "failed unexpectedly" not in page.inner_text("body")


def test_missing_snapshot_falls_back_visibly(page, context, server):
    context.route(SNAPSHOT_INFO, lambda route: route.fulfill(status=404, body="not found"))
    _fallback_checks(page, server)


@pytest.mark.parametrize("field", ["pyodide", "format"])
def test_other_pyodide_or_format_falls_back(page, context, server, site_dir, field):
    info = json.loads((site_dir / "packages" / "noblegap-snapshot.json").read_text())
    info[field] = "0.0.1" if field == "pyodide" else 99
    context.route(SNAPSHOT_INFO, lambda route: route.fulfill(
        status=200, body=json.dumps(info), content_type="application/json"))
    _fallback_checks(page, server)


_COUNT_WORKERS = """
    (() => {
      window.__workers = [];
      const Native = window.Worker;
      window.Worker = class extends Native {
        constructor(...args) { super(...args); window.__workers.push(document.readyState); }
      };
    })();
"""


def test_one_engine_worker_started_from_head(page, server):
    # static/engine-start.js (a classic script at the top of <head>) starts
    # the worker while the page is still being parsed; boot.js, imported by
    # app.js, adopts it: one worker, and the progress messages it sent before
    # app.js took it over still reach the page.
    page.add_init_script(_COUNT_WORKERS)
    headline = _live_couple(page, server)
    assert headline == _couple_headline()
    assert page.evaluate("() => window.__workers") == ["loading"]
    assert page.get_attribute("body", "data-engine-phase") == "ready"


def test_without_the_head_script_the_page_starts_its_own_worker(page, context, server):
    # A host (or an old offline copy) that does not deliver engine-start.js:
    # boot.js starts the worker itself, once, and the page still answers.
    context.route("**/static/engine-start.js", lambda route: route.fulfill(status=404, body=""))
    page.add_init_script(_COUNT_WORKERS)
    headline = _live_couple(page, server)
    assert headline == _couple_headline()
    assert len(page.evaluate("() => window.__workers")) == 1


def test_snapshot_start_downloads_each_file_once_and_no_wheel(page, server):
    # Until the engine is ready (the service worker registers only after
    # that): the runtime, the standard library and the snapshot once each,
    # and no wheel (the snapshot carries the package files it needs; the
    # wheels are for the fallback start, precached later).
    seen = []
    page.on("request", lambda request: seen.append(request.url))
    page.goto(f"{server}/couple.html")
    wait_live(page, 0)
    assert page.get_attribute("body", "data-engine-mode") == "snapshot"
    names = [url.rsplit("/", 1)[-1].split("?")[0] for url in seen]
    for name in ["pyodide.asm.wasm.gzip", "pyodide.asm.mjs.gzip", "noblegap-stdlib-rest.zip", "noblegap-snapshot.gzip"]:
        assert names.count(name) == 1, (name, names)
    # the runtime's script comes pre-compressed too
    assert "pyodide.asm.mjs" not in names, names
    # only the standard library the snapshot has not imported
    assert "noblegap-stdlib.zip" not in names, names
    # the runtime comes pre-compressed, the plain binary is not fetched
    assert "pyodide.asm.wasm" not in names, names
    assert not [n for n in names if n.endswith(".whl")], names
    assert "python_stdlib.zip" not in names


def test_second_visit_uses_the_offline_copys_unpacked_files(page, context, server, site_dir):
    # Served by the service worker, the fast start compiles the runtime from
    # the plain binary the install unpacked into the cache, and reads the
    # snapshot container unpacked there (checked against raw_sha256): nothing
    # from the network, nothing gunzipped again, same answer.
    page.goto(f"{server}/couple.html")
    wait_live(page, 0)
    wait_for(page, "async () => { const r = await navigator.serviceWorker.ready;"
                   " return !!r.active && (await caches.keys()).length > 0; }", 60_000)
    cached = page.evaluate("""async () => {
        const cache = await caches.open((await caches.keys())[0]);
        return (await cache.keys()).map((r) => new URL(r.url).pathname.split('/').pop());
    }""")
    assert "pyodide.asm.wasm" in cached and "noblegap-snapshot.container" in cached, cached
    # each file unpacked at install was checked against the build's sha256
    # and carries it, so the next visit does not hash it again
    checked = page.evaluate("""async (header) => {
        const cache = await caches.open((await caches.keys())[0]);
        const out = {};
        for (const request of await cache.keys()) {
          const value = (await cache.match(request)).headers.get(header);
          if (value) out[new URL(request.url).pathname.split('/').pop()] = value;
        }
        return out;
    }""", NAMES["checked_header"])
    info = json.loads((site_dir / "packages" / "noblegap-snapshot.json").read_text())
    wasm_sha = hashlib.sha256((site_dir / "pyodide" / "pyodide.asm.wasm").read_bytes()).hexdigest()
    assert checked == {"noblegap-snapshot.container": info["raw_sha256"], "pyodide.asm.wasm": wasm_sha,
                       "pyodide.asm.mjs": checked.get("pyodide.asm.mjs")}, checked
    assert checked["pyodide.asm.mjs"] == hashlib.sha256(
        (site_dir / "pyodide" / "pyodide.asm.mjs").read_bytes()).hexdigest()
    context.set_offline(True)
    _statuses(page)
    page.add_init_script("""
        (() => {
          const Native = window.Worker;
          window.Worker = class extends Native {
            constructor(...args) {
              super(...args);
              window.__workerName = (args[1] || {}).name;
              this.addEventListener('message', (e) => {
                if (e.data && e.data.type === 'ready') window.__timings = e.data.timings;
              });
            }
          };
        })();
    """)
    page.goto(f"{server}/couple.html?metal_a=Mg&metal_b=Au")
    wait_live(page, 0)
    assert page.get_attribute("body", "data-engine-mode") == "snapshot"
    assert "offline copy" in page.evaluate("() => window.__workerName")
    assert "snapshot read unpacked" in page.evaluate("() => window.__timings"), page.evaluate("() => window.__timings")
    assert FALLBACK not in " ".join(page.evaluate("() => window.__statusLog")), page.inner_text("#engine-status")
    assert page.inner_text("#result .headline") == _headline(api.run("couple", {"metal_a": "Mg", "metal_b": "Au"}))
    context.set_offline(False)


def test_runtime_script_from_its_twin_and_plain_when_blob_scripts_are_refused(page, context, server):
    # The fast start imports the runtime's script from its unpacked gzip twin
    # (a blob: script the worker's own policy allows). A host whose policy
    # refuses blob: scripts in the worker still gets the fast start: the
    # plain script is imported instead.
    from site_build.pages import CSP, WORKER_CSP
    assert "blob:" in WORKER_CSP and "blob:" not in CSP.split("script-src", 1)[1].split(";", 1)[0]

    def strict(route):
        response = route.fetch()
        route.fulfill(response=response, headers={**response.headers, "content-security-policy": CSP})
    context.route("**/static/engine/worker.js", strict)
    seen = []
    page.on("request", lambda request: seen.append(request.url.rsplit("/", 1)[-1]))
    page.goto(f"{server}/couple.html?metal_a=Mg&metal_b=Au")
    wait_live(page, 0)
    assert page.get_attribute("body", "data-engine-mode") == "snapshot"
    assert "pyodide.asm.mjs.gzip" in seen and "pyodide.asm.mjs" in seen, seen
    assert page.inner_text("#result") and "failed" not in page.inner_text("#engine-status")
