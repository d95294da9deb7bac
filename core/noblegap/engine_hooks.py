"""What the browser's engine worker runs in Python besides ``api.run`` and
``api.describe``: the warm-up before a memory snapshot is saved, the
clean-up right after one is restored, the known case every restore must
answer like CPython, and the freeze once the engine is up.

The worker (``site_src/static/engine/``) imports this module by name and
calls these functions; no Python is kept in JavaScript strings. Only
``noblegap.api`` is imported here, so the calculators can move freely.

Values cross to JavaScript as plain ``str``, ``int``, ``None`` or JSON text.
"""

from __future__ import annotations

import gc
import importlib
import json
import linecache
import math
import os
import random
import sys

from . import api

#: The case checked after every restore (in the build and in each browser):
#: calculator, inputs, and the result keys compared ("headline" is the
#: display's headline).
KNOWN_CASE = {"calc": "couple", "inputs": {"metal_a": "Zn", "metal_b": "Cu"},
              "keys": ["anode", "delta_E_V", "headline"]}

#: Relative tolerance of a float in the known case.
KNOWN_CASE_REL = 1e-12


def warm_up() -> int:
    """Import what the pages use, run every calculator's example once, then
    drop what only the warm-up needed; returns the number of calculators.

    Run by the build right before the memory is saved: nothing it leaves may
    be referenced from JavaScript.

    >>> warm_up() >= 6
    True
    """
    count = 0
    for calc in api.describe()["calculators"]:
        api.describe(calc["name"])
        json.dumps(api.run(calc["name"], calc.get("example", {})), allow_nan=False)
        count += 1
    linecache.clearcache()
    importlib.invalidate_caches()
    sys.last_exc = sys.last_type = sys.last_value = sys.last_traceback = None
    gc.collect()
    return count


def after_restore() -> None:
    """Right after a restore: fresh random state for every user, and the
    import system forgets the directory listings made at build time (the
    fast start's standard library zip holds only the modules not imported
    yet, so its directory must be read again)."""
    random.seed(int.from_bytes(os.urandom(32), "big"))
    importlib.invalidate_caches()


def stdlib_zip_path() -> str:
    """The standard library's zip on ``sys.path`` (Pyodide's ``/lib/pythonXY.zip``),
    which the fast start fills in after the first result (engine/faststart/start.mjs)."""
    return next(p for p in sys.path if p.endswith(".zip"))


def stdlib_arrived() -> None:
    """The standard library's zip has been written in full: the import system
    reads its directory again."""
    importlib.invalidate_caches()


def freeze() -> None:
    """Once the engine is imported and warm (both starts): the modules, unit
    registry and tables live as long as the engine, so the cyclic garbage
    collector stops re-scanning them during the user's edits."""
    gc.freeze()


def run_json(calc: str, inputs_json: str, headline_only: bool = False) -> str:
    """``api.run`` with JSON text in and out, for the worker's calls that pass
    ``headline_only`` (the page's first phase: the headline, then the rest).

    >>> full = json.loads(run_json("fastener", json.dumps(api.get("fastener").example)))
    >>> first = json.loads(run_json("fastener", json.dumps(api.get("fastener").example), True))
    >>> first["result"]["display"]["headline"] == full["result"]["display"]["headline"]
    True
    """
    return json.dumps(api.run(calc, json.loads(inputs_json), headline_only=bool(headline_only)))


def _pick(result: dict, key: str):
    return result["result"]["display"]["headline"] if key == "headline" else result["result"][key]


def known_case() -> dict:
    """The known case with the answer this interpreter gives: ``{calc, inputs, expect}``.

    >>> case = known_case()
    >>> case["expect"]["anode"], round(case["expect"]["delta_E_V"], 3)
    ('Zn', 1.104)
    """
    result = api.run(KNOWN_CASE["calc"], KNOWN_CASE["inputs"])
    if not result.get("ok"):
        raise RuntimeError(f"the known case fails: {result}")
    return {"calc": KNOWN_CASE["calc"], "inputs": KNOWN_CASE["inputs"],
            "expect": {key: _pick(result, key) for key in KNOWN_CASE["keys"]}}


def known_case_error(case_json: str) -> str | None:
    """Why this interpreter does not answer the recorded case (JSON text of
    :func:`known_case`) the same way, or None when it does (floats to
    1e-12 relative).

    >>> known_case_error(json.dumps(known_case())) is None
    True
    >>> case = known_case(); case["expect"]["anode"] = "Cu"
    >>> known_case_error(json.dumps(case))
    'known case: anode is "Zn", expected "Cu"'
    """
    case = json.loads(case_json)
    result = api.run(case["calc"], case["inputs"])
    if not result.get("ok"):
        return f"known case failed: {json.dumps(result.get('error'))}"
    for key, want in case["expect"].items():
        got = _pick(result, key)
        numbers = all(isinstance(v, (int, float)) and not isinstance(v, bool) for v in (got, want))
        if numbers:
            same = math.isclose(got, want, rel_tol=KNOWN_CASE_REL, abs_tol=0.0)
        else:
            same = got == want
        if not same:
            return f"known case: {key} is {json.dumps(got)}, expected {json.dumps(want)}"
    return None


def imported_package_files(site_packages: str) -> str:
    """JSON list of the files under ``site_packages`` whose modules are
    imported now (relative paths, sorted): the snapshot maker leaves them out
    of the container, since their code is in the saved memory."""
    prefix = site_packages.rstrip("/") + "/"
    found = set()
    for module in list(sys.modules.values()):
        spec = getattr(module, "__spec__", None)
        origin = getattr(spec, "origin", None)
        if isinstance(origin, str) and origin.startswith(prefix):
            found.add(origin[len(prefix):])
    return json.dumps(sorted(found))


def imported_stdlib_members() -> str:
    """JSON list of the members of the standard library zip (the ``.zip``
    on ``sys.path``) whose modules are imported now, sorted: the fast start
    ships the members not among them (their code is in the saved memory).

    >>> isinstance(json.loads(imported_stdlib_members()), list)
    True
    """
    zips = [p.rstrip("/") + "/" for p in sys.path if p.endswith(".zip")]
    found = set()
    for module in list(sys.modules.values()):
        spec = getattr(module, "__spec__", None)
        origin = getattr(spec, "origin", None)
        if not isinstance(origin, str):
            continue
        for prefix in zips:
            if origin.startswith(prefix):
                found.add(origin[len(prefix):])
    return json.dumps(sorted(found))


def cases() -> list[dict]:
    """The parity cases (``cases.json`` beside this module), then each
    calculator's own example marked ``"example": True``: what must give the
    same answer on CPython and in every start of the browser's engine.

    >>> names = {case["calc"] for case in cases() if not case.get("example")}
    >>> names == {calc["name"] for calc in api.describe()["calculators"]}
    True
    """
    path = os.path.join(os.path.dirname(__file__), "cases.json")
    with open(path, encoding="utf-8") as f:
        listed = json.load(f)
    for calc in api.describe()["calculators"]:
        listed.append({"calc": calc["name"], "inputs": calc.get("example", {}), "example": True})
    return listed
