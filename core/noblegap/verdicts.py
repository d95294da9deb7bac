"""The one verdict vocabulary of every page.

A verdict judges a joint (or a couple) against its service: three classes,
each with one label a user reads on every page, in the link and on a printed
sheet. Calculators pass a class; the label and its meaning come from here, so
the same pair can never be "reject" on one page and "incompatible" on another.

>>> label(AVOID)
'Avoid'
>>> worst([OK, CAUTION])
'caution'
"""

from __future__ import annotations

OK, CAUTION, AVOID = "ok", "caution", "avoid"
CLASSES = (OK, CAUTION, AVOID)

LABEL = {OK: "Acceptable", CAUTION: "Needs care", AVOID: "Avoid"}
MEANING = {
    OK: "no galvanic action worth designing for, or the loss stays inside the allowance "
        "over the design life",
    CAUTION: "galvanic action is real: the joint needs one of the mitigations listed, or "
             "inspection, to last its design life",
    AVOID: "the anode loses its allowance inside the design life, or the potential "
           "difference is beyond what the environment tolerates: change the design",
}
RANK = {OK: 0, CAUTION: 1, AVOID: 2}


def label(cls):
    """The user-facing word for verdict class ``cls`` (KeyError if unknown)."""
    return LABEL[cls]


def worst(classes):
    """The most severe of ``classes`` (``OK`` for none)."""
    return max(classes, key=RANK.__getitem__, default=OK)
