"""The same cases give the same answers on CPython and inside Pyodide.

Each case of core/noblegap/cases.json, and each calculator's example, runs through ``noblegap.api.run`` here and in
Pyodide under Node (loaded from the built site/ the way the browser worker
loads it), once after a normal start and once from the build's memory
snapshot, and once in a site built without the fast start. Results must agree key for key; floats to 1e-12 relative.
"""

import json
import math

import pytest

from .conftest import MODES, load_cases, run_in_pyodide

CASES = load_cases()
REL = 1e-12


def _diff(a, b, path="$"):
    """The first difference between two JSON values, or None."""
    if isinstance(a, bool) or isinstance(b, bool):
        return None if a is b else f"{path}: {a!r} != {b!r}"
    if isinstance(a, (int, float)) and isinstance(b, (int, float)):
        if a == b or math.isclose(a, b, rel_tol=REL, abs_tol=0.0):
            return None
        return f"{path}: {a!r} != {b!r} (rel {abs(a - b) / max(abs(a), abs(b)):.3g})"
    if isinstance(a, dict) and isinstance(b, dict):
        if a.keys() != b.keys():
            return f"{path}: keys differ: {sorted(a.keys() ^ b.keys())}"
        for k in a:
            d = _diff(a[k], b[k], f"{path}.{k}")
            if d:
                return d
        return None
    if isinstance(a, list) and isinstance(b, list):
        if len(a) != len(b):
            return f"{path}: length {len(a)} != {len(b)}"
        for i, (x, y) in enumerate(zip(a, b)):
            d = _diff(x, y, f"{path}[{i}]")
            if d:
                return d
        return None
    return None if a == b else f"{path}: {a!r} != {b!r}"


def test_compare_flags_real_differences():
    assert _diff({"x": [1.0, {"y": 0.1 * 3}]}, {"x": [1, {"y": 0.30000000000000004}]}) is None
    assert _diff({"x": 1.0}, {"x": 1.0 + 1e-9}) is not None
    assert _diff({"x": True}, {"x": 1}) is not None
    assert _diff({"x": "a"}, {"x": "b"}) is not None


def test_cases_cover_every_calculator():
    """Beyond its example, every calculator has hand-written cases."""
    import noblegap.api as api

    names = {c["name"] for c in api.describe()["calculators"]}
    covered = {c["calc"] for c in CASES if not c.get("example")}
    assert names - covered == set(), "add parity cases to core/noblegap/cases.json"


@pytest.mark.parametrize("mode", MODES)
def test_pyodide_runs_the_pinned_python(pyodide_runs, mode):
    from site_build.paths import load_pyodide_pin

    run = pyodide_runs[mode]
    assert run["mode"] == ("normal" if mode == "no-faststart" else mode), run.get("note")
    assert run["python"] == load_pyodide_pin()["python"]
    assert len(run["results"]) == len(CASES)


@pytest.mark.parametrize("mode", MODES)
@pytest.mark.parametrize(
    "index", range(len(CASES)), ids=[f"{c['calc']}-{'example' if c.get('example') else i}" for i, c in enumerate(CASES)]
)
def test_same_result(index, mode, pyodide_runs):
    import noblegap.api as api

    case = CASES[index]
    expected = json.loads(json.dumps(api.run(case["calc"], case["inputs"]), allow_nan=False))
    got = pyodide_runs[mode]["results"][index]
    assert _diff(expected, got) is None, _diff(expected, got)


def test_snapshot_restores_reseed_random(pyodide_runs, tmp_path):
    """Every restore of the one snapshot gets its own random state."""
    again = run_in_pyodide([], "snapshot", tmp_path)
    first = pyodide_runs["snapshot"]["random"]
    assert isinstance(first, float) and isinstance(again["random"], float)
    assert first != again["random"]
