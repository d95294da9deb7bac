"""Engineering alloys and service environments: the sourced tables every calculator reads.

Sign convention: a corrosion potential ``E_V_SCE`` is the free (open-circuit)
potential of the alloy against a saturated calomel electrode, metal minus
reference, in volts. Each alloy row holds a *range*: ``E_noble_V_SCE`` (the
most noble end, the higher number) and ``E_active_V_SCE`` (the least noble
end), read from the galvanic series in flowing seawater, so
``E_noble_V_SCE ≥ E_active_V_SCE``.

Stainless steels have two rows, one per surface state: the passive row under
the UNS number (``S31600``) and the active row with the suffix ``_active``
(``S31600_active``); both carry the UNS number in the ``uns`` column. Metals
without such a distinction have state ``n/a``.

How environments use the seawater ranges (see :func:`applicability`):

* ``seawater_flowing`` — the environment the series was measured in; used
  directly (``series_shift`` = ``none``).
* other immersion and splash, and the atmospheric classes — the same ranges are
  used as an approximation, with a warning (``approximate``).
* ``freshwater`` — the seawater series does not apply; its values are returned
  for orientation only, with a plain warning (``not-applicable``).

``anodic_index_V`` is the common-practice anodic index as that guidance prints
it: a positive number, 0 for the most noble group, larger for more anodic.

References
----------
.. [1] ASTM G82, Standard Guide for Development and Use of a Galvanic Series
   for Predicting Galvanic Corrosion Performance, Fig. 1.
.. [2] ASTM G102, Standard Practice for Calculation of Corrosion Rates and
   Related Information from Electrochemical Measurements (equivalent weight).
"""

from __future__ import annotations

import re

from . import data, references
from ..errors import ChoiceError, MissingDataError, suggest
from ..schema import CHOICE, Field

STATES = ("passive", "active", "n/a")
SERIES_REF = "sce"

_validated = False

#: Designation systems of a zinc layer on steel: such a designation is reported
#: as a warning (the layer is used up, then the steel beneath is exposed).
ZINC_LAYER_SYSTEMS = ("electroplated zinc", "continuous hot-dip sheet", "hot-dip galvanizing")


def _ensure_valid():
    global _validated
    if not _validated:
        from . import validate
        validate.validate_tables(("alloys", "environments", "alloy_designations"))
        _validated = True


def alloy_table():
    """Rows of ``data/alloys.csv`` (validated on first use)."""
    _ensure_valid()
    return data.table("alloys")


def _index():
    _ensure_valid()
    return data.index("alloys")


def __getattr__(name):
    # ALLOY_TABLE is read lazily so that importing the module touches no file.
    if name == "ALLOY_TABLE":
        return alloy_table()
    raise AttributeError(name)


def _norm(text):
    t = str(text).strip().lower().replace("\u2212", "-")
    t = t.replace("aluminum", "aluminium").replace("galvanised", "galvanized")
    t = re.sub(r"^uns[\s:-]*", "", t)
    return re.sub(r"\s+", " ", t)


def _norm_uns(text):
    return re.sub(r"[\s-]", "", _norm(text)).upper()


def _group(row):
    return row["uns"] or row["id"]


def _pick_state(rows, state, field, value):
    """From rows of one alloy (same UNS), pick the one for ``state``."""
    rows = list(rows)
    if len(rows) == 1 and rows[0]["state"] == "n/a":
        return rows[0]["id"]
    want = state or "passive"
    for r in rows:
        if r["state"] == want:
            return r["id"]
    have = ", ".join(sorted({r["state"] for r in rows}))
    raise MissingDataError(
        f"The galvanic-series table has no {want}-state range for {rows[0]['name']} "
        f"({_group(rows[0])}); it holds: {have}.", field=field, value=value,
        allowed=", ".join(r["id"] for r in rows))


def alloy_label(row_or_id):
    """Display label, e.g. ``Stainless steel 316 (S31600), passive``."""
    row = alloy(row_or_id) if isinstance(row_or_id, str) else row_or_id
    return _label(row)


def _label(row):
    text = row["name"]
    if row["uns"]:
        text += f" ({row['uns']})"
    if row["state"] in ("passive", "active"):
        text += f", {row['state']}"
    return text


