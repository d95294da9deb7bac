"""Tables of the galvanic-cell model: electrolytes, atmospheres, kinetics.

* ``data/electrolytes.csv`` — immersion environments: how the conductivity is
  found (``pss78`` from salinity and temperature, or a measured ``range``) and
  the oxygen limiting current density, each as low / likely / high.
* ``data/atmospheres.csv`` — the corrosivity categories C1 … CX of ISO 9223
  with a typical time of wetness, the electrolyte film (thickness and
  conductivity) and the standard's first-year rates for carbon steel, zinc,
  copper and aluminium. ``aliases`` lists older environment ids that now open
  the category, so old links keep working.
* ``data/cell_kinetics.csv`` — polarization parameters by alloy id (``match``
  lists ids separated by ``;``) or by galvanic-series family
  (``family:<family>`` or ``family:<family>:<state>``).

Every environment names a ``series_env``: the row of ``data/environments.csv``
whose galvanic-series use and allowed potential difference apply.
"""

from __future__ import annotations

from functools import lru_cache

from . import alloys, data
from ..errors import ChoiceError, MissingDataError, suggest

IMMERSION, ATMOSPHERIC = "immersion", "atmospheric"
CASES = ("low", "likely", "high")
#: ISO 9223 first-year rate columns by the family of alloys they bound.
ISO_FAMILIES = {"steel": "steel", "cast iron": "steel", "zinc": "zinc",
                "zinc-coated steel": "zinc", "copper": "copper", "aluminium": "aluminium"}
#: Density of aluminium [g/cm³] to turn the standard's g/(m²·a) into µm/a
#: (CRC 80th ed. value 2.6989 as reproduced in the periodictable package).
AL_DENSITY_G_CM3 = 2.6989

_validated = False


def _ensure_valid():
    global _validated
    if not _validated:
        from . import validate
        validate.validate_tables(("electrolytes", "atmospheres", "cell_kinetics"))
        _validated = True


def environments():
    """Every cell environment as ``[(id, name, kind)]``, immersion first."""
    _ensure_valid()
    out = [(r["id"], r["name"], IMMERSION) for r in data.table("electrolytes")]
    out += [(r["id"], r["name"], ATMOSPHERIC) for r in data.table("atmospheres")]
    return out


def environment_choices():
    return [(i, n) for i, n, _ in environments()]


def resolve_environment(text, field="environment"):
    """Map an environment id or an old alias (``marine_splash`` → ``CX``) to an id."""
    return _resolve(str(text or "").strip(), field)


@lru_cache(maxsize=64)
def _resolve(key, field):
    _ensure_valid()
    text = key
    ids = {i.lower(): i for i, _, _ in environments()}
    if key.lower() in ids:
        return ids[key.lower()]
    for r in data.table("atmospheres"):
        if key.lower() in [a.strip().lower() for a in r["aliases"].split(";") if a.strip()]:
            return r["id"]
    raise ChoiceError(f"Unknown environment {key!r}.", field=field, value=text,
                      allowed=", ".join(ids.values()), suggestions=suggest(key, list(ids.values())))


def environment(env_id):
    """The row of a cell environment with ``kind`` added (immersion/atmospheric)."""
    env_id = resolve_environment(env_id)
    idx = data.index("electrolytes")
    if env_id in idx:
        return dict(idx[env_id], kind=IMMERSION)
    return dict(data.index("atmospheres")[env_id], kind=ATMOSPHERIC)


def series_environment(env_id):
    """The ``data/environments.csv`` row whose series use and allowed ΔV apply."""
    return alloys.environment(environment(env_id)["series_env"])


def triple(row, stem, suffix):
    """(low, likely, high) of columns ``stem_low_suffix``, ``stem_suffix``, ``stem_high_suffix``."""
    return (row[f"{stem}_low_{suffix}"], row[f"{stem}_{suffix}"], row[f"{stem}_high_{suffix}"])


#: ``match`` of the row whose cathodic constants (``SHARED_COLUMNS``) apply to
#: every metal whose own row leaves them blank.
SHARED_MATCH = "shared"
SHARED_COLUMNS = ("b_c_mV_per_decade", "i0_H_A_m2")


@lru_cache(maxsize=256)
def kinetics_row(alloy_id):
    """The ``data/cell_kinetics.csv`` row for an alloy: by id, then family and state.

    ``match`` lists alloy ids and families (``family:<family>`` or
    ``family:<family>:<state>``) separated by ``;``. A blank cathodic constant
    (:data:`SHARED_COLUMNS`) is taken from the ``shared`` row, so that one
    value applied to every metal is stated, and sourced, once.

    Raises
    ------
    MissingDataError
        No row matches (names the alloy and the families the table covers).
    """
    _ensure_valid()
    row = alloys.alloy(alloy_id)
    rows = [r for r in data.table("cell_kinetics") if r["match"] != SHARED_MATCH]
    wanted = (alloy_id, f"family:{row['family']}:{row['state']}", f"family:{row['family']}")
    for key in wanted:
        for r in rows:
            if key in r["match"].split(";"):
                return _with_shared(r)
    raise MissingDataError(
        f"No polarization data for {row['name']} ({alloy_id}) in the polarization table, "
        "so its rate cannot be computed.", field="alloy", value=alloy_id,
        allowed="an alloy whose family has a row: "
                + ", ".join(sorted({r['match'] for r in rows})))


