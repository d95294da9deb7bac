"""Command line: ``python -m noblegap run CALC key=value ... [--json]``.

``python -m noblegap describe [CALC]`` prints the schema. Bad input exits with
status 2 and prints the error dict.
"""

from __future__ import annotations

import argparse
import json
import sys

from . import api, schedule


def _text(result):
    if not result["ok"]:
        err = result["error"]
        lines = [f"error: {err['message']}"]
        for sub in err.get("errors", []):
            lines.append(f"  {sub['field']}: {sub['message']}")
        return "\n".join(lines)
    disp = result["result"].get("display", {})
    lines = [disp.get("headline", "")]
    if disp.get("verdict"):
        v = disp["verdict"]
        lines.append(f"verdict: {v['label']} — {v['reason']}")
    lines += disp.get("paragraphs", [])
    for row in disp.get("rows", []):
        lines.append(f"  {row['label']}: {row['value']}")
    for t in disp.get("tables", []):
        lines.append(f"{t['title']}:")
        lines.append("  " + " | ".join(t["columns"]))
        lines += ["  " + " | ".join(r) for r in t["rows"]]
    lines += [f"warning: {w}" for w in disp.get("warnings", [])]
    return "\n".join(x for x in lines if x)


def main(argv=None):
    parser = argparse.ArgumentParser(prog="noblegap", description=__doc__.split("\n")[0])
    sub = parser.add_subparsers(dest="command", required=True)
    p_run = sub.add_parser("run", help="run a calculator")
    p_run.add_argument("calc")
    p_run.add_argument("pairs", nargs="*", metavar="key=value")
    p_run.add_argument("--json", action="store_true", help="print the result as JSON")
    p_desc = sub.add_parser("describe", help="print a calculator's schema")
    p_desc.add_argument("calc", nargs="?")
    schedule.add_arguments(sub.add_parser("schedule", help="run a CSV schedule of joints"))
    args = parser.parse_args(argv)
    if args.command == "schedule":
        return schedule.command(args)
    if args.command == "describe":
        out = api.describe(args.calc)
        print(json.dumps(out, indent=2, ensure_ascii=False))
        return 0 if out["ok"] else 2
    inputs = {}
    for pair in args.pairs:
        if "=" not in pair:
            print(json.dumps({"ok": False, "error": {
                "type": "UsageError", "message": f"{pair!r} is not key=value.",
                "field": None, "value": pair, "allowed": "key=value pairs"}}))
            return 2
        key, value = pair.split("=", 1)
        inputs[key.strip()] = value
    known = set()
    try:
        known = {f.key for f in api.get(args.calc).fields}
    except Exception:  # noqa: BLE001 - run() reports the unknown calculator itself
        pass
    unknown = sorted(set(inputs) - known) if known else []
    result = api.run(args.calc, inputs)
    if unknown and result.get("ok"):
        result.setdefault("warnings", []).append(
            f"ignored unknown keys: {', '.join(unknown)} (allowed: {', '.join(sorted(known))})")
    print(json.dumps(result, indent=2, ensure_ascii=False) if args.json else _text(result))
    return 0 if result["ok"] else 2


if __name__ == "__main__":
    sys.exit(main())
