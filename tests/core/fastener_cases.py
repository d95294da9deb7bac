"""A table of fastener/plate cases with the expected anode, class and rate band.

Expected anodes and classes follow from the galvanic series (ASTM G82 ranges in
data/alloys.csv) and the area rule; the rate bands are order-of-magnitude
regression pins on data that are partly from memory (the oxygen limiting
current densities in data/environments.csv), not published checks.
"""

# (id, inputs, expected anode member, expected anode alloy id, class, rate band mm/yr)
CASES = [
    # Stainless screws in an aluminium deck plate, splash zone: aluminium is
    # ~0.7-1.0 V below passive 316, beyond the 0.15 V harsh-class limit. In a
    # thin film only a 10 mm band of plate around each screw works as anode, so
    # the plate's size does not dilute the attack: the band corrodes fast.
    ("ss_screws_in_aluminium", dict(
        fastener="S31600", plate="A95083", environment="marine_splash",
        fastener_kind="screw", diameter="6 mm", count="24",
        plate_area="1.2 m * 0.8 m", thickness="5 mm"),
     "plate", "A95083", "reject", (0.5, 20.0)),
    # Aluminium rivets in a stainless sheet: small anode, large cathode — the
    # worst arrangement of the area rule; the rivets go in weeks to months.
    ("al_rivets_in_stainless", dict(
        fastener="A96061", plate="S31600", environment="marine_splash",
        fastener_kind="rivet", diameter="4 mm", count="40",
        plate_area="0.5 m**2", thickness="2 mm"),
     "fastener", "A96061", "reject", (5.0, 100.0)),
    # Carbon-steel bolts in a 90-10 copper-nickel flange in flowing seawater:
    # steel is 0.3-0.5 V below the copper-nickel and the flange face is several
    # times the bolts' area, so the bolts waste quickly.
    ("cs_bolts_in_cuni_flange", dict(
        fastener="carbon steel", plate="C70600", environment="seawater_flowing",
        fastener_kind="bolt", diameter="16 mm", count="8",
        plate_area="0.15 m**2", thickness="20 mm"),
     "fastener", "carbon_steel", "reject", (1.0, 30.0)),
    # Titanium fasteners in a carbon-steel plate, still seawater: ΔV is large
    # but the steel anode is huge next to the few small titanium cathodes, so
    # the couple adds little to the steel's own corrosion — the mild case.
    ("ti_fasteners_in_steel", dict(
        fastener="R50400", plate="carbon steel", environment="seawater_quiescent",
        fastener_kind="bolt", diameter="12 mm", count="10",
        plate_area="2 m**2", thickness="12 mm"),
     "plate", "carbon_steel", "watch", (0.05, 0.5)),
    # Galvanized bolts in a tin-bronze fitting: zinc is ~0.7 V below bronze and
    # the bolts are small next to the fitting: the zinc (then the steel) goes.
    ("galvanized_bolts_in_bronze", dict(
        fastener="galvanized", plate="tin bronze", environment="seawater_quiescent",
        fastener_kind="bolt", diameter="10 mm", count="4",
        plate_area="0.05 m**2", thickness="8 mm"),
     "fastener", "galvanized_steel", "reject", (0.3, 10.0)),
]
