"""The delivery: turns core/ + data/ + site_src/ into the static site in site/.

Run ``python3 build.py`` (or ``python3 -m site_build``); ``__main__.py`` is
the pipeline and names the stages in order, one module each:

    runtime    the pinned Pyodide from npm, integrity-checked
    wheels     PyPI wheels + our own wheel, byte-compiled inside Pyodide, lock file
    offline    static files and names.json (names.py: the names JS shares)
    faststart  (optional) trimmed standard library, memory snapshot, pre-compressed runtime
    pages      every page rendered on CPython, with its example computed
    offline    service worker precache list, build manifest
    serve      the local server (127.0.0.1, with the site's CSP)

The build reads core/, data/, site_src/, pins/ and this package; never tests/.
"""
