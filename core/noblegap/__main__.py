"""Command line: ``python -m noblegap run CALC key=value ... [--json]``.

``python -m noblegap describe [CALC]`` prints the schema. Bad input exits with
status 2 and prints the error dict.
"""

from __future__ import annotations

import argparse
import json
import os
import sys

from . import api, schedule
from .errors import NoblegapError, suggest


def _text(result):
    if not result["ok"]:
        err = result["error"]
        lines = [f"error: {err['message']}"]
        for sub in err.get("errors", []):
            lines.append(f"  {sub['field']}: {sub['message']}")
        return "\n".join(lines)
    disp = result["result"].get("display", {})
    lines = [disp.get("headline", "")]
    if disp.get("headline_confidence"):
        lines.append(disp["headline_confidence"]["line"])
    lines += [f"  read {key} as: {text}" for key, text in result.get("inputs_read", {}).items()
              if text != result.get("inputs", {}).get(key)]
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


class UsageError(Exception):
    """Bad usage of the command line itself (reported, in JSON with ``--json``)."""


class _Parser(argparse.ArgumentParser):
    def error(self, message):
        raise UsageError(message)


def _usage_error(message, value=None, allowed=None, suggestions=()):
    return {"ok": False, "error": {
        "type": "UsageError", "kind": "usage", "message": message, "field": None,
        "value": value, "allowed": allowed, "label": None, "suggestions": list(suggestions)}}


def _print(text):
    """Print, ending quietly when the reader has gone (``describe | head``)."""
    try:
        sys.stdout.write(text + "\n")
        sys.stdout.flush()
    except BrokenPipeError:
        # Nobody reads the rest: point stdout at devnull so the interpreter's
        # final flush does not fail again, and end without a traceback.
        devnull = os.open(os.devnull, os.O_WRONLY)
        os.dup2(devnull, sys.stdout.fileno())
        raise SystemExit(0) from None


def _unknown_keys(calc, inputs):
    """An error dict for keys the calculator does not have (with suggestions), or None."""
    try:
        known = [f.key for f in api.get(calc).fields]
    except NoblegapError:
        return None  # run() reports the unknown calculator itself
    unknown = [k for k in inputs if k not in known]
    if not unknown:
        return None
    parts, sugg = [], []
    for key in unknown:
        close = suggest(key, known, limit=3)
        sugg += [c for c in close if c not in sugg]
        parts.append(f"{key!r}" + (f" (did you mean {', '.join(close)}?)" if close else ""))
    return {"ok": False, "calc": calc, "inputs": inputs, "error": {
        "type": "UnknownKeyError", "kind": "input",
        "message": (f"Unknown key{'s' if len(unknown) > 1 else ''} for {calc}: "
                    f"{', '.join(parts)}. Allowed: {', '.join(known)}."),
        "field": unknown[0], "value": inputs[unknown[0]], "allowed": ", ".join(known),
        "label": None, "suggestions": sugg}}


def main(argv=None):
    argv = list(sys.argv[1:] if argv is None else argv)
    as_json = "--json" in argv
    try:
        return _main(argv, as_json)
    except UsageError as exc:
        out = _usage_error(f"{exc}. Usage: noblegap run CALC key=value ... [--json] | "
                           "noblegap describe [CALC]", allowed="run, describe")
        if as_json:
            _print(json.dumps(out, indent=2, ensure_ascii=False))
        else:
            print(f"error: {out['error']['message']}", file=sys.stderr)
        return 2


def _main(argv, as_json):
    parser = _Parser(prog="noblegap", description=__doc__.split("\n")[0])
    sub = parser.add_subparsers(dest="command", required=True)
    p_run = sub.add_parser("run", help="run a calculator")
    p_run.add_argument("calc")
    p_run.add_argument("pairs", nargs="*", metavar="key=value")
    p_run.add_argument("--json", action="store_true", help="print the result as JSON")
    p_desc = sub.add_parser("describe", help="print a calculator's schema")
    p_desc.add_argument("calc", nargs="?")
    p_desc.add_argument("--json", action="store_true", help="(the schema is always JSON)")
    schedule.add_arguments(sub.add_parser("schedule", help="run a CSV schedule of joints"))
    for p in (p_run, p_desc):
        p.error = parser.error
    if not argv:
        raise UsageError("no command given")
    args = parser.parse_args(argv)
    if args.command == "schedule":
        return schedule.command(args)
    if args.command == "describe":
        out = api.describe(args.calc)
        _print(json.dumps(out, indent=2, ensure_ascii=False))
        return 0 if out["ok"] else 2
    inputs = {}
    for pair in args.pairs:
        if "=" not in pair:
            out = _usage_error(f"{pair!r} is not key=value.", value=pair,
                               allowed="key=value pairs")
            _print(json.dumps(out, indent=2, ensure_ascii=False) if args.json
                   else f"error: {out['error']['message']}")
            return 2
        key, value = pair.split("=", 1)
        inputs[key.strip()] = value
    result = _unknown_keys(args.calc, inputs) or api.run(args.calc, inputs)
    _print(json.dumps(result, indent=2, ensure_ascii=False) if args.json else _text(result))
    return 0 if result["ok"] else 2


if __name__ == "__main__":
    sys.exit(main())
