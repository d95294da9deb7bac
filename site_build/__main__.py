"""The pipeline: build the static, self-contained site into ``site/``.

    python3 build.py                  build site/ (with the fast start)
    python3 build.py --serve          build, then serve site/ on 127.0.0.1:8000
    python3 build.py --dev            quick build for editing the core: no fast
                                      start, source wheels (seconds)
    python3 build.py --no-faststart   no fast start: the site starts Python the normal way
    python3 build.py --offline        build from .cache/ only; never run npm or pip

Each stage caches in ``.cache/`` (or $NOBLEGAP_CACHE), so a rebuild needs no
network. The site is written to ``site.tmp/`` and renamed only when every
stage has passed.
"""

from __future__ import annotations

import argparse
import shutil
import subprocess
import sys
from pathlib import Path

from . import offline, pages, runtime, wheels
from .common import BuildError, log
from .names import site_names, write_names
from .paths import PACKAGES_DIR, SITE, load_pyodide_pin

try:
    from . import faststart
except ImportError:  # the folder was deleted: the site starts the normal way
    faststart = None


def build(site: Path = SITE, offline_only: bool = False, compile_pyc: bool = True,
          with_faststart: bool = True) -> dict:
    """Build the whole site into ``site``; returns the build manifest."""
    options = build_options(compile_pyc, with_faststart)
    inputs = offline.inputs_digest(options)
    pin = load_pyodide_pin()
    fast = with_faststart and faststart is not None and faststart.available(pin)

    pyodide_dir = runtime.fetch_pyodide(pin, offline_only)
    packages = wheels.fetch_wheels(offline_only) + [wheels.build_core_wheel()]
    if compile_pyc:
        packages = wheels.compile_wheels(pyodide_dir, packages, pin)
    hooks = pages.import_core("engine_hooks")

    tmp = site.with_name(site.name + ".tmp")
    if tmp.exists():
        shutil.rmtree(tmp)
    tmp.mkdir(parents=True)
    try:
        # runtime: the pinned Pyodide's files (and without the fast start its whole stdlib)
        runtime.copy_runtime(pyodide_dir, tmp, pin)
        stdlib_file = faststart.FASTSTART_NAMES["stdlib_file"] if fast else runtime.copy_full_stdlib(pyodide_dir, tmp)
        # wheels: the engine's packages and the lock file
        wheels.write_lock(pyodide_dir, packages, tmp / PACKAGES_DIR)
        # offline, static part: scripts, styles, icons, and names.json
        offline.copy_static(tmp, fast)
        write_names(tmp, site_names(stdlib_file, faststart.FASTSTART_NAMES if fast else None))
        # faststart (optional): trimmed stdlib, memory snapshot, pre-compressed runtime
        twins = faststart.build(tmp, pyodide_dir, pin, hooks) if fast else {}
        # pages: every page rendered on CPython with its example computed
        api = pages.import_core("api")
        pages.render_pages(tmp, pages.site_globals_for(api, pin), api)
        # offline: the service worker's precache list and the build manifest
        manifest = offline.write_manifest_and_sw(tmp, inputs, pin, twins)
    except BaseException:
        shutil.rmtree(tmp, ignore_errors=True)
        raise
    if site.exists():
        shutil.rmtree(site)
    tmp.rename(site)
    total = sum(f["size"] for f in manifest["files"].values())
    log(f"{site.name}/ ready{'' if fast else ' (no fast start)'}: {len(manifest['files'])} files, "
        f"{total / 1e6:.1f} MB, cache {manifest['cache']}")
    return manifest


def build_options(compile_pyc: bool = True, with_faststart: bool = True) -> dict:
    """The options that change what is built (part of the inputs stamp)."""
    return {"compile": compile_pyc, "faststart": with_faststart and faststart is not None}


def main(argv=None) -> int:
    parser = argparse.ArgumentParser(prog="build.py", description="Build the noblegap static site into site/.")
    parser.add_argument("--site", type=Path, default=SITE, help="the folder to build into (default site/)")
    parser.add_argument("--serve", action="store_true", help="serve the site on 127.0.0.1 after building")
    parser.add_argument("--port", type=int, default=8000, help="port for --serve (default 8000)")
    parser.add_argument("--offline", action="store_true", help="use .cache/ only; never run npm or pip")
    parser.add_argument("--no-compile", action="store_true",
                        help="ship source wheels instead of byte-compiling them inside Pyodide")
    parser.add_argument("--no-faststart", action="store_true",
                        help="no fast start (no trimmed standard library, no memory snapshot): "
                             "every visit starts Python the normal way")
    parser.add_argument("--dev", action="store_true",
                        help="quick build while editing the core: --no-faststart --no-compile")
    parser.add_argument("--update-pins", action="store_true",
                        help="rewrite pins/wheels.json from requirements-core.txt, then exit")
    args = parser.parse_args(argv)
    try:
        if args.update_pins:
            wheels.update_wheel_pins()
            return 0
        build(args.site.absolute(), offline_only=args.offline, compile_pyc=not (args.no_compile or args.dev),
              with_faststart=not (args.no_faststart or args.dev))
    except (BuildError, subprocess.CalledProcessError) as exc:
        print(f"build failed: {exc}", file=sys.stderr)
        return 1
    if args.serve:
        from .serve import serve_forever

        serve_forever(args.site, args.port)
    return 0


if __name__ == "__main__":
    sys.exit(main())
