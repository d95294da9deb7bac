"""Job records in the browser: saved jobs, the printed check sheet, compare, the joint schedule."""

from __future__ import annotations

import csv
import io
import json
import re
import shutil
import subprocess
from datetime import date
from pathlib import Path
from urllib.parse import parse_qs, urlparse

import pytest
import segno

from conftest import wait_for, wait_live

ROOT = Path(__file__).resolve().parents[2]
TEMPLATE = ROOT / "data" / "examples" / "boatyard_joints.csv"
NO_PRINT = "() => { window.print = () => { document.body.dataset.printed = String(Number(document.body.dataset.printed || 0) + 1); }; }"


def _tool(name):
    path = shutil.which(name)
    if path is None:
        import os
        if os.environ.get("CI"):
            pytest.fail(f"{name} (poppler-utils) is required under CI")
        pytest.skip(f"{name} not installed (apt-get install poppler-utils)")
    return path


def _select_starting(page, selector, text):
    """Choose the option whose label starts with ``text`` (saved jobs show their count after it)."""
    wait_for(page, "([s, t]) => [...document.querySelectorAll(s + ' option')].some(o => o.textContent.startsWith(t))",
             20_000, [selector, text])
    value = page.evaluate("([s, t]) => [...document.querySelectorAll(s + ' option')]"
                          ".find(o => o.textContent.startsWith(t)).value", [selector, text])
    page.select_option(selector, value)


def _save_check(page, job=None, new_name=None, reference="", label=""):
    page.click("#save-open")
    if job is not None:
        _select_starting(page, "#save-job", job)
    else:
        page.select_option("#save-job", "")
        page.fill("#save-name", new_name)
        page.fill("#save-ref", reference)
    page.fill("#save-label", label)
    before = page.get_attribute("body", "data-saved")
    page.click("#save-submit")
    wait_for(page, "(b) => document.body.dataset.saved && document.body.dataset.saved !== b", 20_000, before)
    page.click("#save-open")  # close the panel


def _jobs(page, server):
    page.goto(f"{server}/jobs.html")
    page.wait_for_selector("body[data-jobs-ready='1']")
    return [page.locator(".job-item .job-name").nth(i).inner_text()
            for i in range(page.locator(".job-item").count())]


def _open_job(page, name):
    page.locator(".job-item .job-name", has_text=name).first.click()
    page.wait_for_selector("#job-detail:not([hidden])")


def _import(page, name, text):
    page.evaluate("() => { delete document.body.dataset.importResult; }")
    page.set_input_files("#import-file", files=[{"name": name, "mimeType": "application/json",
                                                 "buffer": text.encode("utf-8")}])
    wait_for(page, "() => document.body.dataset.importResult", 20_000)
    return page.get_attribute("body", "data-import-result"), page.inner_text("#import-status")


def _sw_ready(page):
    wait_for(page, "async () => { const r = await navigator.serviceWorker.ready;"
                   " return !!r.active && (await caches.keys()).length > 0; }", 90_000)


# ---------------------------------------------------------------- saved jobs

def test_save_reload_reopen_rename_duplicate_delete_undo(page, server):
    page.goto(f"{server}/fastener.html?count=7")
    wait_live(page)
    _save_check(page, new_name="Heron refit", reference="SCB-2291", label="deck cleat")
    assert "Saved in “Heron refit” (1 check)" in page.inner_text("#job-bar-status")
    assert "persistent storage" in page.inner_text("#job-bar-status")
    page.reload()
    wait_live(page)
    assert _jobs(page, server) == ["Heron refit"]
    _open_job(page, "Heron refit")
    row = page.locator("#check-rows tr").first
    assert "deck cleat" in row.inner_text()
    verdict = row.locator(".verdict-cell").inner_text()
    # Reopen: the page fills in the saved inputs and computes them.
    row.locator("a", has_text="Reopen").click()
    wait_live(page)
    assert page.input_value("#f-count") == "7"
    assert page.inner_text("#result .verdict-label").lower() == verdict.lower()
    # Rename, duplicate, delete with undo.
    _jobs(page, server)
    page.once("dialog", lambda d: d.accept("Heron refit 2027"))
    page.locator(".job-item button", has_text="Rename").click()
    page.wait_for_selector(".job-item .job-name:text-is('Heron refit 2027')")
    page.locator(".job-item button", has_text="Duplicate").click()
    page.wait_for_selector(".job-item .job-name:text-is('Heron refit 2027 (copy)')")
    page.locator(".job-item", has_text="(copy)").locator("button", has_text="Delete").click()
    page.wait_for_selector("#undo-bar:not([hidden])")
    assert page.locator(".job-item").count() == 1
    page.click("#undo-btn")
    page.wait_for_selector(".job-item .job-name:text-is('Heron refit 2027 (copy)')")
    _open_job(page, "(copy)")
    assert page.locator("#check-rows tr").count() == 1


