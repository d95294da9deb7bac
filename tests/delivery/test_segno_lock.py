"""The QR library of the printed check sheet ships with the site but stays out of the engine's start."""

import json

from _site import ensure_site

from site_build.names import NAMES
from site_build.paths import PACKAGES_DIR


def test_the_site_ships_segno_but_the_engine_start_does_not_load_it():
    lock = json.loads((ensure_site() / PACKAGES_DIR / NAMES["lock_file"]).read_text())
    assert "segno" in lock["packages"]

    def closure(name, seen):
        if name not in seen:
            seen.add(name)
            for dep in lock["packages"][name]["depends"]:
                closure(dep, seen)
        return seen

    # The worker loads "noblegap" and its depends at start; segno only on the first sheet.
    assert "segno" not in closure("noblegap", set())