def resolve_alloy(text, field="alloy", state=None):
    """Map what a user typed to an alloy id (see :func:`resolve_alloy_note`)."""
    hit = resolve_alloy_note(text, field, state)
    return hit[0] if isinstance(hit, tuple) else hit


def resolve_alloy_note(text, field="alloy", state=None):
    """Map what a user typed to an alloy id, saying how a designation was taken.

    Returns the id, or ``(id, sentence, is_warning)`` when the text was a
    designation of ``data/alloy_designations.csv`` mapped to a series row
    (``316L`` → ``S31600``: "316L is taken as 316 in the seawater galvanic
    series."). See :func:`resolve_alloy` for the rest.

    Accepts an id (``S31600_active``, ``zinc``), a UNS number (``S31600``,
    ``UNS S31600``, ``s316-00``: the passive row unless ``state="active"``),
    or a generic name or alias, case-insensitively (``316 stainless``,
    ``alloy 400``, ``galvanised steel``). ``state`` (``passive``/``active``/
    ``None``) selects between the two rows of a stainless steel.

    Raises
    ------
    ChoiceError
        Unknown or ambiguous text, with close matches ("did you mean").
    MissingDataError
        The alloy is known but has no row for the requested state.
    """
    if state in ("", "auto"):
        state = None
    if state is not None and state not in STATES:
        raise ChoiceError(f"Unknown surface state {state!r}.", field=field, value=state,
                          allowed="auto, passive, active")
    rows = alloy_table()
    if text is None or not str(text).strip():
        raise ChoiceError("No alloy given.", field=field, value=text,
                          allowed="an alloy id, a UNS number or a generic name",
                          suggestions=[r["id"] for r in rows[:5]])
    raw = str(text).strip()
    by_group = {}
    for r in rows:
        by_group.setdefault(_group(r), []).append(r)

    # 1. an id
    ids = {r["id"].lower(): r for r in rows}
    hit = ids.get(raw.lower())
    if hit is not None:
        if state is None or hit["state"] == "n/a" or hit["state"] == state:
            return hit["id"]
        return _pick_state(by_group[_group(hit)], state, field, text)
    # 2. a UNS number
    uns = _norm_uns(raw)
    group = [r for r in rows if r["uns"] and r["uns"].upper() == uns]
    if group:
        return _pick_state(group, state, field, text)
    # 3. a generic name or alias, exactly
    if len(raw) > 80:
        raise ChoiceError("That is too long for an alloy name.", field=field,
                          value=raw[:80] + "…", allowed="an alloy id, a UNS number, a "
                          "designation such as 316L, or a generic name")
    key = _norm(raw)
    exact = [r for r in rows if _norm(r["name"]) == key or key in
             [_norm(a) for a in r["aliases"].split(";") if a.strip()]]
    groups = {_group(r) for r in exact}
    if len(groups) == 1:
        return _pick_state(by_group[groups.pop()], state, field, text)
    # 4. a designation people write (316L, A4-70, 1.4401, 5083-H116, zinc-plated)
    hit = _designation(raw, field)
    if hit is not None:
        sid = _pick_state(by_group[_group(_index()[hit[0]])], state, field, text)
        return sid, hit[1], hit[2]
    # 5. every word of the text appears in the name or aliases
    if not exact:
        words = key.split()
        exact = [r for r in rows
                 if all(w in _norm(r["name"] + " " + r["aliases"].replace(";", " ")
                                   + " " + r["family"]) for w in words)]
        groups = {_group(r) for r in exact}
        if len(groups) == 1:
            return _pick_state(by_group[groups.pop()], state, field, text)
    allowed = "an alloy id, a UNS number or a generic name from the galvanic-series table"
    if exact:
        choices = []
        for r in exact:
            if r["state"] != "active" and r["id"] not in choices:
                choices.append(r["id"])
        raise ChoiceError(f"{raw!r} matches several alloys; pick one.", field=field,
                          value=text, allowed=allowed, suggestions=choices[:8])
    names = {r["id"]: r["id"] for r in rows}
    names.update({r["name"]: r["id"] for r in rows})
    close = suggest(raw, list(names))
    sugg = []
    for c in close:
        if names[c] not in sugg:
            sugg.append(names[c])
    raise ChoiceError(f"Unknown alloy {raw!r}.", field=field, value=text, allowed=allowed,
                      suggestions=sugg)


