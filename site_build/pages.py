"""Stage: the pages.

The core runs here on CPython (imported from core/, not any installed
copy); every calculator page is rendered from its schema with its example
already computed, so a page is useful before the engine is up.
"""

from __future__ import annotations

import importlib
import json
import sys
from pathlib import Path

from .common import BuildError
from .names import NAMES, NAMES_FILE
from .paths import CORE, PACKAGES_DIR, PYODIDE_DIR, STATIC, TEMPLATES, project_meta

CSP = (
    "default-src 'self'; script-src 'self' 'wasm-unsafe-eval'; worker-src 'self'; "
    "connect-src 'self'; img-src 'self' data: blob:; style-src 'self'; "
    "object-src 'none'; base-uri 'self'; form-action 'self'"
)
#: The engine worker's own policy (a worker takes the policy of its script's
#: response, never the page's): the same, and blob: scripts, because the fast
#: start imports the runtime's script from its unpacked gzip twin
#: (engine/faststart/start.mjs). The pages keep ``script-src 'self'``.
WORKER_SCRIPT = "static/engine/worker.js"
WORKER_CSP = CSP.replace("script-src 'self'", "script-src 'self' blob:")


def import_core(module: str = "api"):
    """``noblegap.<module>``, imported from core/ (never an installed copy) on CPython."""
    package = sys.modules.get("noblegap")
    if package is None or Path(package.__file__).parent != CORE / "noblegap":
        if str(CORE) not in sys.path:
            sys.path.insert(0, str(CORE))
        for mod in [m for m in sys.modules if m == "noblegap" or m.startswith("noblegap.")]:
            del sys.modules[mod]
    return importlib.import_module(f"noblegap.{module}")


def _template(env, name: str):
    if not (TEMPLATES / name).exists():
        raise BuildError(f"site_src/templates/{name} is missing")
    return env.get_template(name)


def render_pages(site: Path, site_globals: dict, api) -> list[str]:
    import jinja2

    env = jinja2.Environment(
        loader=jinja2.FileSystemLoader(str(TEMPLATES)),
        autoescape=jinja2.select_autoescape(["html", "xml"]),
        undefined=jinja2.StrictUndefined,
        keep_trailing_newline=True,
    )
    # site and csp are the documented globals; nav and version are the same
    # facts under the names the page templates use.
    env.globals.update(site=site_globals, csp=CSP, nav=site_globals["calculators"],
                       version=site_globals["version"])
    desc = api.describe()
    written = []
    for calc in desc["calculators"]:
        example = calc.get("example", {})
        result = api.run(calc["name"], example)
        if not result.get("ok"):
            raise BuildError(f"calculator {calc['name']!r}: its example fails on CPython: {result}")
        json.dumps(result, allow_nan=False)
        html = _template(env, "calc.html").render(
            calc=calc, example_inputs=example, example_result=result, page=calc_page(calc),
            page_name=calc["name"],
        )
        (site / calc_page(calc)).write_text(html)
        written.append(calc_page(calc))
    html = _template(env, "index.html").render(
        calculators=desc["calculators"], page="index.html", page_name="index")
    (site / "index.html").write_text(html)
    written.append("index.html")
    # The job-record pages: saved jobs and the joint schedule.
    for name in JOB_PAGES:
        html = _template(env, name).render(calculators=desc["calculators"], page=name,
                                           page_name=name.removesuffix(".html"))
        (site / name).write_text(html)
        written.append(name)
    for extra in desc.get("pages", []):
        html = _template(env, extra["template"]).render(
            **{"page": extra["out"], "page_name": extra["out"].removesuffix(".html"),
               **extra.get("context", {})})
        (site / extra["out"]).write_text(html)
        written.append(extra["out"])
    return written


JOB_PAGES = ("jobs.html", "schedule.html")


def calc_page(calc: dict) -> str:
    return calc.get("page") or f"{calc['name']}.html"


def site_globals_for(api, pin: dict) -> dict:
    desc = api.describe()
    meta = project_meta()
    static_css = sorted(p.name for p in STATIC.glob("*.css")) if STATIC.exists() else []
    return {
        "name": "noblegap",
        "version": meta["version"],
        "pyodide_version": pin["version"],
        "python_version": pin["python"],
        "calculators": [
            {"name": c["name"], "title": c.get("title", c["name"]),
             "summary": c.get("summary", ""), "page": calc_page(c)}
            for c in desc["calculators"]
        ],
        "pages": [
            {"out": p["out"], "title": p.get("context", {}).get("title", p["out"])}
            for p in desc.get("pages", [])
        ],
        "assets": {
            "app_js": "static/app.js",
            "worker_js": "static/engine/worker.js",
            "css": [f"static/{n}" for n in static_css],
            "manifest": "manifest.webmanifest",
            "sw": "sw.js",
            "icon_svg": "static/icon.svg",
            "icon_png": "static/icon-192.png",
            "lock": f"{PACKAGES_DIR}/{NAMES['lock_file']}",
            "names": NAMES_FILE,
            "pyodide": f"{PYODIDE_DIR}/",
        },
        "csp": CSP,
    }
