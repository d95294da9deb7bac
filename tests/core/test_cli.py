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