def test_two_tabs_saving_into_one_job_at_once_keep_both(context, server):
    a, b = context.new_page(), context.new_page()
    a.goto(f"{server}/fastener.html?count=3")
    wait_live(a)
    _save_check(a, new_name="Slipway", label="first")
    b.goto(f"{server}/fastener.html?count=5")
    wait_live(b)
    for pg, label in ((a, "from tab A"), (b, "from tab B")):
        pg.click("#save-open")
        _select_starting(pg, "#save-job", "Slipway")
        pg.fill("#save-label", label)
    # Both saves start before either has finished.
    a.evaluate("() => document.getElementById('save-submit').click()")
    b.evaluate("() => document.getElementById('save-submit').click()")
    wait_for(a, "() => document.body.dataset.saved === '2' || document.body.dataset.saved === '3'")
    wait_for(b, "() => !!document.body.dataset.saved")
    _jobs(a, server)
    _open_job(a, "Slipway")
    text = a.inner_text("#check-rows")
    assert a.locator("#check-rows tr").count() == 3
    assert "from tab A" in text and "from tab B" in text and "first" in text


def _export(page, name):
    _open_job(page, name)
    with page.expect_download() as dl:
        page.click("#job-export")
    return Path(dl.value.path()).read_text(encoding="utf-8"), dl.value.suggested_filename


