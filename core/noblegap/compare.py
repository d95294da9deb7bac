"""Alternatives side by side: one joint, up to four design variants as columns.

Interface layer, beside :mod:`noblegap.api`. From a fastener (or joint)
check, the page shows the current design next to variants with the same
geometry: another fastener alloy, the joint electrically isolated, the
cathode coated, a sacrificial anode added. Each column has the verdict, the
local penetration rate near the joint (with its range where the calculator gives one) and
the years to consume the corrosion allowance.

A variant is named by a short id that goes into the page's link
(``compare=alloy:A96061,isolate,coat_cathode``):

* ``current`` — the inputs as entered (always the first column);
* ``alloy:<id>`` — the same joint with another fastener alloy (on the joint
  page: another alloy for the second member), a full run of the calculator
  with that one input changed (:data:`ALLOY_FIELD`);
* ``isolate``, ``coat_cathode``, ``anode`` — the calculator's own computed
  mitigation of that id (its ``mitigations`` output). A calculator that does
  not compute one says so in the column instead of guessing.

>>> out = compare("fastener", {"fastener": "316 stainless", "plate": "5083"},
...               ["isolate", "alloy:A96061"])
>>> [c["id"] for c in out["columns"]]
['current', 'isolate', 'alloy:A96061']
>>> out["columns"][2]["verdict_class"]
'ok'
"""

from __future__ import annotations

import json
import math

from . import api
from .materials import alloys
from .errors import ChoiceError, InputError, NoblegapError
from .verdicts import RANK, label as verdict_label

MAX_COLUMNS = 4
MITIGATIONS = {
    "isolate": "Electrically isolated",
    "coat_cathode": "Cathode coated",
    "anode": "Sacrificial anode added",
}
#: The input a variant ``alloy:<id>`` changes, per calculator, and how its
#: column is titled: the fastener's alloy; on the joint page, the second
#: member (the part attached to the first: a clamp, a bracket, a fitting).
ALLOY_FIELD = {"fastener": "fastener", "joint": "second"}
ALLOY_TITLE = {"fastener": "Fastener", "joint": "Second member"}
CALCULATORS = tuple(ALLOY_FIELD)


def _num(x):
    return x if isinstance(x, (int, float)) and not isinstance(x, bool) and math.isfinite(x) else None


def _class_of(verdict):
    """A mitigation's verdict word mapped to the one vocabulary's class."""
    if verdict in RANK:
        return verdict
    return {"sound": "ok", "marginal": "caution", "reject": "avoid"}.get(verdict, "")


def _column(vid, title, src, years_key="years_to_allowance"):
    rate = _num(src.get("local_mm_per_yr"))
    cls = src.get("verdict_class") or _class_of(src.get("verdict", ""))
    return {
        "id": vid, "title": title, "available": True, "note": src.get("note", "") or "",
        "verdict_class": cls, "verdict": verdict_label(cls) if cls else "",
        "rate_mm_per_yr": rate,
        "rate_low_mm_per_yr": _num(src.get("local_mm_per_yr_low")),
        "rate_high_mm_per_yr": _num(src.get("local_mm_per_yr_high",
                                            src.get("high_local_mm_per_yr"))),
        "years_to_allowance": _num(src.get(years_key)),
        "life_text": src.get("life_text", ""),
    }


def _unavailable(vid, title, why):
    return {"id": vid, "title": title, "available": False, "note": why, "verdict_class": "",
            "verdict": "", "rate_mm_per_yr": None, "rate_low_mm_per_yr": None,
            "rate_high_mm_per_yr": None, "years_to_allowance": None, "life_text": ""}


def parse_variants(text):
    """``"alloy:A96061,isolate"`` (the link's value) or a list -> list of ids."""
    items = text.split(",") if isinstance(text, str) else list(text or [])
    out = []
    for raw in items:
        v = str(raw).strip()
        if not v or v == "current" or v in out:
            continue
        if not (v in MITIGATIONS or (v.startswith("alloy:") and len(v) > 6)):
            raise ChoiceError(f"{v!r} is not a variant to compare.", field="compare", value=v,
                              allowed="alloy:<fastener alloy>, " + ", ".join(MITIGATIONS))
        out.append(v)
    if len(out) > MAX_COLUMNS - 1:
        raise InputError(f"Too many variants ({len(out)}).", field="compare",
                         value=",".join(out),
                         allowed=f"up to {MAX_COLUMNS - 1} beside the current design")
    return out


def compare(calc, inputs, variants):
    """The current design and each variant as a column (see the module docstring).

    Returns ``{"ok": True, "calc", "variants", "columns"}`` or ``{"ok": False,
    "error"}`` when the current design itself cannot be computed, the
    calculator has no compare view, or a variant id is not known.
    """
    try:
        if calc not in CALCULATORS:
            raise ChoiceError(f"The {calc!r} check has no compare view.", field="calc",
                              value=calc, allowed=", ".join(CALCULATORS))
        wanted = parse_variants(variants)
    except NoblegapError as exc:
        return {"ok": False, "error": exc.to_dict()}
    base = api.run(calc, inputs)
    if not base["ok"]:
        return {"ok": False, "error": base["error"]}
    res = base["result"]
    columns = [_column("current", "Current design", res)]
    mitigations = {m.get("id"): m for m in res.get("mitigations", []) if isinstance(m, dict)}
    for vid in wanted:
        if vid.startswith("alloy:"):
            alloy = vid[6:]
            field = ALLOY_FIELD[calc]
            run = api.run(calc, {**base["inputs"], field: alloy})
            if not run["ok"]:
                err = run["error"]
                msg = (err.get("errors") or [err])[0].get("message", "")
                columns.append(_unavailable(vid, f"{ALLOY_TITLE[calc]}: {alloy}",
                                            f"Not computed: {msg}"))
                continue
            r = run["result"]
            name = next((a.get("name") for a in res.get("alternatives", [])
                         if alloy in (a.get("alloy"), a.get("fastener"))), None)
            if name is None:
                try:
                    name = alloys.alloy_label(alloy)
                except NoblegapError:
                    name = None
            col = _column(vid, f"{ALLOY_TITLE[calc]}: {name or alloy}", r)
            columns.append(col)
        else:
            m = mitigations.get(vid)
            if m is None or _num(m.get("local_mm_per_yr")) is None:
                columns.append(_unavailable(vid, MITIGATIONS[vid],
                                            f"The {calc} check does not compute this variant."))
            else:
                columns.append(_column(vid, MITIGATIONS[vid], m))
    return {"ok": True, "calc": calc, "variants": wanted, "columns": columns}


def handle(request_json):
    """JSON text in and out for the browser worker: ``{"calc", "inputs", "variants"}``."""
    try:
        req = json.loads(request_json)
        out = compare(req.get("calc"), req.get("inputs") or {}, req.get("variants") or [])
    except (ValueError, TypeError, AttributeError) as exc:
        out = {"ok": False, "error": {"type": "UsageError", "message":
                                      f"The compare request is malformed ({type(exc).__name__})."}}
    return json.dumps(out, allow_nan=False, ensure_ascii=False)