_PREFIX_NUM = re.compile(r"^(?:uns|aisi|sae|type|grade|ss|en\s*aw|en|w\.?\s*nr\.?|"
                         r"werkstoff(?:nummer)?|aa|al)[\s:.-]*(?=\d)", re.I)
_PREFIX_ANY = re.compile(r"^(?:astm|uns)\s+", re.I)
_TEMPER = re.compile(r"^(\d{4})[\s-]*(o|f|h\d{1,3}|t\d{1,4})$", re.I)


def _dkey(text):
    t = _norm(text).replace("galvanised", "galvanized")
    t = re.sub(r"[^a-z0-9.]", "", t)
    return t[:-5] if t.endswith("steel") and len(t) > 5 else t


def designation_table():
    """Rows of ``data/alloy_designations.csv`` (validated on first use)."""
    _ensure_valid()
    return data.table("alloy_designations")


def _designation(raw, field):
    """``(series id, sentence, is_warning)`` for a designation, or None.

    Raises ChoiceError for an ambiguous name (bronze), with the choices.
    """
    rows = {_dkey(r["id"]): r for r in designation_table()}
    row = rows.get(_dkey(raw))
    stripped = raw.strip()
    if row is None:
        stripped = _PREFIX_ANY.sub("", _PREFIX_NUM.sub("", stripped))
        temper = _TEMPER.match(stripped.replace("\u2013", "-"))
        if temper:
            stripped = temper.group(1)
        if stripped == raw.strip():
            return None
        row = rows.get(_dkey(stripped))
        if row is None:
            try:
                hit = resolve_alloy(stripped, field)
            except ChoiceError:
                return None
            label = _label(alloy(hit))
            extra = (" (the temper does not move an alloy in the galvanic series)"
                     if temper else "")
            return hit, f"{raw.strip()} is taken as {label} in the seawater galvanic series{extra}.", False
    if row["choices"]:
        choices = [c for c in row["choices"].split(";") if c]
        names = "; ".join(_label(alloy(c)) for c in choices)
        raise ChoiceError(f"{raw.strip()!r} matches several alloys of the galvanic series, with "
                          f"different potentials; pick one: {names}.", field=field,
                          value=raw, allowed="one of the alloys named", suggestions=choices)
    sentence = (f"{raw.strip()} is taken as {row['taken_as']} in the seawater galvanic series"
                f" ({_label(alloy(row['series_id']))}; mapping {row['confidence']}).")
    if row["note"]:
        sentence += " " + row["note"]
    return row["series_id"], sentence, row["system"] in ZINC_LAYER_SYSTEMS


def alloy(alloy_id):
    """Return the data row of an alloy id (ChoiceError with suggestions if unknown)."""
    idx = _index()
    if alloy_id in idx:
        return idx[alloy_id]
    return idx[resolve_alloy(alloy_id, "alloy")]


def alloy_choices():
    """``[(id, label)]`` in table order (most noble first), e.g.
    ``("S31600", "Stainless steel 316 (S31600), passive")``."""
    return [(r["id"], _label(r)) for r in alloy_table()]


def fastener_alloys():
    """Ids of alloys that practice uses for fasteners (``fastener_use`` = yes)."""
    return [r["id"] for r in alloy_table() if r["fastener_use"] == "yes"]


def sibling(alloy_id, state):
    """The id of the same alloy in the other surface state, or None."""
    row = alloy(alloy_id)
    if not row["uns"]:
        return None
    for r in alloy_table():
        if r["uns"] == row["uns"] and r["state"] == state and r["id"] != row["id"]:
            return r["id"]
    return None


def environment(env_id, field="environment"):
    """Return the data row of an environment (ChoiceError if unknown)."""
    _ensure_valid()
    return data.lookup("environments", env_id, field=field, what="environment")


def environment_choices():
    """``[(id, name)]`` of the environments."""
    _ensure_valid()
    return [(r["id"], r["name"]) for r in data.table("environments")]


def applicability(env_id):
    """Warnings (plain sentences) on using the seawater series in ``env_id``.

    Empty for flowing seawater, where the series was measured.
    """
    env = environment(env_id)
    if env["series_shift"] == "none":
        return []
    return [env["series_applicability"]]


