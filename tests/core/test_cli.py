"""The command line: python -m noblegap run/describe."""

import json
import os
import subprocess
import sys
from pathlib import Path

CORE = str(Path(__file__).resolve().parents[2] / "core")


def _run(*args):
    env = dict(os.environ, PYTHONPATH=CORE)
    return subprocess.run([sys.executable, "-m", "noblegap", *args], capture_output=True,
                          text=True, env=env, timeout=60)


def test_run_json():
    p = _run("run", "couple", "metal_a=Zn", "metal_b=Cu", "--json")
    assert p.returncode == 0
    assert json.loads(p.stdout)["result"]["anode"] == "Zn"


def test_bad_input_exits_nonzero_with_error_dict():
    p = _run("run", "convert", "potential=3 kg", "--json")
    assert p.returncode == 2
    err = json.loads(p.stdout)["error"]
    assert err["errors"][0]["field"] == "potential"
    assert "Traceback" not in p.stdout + p.stderr


def test_describe():
    p = _run("describe", "convert")
    assert p.returncode == 0
    assert json.loads(p.stdout)["calculator"]["name"] == "convert"


def test_unknown_key_is_an_error_with_did_you_mean():
    p = _run("run", "convert", "potental=-0.5V")
    assert p.returncode == 2
    assert "Unknown key" in p.stdout and "did you mean potential" in p.stdout
    p = _run("run", "convert", "potental=-0.5V", "--json")
    assert p.returncode == 2
    err = json.loads(p.stdout)["error"]
    assert err["type"] == "UnknownKeyError" and err["suggestions"] == ["potential"]


def test_json_is_always_json():
    for args in (["run", "--json"], ["--json"], ["frob", "--json"], ["run", "nope", "--json"],
                 ["run", "convert", "novalue", "--json"]):
        p = _run(*args)
        assert p.returncode == 2, args
        assert json.loads(p.stdout)["ok"] is False, args
        assert "Traceback" not in p.stderr


def test_closed_pipe_ends_quietly():
    env = dict(os.environ, PYTHONPATH=CORE)
    p = subprocess.run(f"'{sys.executable}' -m noblegap describe | head -c 10", shell=True,
                       capture_output=True, text=True, env=env, timeout=60)
    assert p.stdout == '{\n  "ok": '[:10]
    assert "Traceback" not in p.stderr and "BrokenPipe" not in p.stderr


def test_text_output_says_how_values_were_read():
    p = _run("run", "fastener", "diameter=M10", "fastener=316L")
    assert p.returncode == 0
    assert "M10 thread: 10 mm nominal diameter" in p.stdout
    assert "316L is taken as 316" in p.stdout