def shared_kinetics():
    """The ``shared`` row of ``data/cell_kinetics.csv`` (cathodic constants of every metal)."""
    _ensure_valid()
    for r in data.table("cell_kinetics"):
        if r["match"] == SHARED_MATCH:
            return r
    raise MissingDataError("The polarization table has no shared row of cathodic constants.",
                           field="cell_kinetics", value="", allowed="a row with match "
                           f"{SHARED_MATCH!r}")


def kinetics_cite(row, role=None):
    """One citation for every value of a kinetics row the model uses.

    ``row`` is a :func:`kinetics_row` result. The own current density cites
    the row's own source; the breakdown potential its ``eb_`` source; the
    anodic slope its ``ba_`` source where the model uses it (an active metal,
    or a passive one with a breakdown potential); the oxygen-reduction slope and hydrogen
    exchange current the ``shared`` row where the metal's row leaves them blank.
    The text joins the three; ``confidence`` is the weakest of them, so that a
    headline never shows a firmer grade than its least certain input.

    ``role="cathode"``: the cathode of a couple is polarised below its
    free-corrosion potential, where a passive metal dissolves at its passive
    current (:class:`noblegap.methods.cell.Electrode`); its anodic slope and
    breakdown potential then enter no number and are not cited. An active
    cathode's dissolution still follows its anodic slope, which stays cited.
    """
    own = data.index("cell_kinetics")[row["id"]]
    parts = [("", _kinetics_part(own))]
    flat = role == "cathode" and row["mode"] == "passive"
    if row["b_a_mV_per_decade"] is not None and not flat:
        parts.append(("anodic slope: ", _kinetics_part(own, "ba_")))
    if row["E_b_V_SCE"] is not None and not flat:
        parts.append(("breakdown potential: ", _kinetics_part(own, "eb_")))
    if any(own[c] is None for c in SHARED_COLUMNS):
        parts.append(("shared by every metal: ", _kinetics_part(shared_kinetics())))
    weakest = max((p["confidence"] for _, p in parts), key=data.CONFIDENCE.index)
    text = "; ".join(f"{label}{p['text']}" for label, p in parts)
    return {"source_id": parts[0][1]["source_id"], "text": text, "confidence": weakest}


def _kinetics_part(row, prefix=""):
    """One part of :func:`kinetics_cite`: the full citation of a sourced value; for a
    recalled one only what was recalled, marked "from memory" (the generic
    from-memory source's wording would be repeated once per part)."""
    cited = data.cite(row, prefix)
    if cited["confidence"] != "from-memory":
        return cited
    locator = (row.get(f"{prefix}locator") or "").strip()
    vague = not locator or locator.lower().startswith("recalled")
    return dict(cited, text="from memory" if vague else f"{locator} (from memory)")


def _with_shared(r):
    if all(r[c] is not None for c in SHARED_COLUMNS):
        return r
    shared = shared_kinetics()
    return dict(r, **{c: shared[c] for c in SHARED_COLUMNS if r[c] is None})


def iso_band_um_per_yr(env_id, alloy_id):
    """ISO 9223 first-year rate band (low, high) [µm/yr] of the alloy's family, or None.

    ``high`` is None where the standard gives no upper limit (aluminium in CX:
    "> 10 g/(m²·a)"); the band is then open above. A band of (0, 0) is the
    standard's "negligible" (aluminium in C1).
    """
    env = environment(env_id)
    if env["kind"] != ATMOSPHERIC:
        return None
    key = ISO_FAMILIES.get(alloys.alloy(alloy_id)["family"])
    if key is None:
        return None
    if key == "aluminium":
        lo, hi = env["aluminium_low_g_m2_per_yr"], env["aluminium_high_g_m2_per_yr"]
        return lo / AL_DENSITY_G_CM3, (None if hi is None else hi / AL_DENSITY_G_CM3)
    return env[f"{key}_low_um_per_yr"], env[f"{key}_high_um_per_yr"]


def bound_by_band(rate, band):
    """``rate`` held within ``band`` (low, high); a high of None leaves it open above.

    >>> bound_by_band(5.0, (1.0, 2.0)), bound_by_band(5.0, (1.0, None))
    (2.0, 5.0)
    """
    low, high = band
    rate = max(rate, low)
    return rate if high is None else min(rate, high)


def cite_env(env_id, alloy_id=None):
    """Citations of a cell environment's rows (conductivity, i_L, wetness, rates).

    ``iso_rates`` cites the first-year band of ``alloy_id``'s family where the
    table gives that family its own source (steel, zinc), else the row's.
    """
    env = environment(env_id)
    if env["kind"] == IMMERSION:
        return {"conductivity": data.cite(env), "i_L": data.cite(env, "iL_")}
    key = ISO_FAMILIES.get(alloys.alloy(alloy_id)["family"]) if alloy_id else None
    prefix = f"{key}_" if key and env.get(f"{key}_source_id") else ""
    return {"wetness": data.cite(env, "tow_"), "film": data.cite(env, "film_"),
            "iso_rates": data.cite(env, prefix)}