def potential_range(alloy_id, env_id="seawater_flowing", ref=SERIES_REF):
    """Corrosion-potential range of an alloy in an environment.

    Parameters
    ----------
    alloy_id : str
        Id in ``data/alloys.csv``.
    env_id : str
        Id in ``data/environments.csv``. The table holds flowing-seawater
        ranges; other environments reuse them (see :func:`applicability`).
    ref : str
        Reference electrode of the result (``data/reference_electrodes.csv``).

    Returns
    -------
    tuple
        ``(E_noble_V, E_active_V)`` [V vs ``ref``], noble ≥ active.

    Raises
    ------
    MissingDataError
        The alloy has no range in the table.

    Example
    -------
    >>> potential_range("zinc", "seawater_flowing")
    (-0.98, -1.03)
    """
    row = alloy(alloy_id)
    environment(env_id)
    hi, lo = row["E_noble_V_SCE"], row["E_active_V_SCE"]
    if hi is None or lo is None:
        raise MissingDataError(
            f"No galvanic-series potential range for {row['name']} ({row['id']}) in "
            f"the alloy table (its galvanic-series potentials).",
            field="alloy", value=alloy_id)
    if ref == SERIES_REF:
        return hi, lo
    return references.to_scale(hi, SERIES_REF, ref), references.to_scale(lo, SERIES_REF, ref)


FAMILY_GROUPS = (
    ("Stainless steels", ("stainless steel",)),
    ("Aluminium alloys", ("aluminium",)),
    ("Steels and cast irons", ("steel", "cast iron")),
    ("Zinc and zinc coatings, cadmium", ("zinc", "zinc-coated steel", "cadmium")),
    ("Copper, brasses and bronzes", ("copper", "copper alloy")),
    ("Copper-nickels", ("copper-nickel",)),
    ("Nickel and nickel alloys", ("nickel", "nickel alloy")),
    ("Titanium", ("titanium",)),
    ("Magnesium", ("magnesium",)),
    ("Lead, tin and solder", ("lead", "tin", "solder")),
    ("Noble metals and graphite", ("noble metal", "carbon")),
)


def family_group(family):
    """The family group (a heading of the series view and the alloy picker) of a family."""
    for name, members in FAMILY_GROUPS:
        if family in members:
            return name
    return "Other metals"


def alloy_families():
    """``{alloy id: family group}`` for every alloy (groups the touch picker)."""
    return {r["id"]: family_group(r["family"]) for r in alloy_table()}


def alloy_field(key, label, default, help="", optional=False):
    """A free-text-with-suggestions alloy input (id, UNS number or generic name)."""
    return Field(key, label, CHOICE, default=default, choices=alloy_choices,
                 resolve=lambda text, field: resolve_alloy_note(text, field), widget="combo",
                 families=alloy_families,
                 help=help or "Generic name or UNS number, e.g. 316 stainless, S31600, "
                              "alloy 400, zinc.",
                 source="data/alloys.csv", optional=optional)


STATE_CHOICES = [("auto", "As listed (passive where the alloy passivates)"),
                 ("passive", "Passive"), ("active", "Active (crevice, stagnant, low oxygen)")]


def state_field(key="state", label="Surface state", default="auto", help=""):
    """Passive/active override for stainless steels and other passivating alloys."""
    return Field(key, label, CHOICE, default=default, choices=STATE_CHOICES,
                 help=help or ("Stainless steels are listed passive. Choose active for "
                               "crevices, stagnant water or oxygen-starved joints."))


def environment_field(key="environment", default="seawater_flowing", label="Environment",
                      help=""):
    return Field(key, label, CHOICE, default=default, choices=environment_choices,
                 help=help or "Where the joint lives; sets the allowed potential difference.",
                 source="data/environments.csv")


def cite_potential(row):
    """Citation of an alloy's galvanic-series potential range."""
    return data.cite(row)


def cite_density(row):
    return data.cite(row, "density_")


def cite_ew(row):
    """Citation of an alloy's equivalent weight (None for graphite: no EW)."""
    if not row.get("ew_source_id"):
        return None
    return data.cite(row, "ew_")


def cite_allowed(env_row):
    """Citation of an environment's allowed potential difference."""
    c = data.cite(env_row, "allowed_")
    c["text"] += f" — {env_row['allowed_basis']}"
    return c


def cite_anodic_index(row):
    if not row.get("ai_source_id"):
        return None
    return data.cite(row, "ai_")