def test_export_import_and_every_bad_file_changes_nothing(page, server):
    page.goto(f"{server}/holiday.html")
    wait_live(page)
    _save_check(page, new_name="Hull survey", reference="HS-7", label="frame 12")
    _jobs(page, server)
    text, fname = _export(page, "Hull survey")
    assert fname.endswith(".noblegap-job.json")
    data = json.loads(text)
    assert data["format"] == "noblegap-job" and data["version"] == 1
    assert data["job"]["reference"] == "HS-7"
    check = data["checks"][0]
    assert check["calc"] == "holiday" and check["inputs"]["coated_side"] == "anode"

    before = page.inner_text("#job-list")
    bad_files = {
        "not-json.json": ("hello there", "not valid JSON"),
        "truncated.json": (text[: len(text) // 2], "truncated"),
        "foreign.json": (json.dumps({"format": "some-other-app", "items": []}), "not a noblegap job file"),
        "no-format.json": (json.dumps({"job": {"name": "x"}}), "has no format field"),
        "newer.json": (json.dumps({**data, "version": 99}), "newer noblegap"),
        "bad-check.json": (json.dumps({**data, "checks": [{"calc": "teleport", "inputs": {}}]}),
                           "unknown calculator \"teleport\""),
        "bad-input.json": (json.dumps({**data, "checks": [{"calc": "holiday", "inputs": {"x": [1]}}]}),
                           "input x is not text"),
    }
    for name, (content, expect) in bad_files.items():
        result, message = _import(page, name, content)
        assert result == "rejected", name
        assert expect in message, (name, message)
        assert "Nothing was changed" in message
        assert page.inner_text("#job-list") == before
    page.reload()
    assert _jobs(page, server) == ["Hull survey"]

    # A name clash asks: keep both, then replace.
    page.set_input_files("#import-file", files=[{"name": fname, "mimeType": "application/json",
                                                 "buffer": text.encode()}])
    page.wait_for_selector("#clash-dialog[open]")
    assert "Hull survey" in page.inner_text("#clash-text")
    page.click("#clash-keep")
    wait_for(page, "() => document.body.dataset.importResult === 'imported'")
    page.wait_for_selector(".job-item:nth-child(2)")
    assert sorted(_jobs(page, server)) == ["Hull survey", "Hull survey (imported 2)"]
    changed = json.loads(text)
    changed["job"]["notes"] = "replaced from file"
    page.evaluate("() => { delete document.body.dataset.importResult; }")
    page.set_input_files("#import-file", files=[{"name": fname, "mimeType": "application/json",
                                                 "buffer": json.dumps(changed).encode()}])
    page.wait_for_selector("#clash-dialog[open]")
    page.click("#clash-replace")
    wait_for(page, "() => document.body.dataset.importResult === 'imported'")
    names = _jobs(page, server)
    assert sorted(names) == ["Hull survey", "Hull survey (imported 2)"]
    _open_job(page, "Hull survey")
    assert page.input_value("#job-notes") == "replaced from file"


def test_an_injected_script_in_an_imported_name_renders_as_text(page, server):
    evil = '<img src=x onerror="document.body.dataset.pwned=1"><script>document.body.dataset.pwned=2</script>'
    data = {"format": "noblegap-job", "version": 1,
            "job": {"name": evil, "reference": "<b>ref</b>", "notes": "<i>n</i>"},
            "checks": [{"calc": "couple", "inputs": {"metal_a": "Zn", "metal_b": "Cu"},
                        "summary": {"headline": "<svg onload=alert(1)>", "verdict": "<u>x</u>"}}]}
    _jobs(page, server)
    page.on("dialog", lambda d: pytest.fail(f"a script ran: {d.message}"))
    result, _ = _import(page, "evil.json", json.dumps(data))
    assert result == "imported"
    page.wait_for_selector("#job-detail:not([hidden])")
    assert page.locator(".job-item .job-name").first.inner_text() == evil
    assert page.inner_text("#job-title") == evil
    assert page.locator("#job-list img, #job-list script, #job-detail img, #job-detail svg").count() == 0
    assert page.get_attribute("body", "data-pwned") is None
    assert "<svg onload=alert(1)>" in page.inner_text("#check-rows")


def test_saved_jobs_survive_a_new_build_of_the_site(browser, site_dir, tmp_path):
    """A new build installs a new service-worker cache and drops the old one; the jobs stay."""
    from site_build import serve
    copy = tmp_path / "site"
    shutil.copytree(site_dir, copy)
    server = serve.make_server(copy, port=0)
    import threading
    threading.Thread(target=server.serve_forever, daemon=True).start()
    base = f"http://127.0.0.1:{server.server_address[1]}"
    context = browser.new_context(viewport={"width": 800, "height": 1280})
    foreign = []

    def guard(route):
        if urlparse(route.request.url).netloc == urlparse(base).netloc:
            route.continue_()
        else:
            foreign.append(route.request.url)
            route.abort()

    context.route("**/*", guard)
    try:
        page = context.new_page()
        page.goto(f"{base}/fastener.html")
        wait_live(page)
        _sw_ready(page)
        _save_check(page, new_name="Before the update", label="kept")
        old_cache = page.evaluate("async () => (await caches.keys()).join(',')")
        # "Rebuild": a changed page and a service worker naming a new cache.
        sw = (copy / "sw.js").read_text()
        (copy / "sw.js").write_text(sw.replace(old_cache, old_cache + "-next"))
        index = copy / "index.html"
        index.write_text(index.read_text().replace("</body>", "<!-- new build --></body>"))
        page.evaluate("async () => { const r = await navigator.serviceWorker.getRegistration(); await r.update(); }")
        wait_for(page, "async (old) => { const k = await caches.keys();"
                       " return k.length === 1 && k[0] === old + '-next'; }", 90_000, old_cache)
        assert _jobs(page, base) == ["Before the update"]
        _open_job(page, "Before the update")
        assert "kept" in page.inner_text("#check-rows")
        assert not foreign, foreign
    finally:
        context.close()
        server.shutdown()
        server.server_close()


def test_saved_jobs_and_the_schedule_work_offline(page, context, server):
    page.goto(f"{server}/fastener.html")
    wait_live(page)
    _sw_ready(page)
    _save_check(page, new_name="Offline job", label="saved online")
    context.set_offline(True)
    try:
        assert _jobs(page, server) == ["Offline job"]
        page.goto(f"{server}/schedule.html")
        page.wait_for_selector("body[data-engine='ready']", timeout=90_000)
        page.click("#sched-example")
        wait_for(page, "() => document.getElementById('sched-text').value.includes('HER-01')")
        page.click("#sched-run")
        page.wait_for_selector("body[data-schedule='done']", timeout=60_000)
        assert page.locator("#sched-rows tr[data-status='computed']").count() == 6
        _select_starting(page, "#sched-job", "Offline job")
        page.click("#sched-save")
        page.wait_for_selector("body[data-saved-rows='6']")
        _jobs(page, server)
        _open_job(page, "Offline job")
        assert page.locator("#check-rows tr").count() == 7
    finally:
        context.set_offline(False)


# ---------------------------------------------------------------- the check sheet

def _pdf_text(page, path, fmt):
    page.emulate_media(media="print")
    page.pdf(path=str(path), format=fmt)
    page.emulate_media(media="screen")
    pages = int(re.search(r"Pages:\s+(\d+)", subprocess.run(
        [_tool("pdfinfo"), str(path)], capture_output=True, text=True, check=True).stdout).group(1))
    text = subprocess.run([_tool("pdftotext"), "-raw", str(path), "-"], capture_output=True,
                          text=True, check=True).stdout
    return pages, text


def _squash(s):
    return re.sub(r"\s+", "", s)


def _svg_matrix(svg, border=4):
    size = int(re.search(r'viewBox="0 0 (\d+) \d+"', svg).group(1))
    path = re.search(r'<path[^>]*stroke="#000"[^>]*d="([^"]+)"', svg).group(1)
    grid = [[0] * size for _ in range(size)]
    x = y = 0.0
    for op, a, b in re.findall(r"([Mmh])(-?[\d.]+)(?:[ ,](-?[\d.]+))?", path):
        if op == "M":
            x, y = float(a), float(b)
        elif op == "m":
            x, y = x + float(a), y + float(b)
        else:
            for i in range(int(float(a))):
                grid[int(y)][int(x) + i] = 1
            x += float(a)
    return [row[border:size - border] for row in grid[border:size - border]]


@pytest.mark.parametrize("calc", ["fastener", "holiday", "joint"])
def test_check_sheet_prints_on_one_page_with_sources_cautions_link_and_qr(page, server, tmp_path, calc):
    page.goto(f"{server}/{calc}.html")
    wait_live(page)
    _save_check(page, new_name=f"Sheet test {calc}", reference="REF-42", label="one")
    sources = [t for t in page.locator("#result .src-text").all_text_contents() if t.strip()]
    assert sources
    page.evaluate(NO_PRINT)
    page.click("#print-sheet")
    page.wait_for_selector("body[data-printed='1']", timeout=60_000)
    assert page.get_attribute("body", "data-sheet") == "ready"
    link = page.inner_text("#sheet-host .sheet-url")
    assert parse_qs(urlparse(link).query)  # the inputs are in the link
    for fmt in ("A4", "Letter"):
        pages, text = _pdf_text(page, tmp_path / f"{calc}-{fmt}.pdf", fmt)
        assert pages == 1, f"{calc} sheet on {fmt}: {pages} pages"
        flat = _squash(text)
        assert f"Sheettest{calc}" in flat and "REF-42" in flat
        assert date.today().isoformat() in text
        for src in set(sources):
            assert _squash(src) in flat, src
        assert _squash("verify every result with the applicable standards") in flat
        assert _squash("need review by a licensed engineer") in flat
        assert _squash(link) in flat
        assert "Inputs as entered" in text and "Form" not in text.split("Inputs as entered")[0]
    # The QR code on the sheet is segno's code for exactly that link.
    src = page.get_attribute("#sheet-host img.sheet-qr", "src")
    from urllib.parse import unquote
    svg = unquote(src.split(",", 1)[1])
    expected = [[1 if c else 0 for c in row] for row in segno.make(link, error="m", micro=False).matrix]
    assert _svg_matrix(svg) == expected
    # Reopening the link gives the same check.
    page.goto(link)
    wait_live(page)
    assert page.get_attribute("#result", "data-state") == "live"


def test_whole_job_prints_a_cover_and_a_sheet_per_check(page, server, tmp_path):
    page.goto(f"{server}/fastener.html")
    wait_live(page)
    _save_check(page, new_name="Print job", reference="PJ-1", label="cleat")
    page.goto(f"{server}/holiday.html")
    wait_live(page)
    _save_check(page, job="Print job", label="hull")
    _jobs(page, server)
    _open_job(page, "Print job")
    page.evaluate(NO_PRINT)
    page.click("#job-print")
    page.wait_for_selector("body[data-printed='1']", timeout=90_000)
    assert page.locator("#sheet-host .sheet").count() == 3
    assert page.locator("#sheet-host img.sheet-qr").count() == 2
    pages, text = _pdf_text(page, tmp_path / "job.pdf", "A4")
    assert pages == 3
    cover = text.split("\f")[0]
    assert "Print job" in cover and "PJ-1" in cover
    assert _squash("Fastener against plate — cleat") in _squash(cover) and "hull" in cover
    verdicts = page.locator("#sheet-host .cover-verdict").all_text_contents()
    sheet_verdicts = page.locator("#sheet-host .sheet-verdict strong").all_text_contents()
    assert verdicts == sheet_verdicts and all(v and v != "not computed" for v in verdicts)
    for v in verdicts:
        assert _squash(v) in _squash(cover)
    assert text.count("Check sheet ·") == 2


# ---------------------------------------------------------------- compare

def test_compare_variants_in_the_link_and_the_saved_job(page, server):
    page.goto(f"{server}/fastener.html?compare=isolate,alloy:A96061")
    wait_live(page)
    page.wait_for_selector("#compare-block[data-state='ready']")
    heads = page.locator("#compare-block thead th").all_text_contents()
    assert heads[1:] == ["Current design", "Fastener: Aluminium alloy 6061", "Electrically isolated"]
    body = page.inner_text("#compare-block tbody")
    assert "Local rate, mm/yr" in body and "Years to the allowance" in body
    page.check("input[data-variant='coat_cathode']")
    page.wait_for_selector("#compare-block[data-variants*='coat_cathode'][data-state='ready']")
    assert page.locator("input[data-variant='anode']").is_disabled()  # four columns at most
    seq = int(page.get_attribute("#result", "data-result-seq"))
    page.fill("#f-count", "20")
    wait_live(page, seq)
    q = parse_qs(urlparse(page.url).query)
    assert q["count"] == ["20"]
    assert q["compare"] == ["alloy:A96061,isolate,coat_cathode"]
    _save_check(page, new_name="Compare job", label="variants")
    _jobs(page, server)
    _open_job(page, "Compare job")
    href = page.get_attribute("#check-rows a", "href")
    assert parse_qs(urlparse(href).query)["compare"] == ["alloy:A96061,isolate,coat_cathode"]
    page.click("#check-rows a")
    page.wait_for_selector("#compare-block[data-state='ready']")
    assert page.locator("#compare-block thead th").count() == 5


# ---------------------------------------------------------------- the joint schedule

def test_schedule_template_sort_download_and_errors_in_their_rows(page, server):
    page.goto(f"{server}/schedule.html")
    page.wait_for_selector("body[data-engine='ready']", timeout=90_000)
    with page.expect_download() as dl:
        page.click("#template-link")
    assert Path(dl.value.path()).read_bytes() == TEMPLATE.read_bytes()
    bad = TEMPLATE.read_text(encoding="utf-8").rstrip("\n") + (
        "\nHER-07 bad,fastener,316 stainless,kryptonite,marine_splash,bolt,10 mm,4,1 m²,6 mm,25 year,,,,,,,,,"
        "\nHER-08 unknown,teleport,,,,,,,,,,,,,,,,,,\n")
    page.fill("#sched-text", bad)
    page.click("#sched-run")
    page.wait_for_selector("body[data-schedule='done']", timeout=60_000)
    assert page.locator("#sched-rows tr").count() == 8
    assert "6 computed" in page.inner_text("#sched-summary") and "2 with errors" in page.inner_text("#sched-summary")
    err = page.locator("#sched-rows tr[data-status='error']", has_text="HER-07").inner_text()
    assert "plate" in err and "kryptonite" in err
    assert "teleport" in page.locator("#sched-rows tr", has_text="HER-08").inner_text()
    # Sort by verdict: errors first, then Avoid.
    page.click("#sched-table th button[data-sort='verdict']")
    firsts = [page.locator("#sched-rows tr").nth(i).get_attribute("data-status") for i in range(3)]
    assert firsts[:2] == ["error", "error"]
    assert page.locator("#sched-rows tr").nth(2).locator(".verdict-cell").inner_text() == "Avoid"
    page.click("#sched-table th button[data-sort='verdict']")
    assert page.locator("#sched-rows tr").first.locator(".verdict-cell").inner_text() == "Acceptable"
    with page.expect_download() as dl:
        page.click("#sched-download")
    rows = list(csv.DictReader(io.StringIO(Path(dl.value.path()).read_text(encoding="utf-8"))))
    assert [r["id"] for r in rows][:2] == ["HER-01 deck cleat", "HER-02 rub rail"]
    assert [r["result_status"] for r in rows].count("error") == 2
    assert "kryptonite" in rows[6]["result_errors"]


def test_schedule_unreadable_table_keeps_the_text(page, server):
    page.goto(f"{server}/schedule.html")
    page.fill("#sched-text", "fastener;plate\n316;5083\n")
    page.click("#sched-run")
    page.wait_for_selector("body[data-schedule='rejected']", timeout=90_000)
    assert "no calculator column" in page.inner_text("#sched-error")
    assert page.input_value("#sched-text") == "fastener;plate\n316;5083\n"


def test_schedule_cancel_stops_a_long_run(page, server):
    page.goto(f"{server}/schedule.html")
    page.wait_for_selector("body[data-engine='ready']", timeout=90_000)
    rows = "".join(f"J{i},fastener,316 stainless,5083,marine_splash,bolt,10 mm,{i % 50 + 1},1 m²,6 mm,25 year\n"
                   for i in range(2000))
    header = "id,calculator,fastener,plate,environment,fastener_kind,diameter,count,plate_area,thickness,design_life\n"
    page.evaluate("(t) => { document.getElementById('sched-text').value = t; }", header + rows)
    page.click("#sched-run")
    wait_for(page, "() => document.querySelectorAll('#sched-rows tr').length > 20", 60_000)
    assert int(page.get_attribute("#sched-bar", "aria-valuenow")) < 100
    page.click("#sched-cancel")
    page.wait_for_selector("body[data-schedule='cancelled']", timeout=30_000)
    done = page.locator("#sched-rows tr").count()
    assert 20 < done < 2000
    assert "Cancelled after" in page.inner_text("#sched-summary")


def test_the_browsers_own_print_gives_the_sheet_even_for_an_input_error(page, server, tmp_path):
    page.goto(f"{server}/holiday.html")
    seq = wait_live(page)
    page.fill("#f-thickness", "3 kg")
    wait_live(page, seq)
    assert page.get_attribute("#result", "data-state") == "error"
    pages, text = _pdf_text(page, tmp_path / "direct.pdf", "Letter")  # fires beforeprint
    assert pages == 1
    assert "Not computed: That is a mass, not a length." in text
    assert "thickness=3+kg" in _squash(text)
    assert "Printcheck" in _squash(text)  # says how to get the QR code drawn (wrapped in its box)
    assert "Inputs as entered" in text and "Anode wall thickness 3 kg" in text
