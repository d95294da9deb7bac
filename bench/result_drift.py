"""How far a change to the rate model moves the pages' numbers.

    python3 bench/result_drift.py --save /tmp/before.json     (before the change)
    python3 bench/result_drift.py --compare /tmp/before.json  (after it)

Run by hand, not by the test suite. Runs every parity case and a grid of
fastener, joint and holiday inputs (every fastener alloy against four plates
in every environment, joints in contact and apart, holidays on each side)
through :func:`noblegap.api.run`, and compares every number of every result
(alternatives, mitigations, cases, scenarios included) with the saved run:
prints the largest relative change per key, the count of changed verdicts,
governing limits and other words, and the worst inputs. A solver change
should move numbers by far less than 0.1 % and change no verdict.
"""

from __future__ import annotations

import argparse
import json
import math
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT / "core"))

#: Relative changes below this are reported as zero (float noise).
NOISE = 1e-12
#: Numbers whose magnitude is below this are compared absolutely (rates of
#: 1e-12 mm/yr are zero for any purpose).
TINY = 1e-9


def inputs():
    from noblegap import api, engine_hooks
    from noblegap.materials import alloys, cell_data

    out = [(c["calc"], c["inputs"]) for c in engine_hooks.cases()]
    envs = [e for e, _ in cell_data.environment_choices()]
    fex = api.get("fastener").example
    for plate in ("A95083", "carbon_steel", "S31600", "C95800"):
        for fid in alloys.fastener_alloys():
            for env in envs:
                out.append(("fastener", dict(fex, fastener=fid, plate=plate, environment=env)))
    for env in envs:
        for count, dia in (("1", "6 mm"), ("40", "16 mm")):
            out.append(("fastener", dict(fex, environment=env, count=count, diameter=dia)))
    jex = api.get("joint").example
    for first in ("galvanized_steel", "A96061", "carbon_steel", "C95800"):
        for second in ("S31600", "C95800", "A95083", "carbon_steel"):
            for env in envs:
                for dist in ("", "50 mm"):
                    for area in ("0.02 m²", "2 m²"):
                        out.append(("joint", dict(jex, first=first, second=second,
                                                  environment=env, distance=dist,
                                                  second_area=area)))
    hex_ = api.get("holiday").example
    for coated, other in (("carbon steel", "nickel-aluminium bronze"),
                          ("nickel-aluminium bronze", "carbon steel"),
                          ("5083", "316 stainless")):
        for env in envs:
            for side in ("anode", "cathode", "both", "none"):
                out.append(("holiday", dict(hex_, coated=coated, other=other,
                                            environment=env, coated_side=side)))
    return out


def run_all():
    from noblegap import api
    res = []
    for calc, inp in inputs():
        r = api.run(calc, inp)
        res.append({"calc": calc, "inputs": inp, "out": r})
    return res


def leaves(obj, path=""):
    if isinstance(obj, dict):
        for k, v in obj.items():
            yield from leaves(v, f"{path}.{k}")
    elif isinstance(obj, list):
        for i, v in enumerate(obj):
            yield from leaves(v, f"{path}[{i}]")
    else:
        yield path, obj


def _key(path):
    """A path without list indices (one line per kind of number)."""
    import re
    return re.sub(r"\[\d+\]", "[]", path)


def compare(before, after):
    assert len(before) == len(after), "the input grid changed; save a new baseline"
    worst = {}
    where = {}
    words = {}
    worst_case = (0.0, None, None)
    n_numbers = 0
    for b, a in zip(before, after):
        assert b["inputs"] == a["inputs"]
        bl, al = dict(leaves(b["out"])), dict(leaves(a["out"]))
        if bl.keys() != al.keys():
            words.setdefault("(keys differ)", []).append((b["calc"], sorted(bl.keys() ^ al.keys())[:4]))
            continue
        for path, x in bl.items():
            y = al[path]
            k = _key(path)
            if isinstance(x, (int, float)) and not isinstance(x, bool) and \
                    isinstance(y, (int, float)) and not isinstance(y, bool):
                n_numbers += 1
                if abs(x) < TINY and abs(y) < TINY:
                    continue
                rel = abs(x - y) / max(abs(x), abs(y))
                if rel > worst.get(k, 0.0):
                    worst[k] = rel
                    where[k] = (b["calc"], b["inputs"], x, y)
                if rel > worst_case[0]:
                    worst_case = (rel, path, (b["calc"], b["inputs"], x, y))
            elif x != y:
                if ".display." in path or path.startswith(".result.display"):
                    k = ".result.display (text)"
                words.setdefault(k, []).append((b["calc"], path, x, y))
    print(f"{len(before)} results, {n_numbers} numbers compared")
    big = sorted(((v, k) for k, v in worst.items() if v > NOISE), reverse=True)
    print("largest relative change by key (top 25):")
    for v, k in big[:25]:
        print(f"  {v:10.3g}  {k}")
    if not big:
        print("  none above float noise")
    print("where the five largest are:")
    for v, k in big[:5]:
        calc, inp, x, y = where[k]
        print(f"  {k}: {calc} {json.dumps(inp, ensure_ascii=False)}  {x!r} -> {y!r}")
    print(f"worst number: {worst_case[0]:.3g} at {worst_case[1]}")
    if worst_case[2]:
        calc, inp, x, y = worst_case[2]
        print(f"  {calc} {json.dumps(inp, ensure_ascii=False)}\n  before {x!r} after {y!r}")
    print("words that changed (verdicts, limits, text):")
    for k, lst in sorted(words.items()):
        print(f"  {k}: {len(lst)}")
        for item in lst[:3]:
            print("     ", str(item)[:300])
    if not words:
        print("  none")
    return big, words


def main(argv=None):
    ap = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    g = ap.add_mutually_exclusive_group(required=True)
    g.add_argument("--save")
    g.add_argument("--compare")
    args = ap.parse_args(argv)
    res = run_all()
    if args.save:
        Path(args.save).write_text(json.dumps(res, ensure_ascii=False))
        print(f"{len(res)} results saved to {args.save}")
        return 0
    before = json.loads(Path(args.compare).read_text())
    after = json.loads(json.dumps(res, ensure_ascii=False))
    compare(before, after)
    return 0


if __name__ == "__main__":
    sys.exit(main())
