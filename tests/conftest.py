"""Shared test setup: import the core from this checkout."""

import sys
from pathlib import Path

CORE = Path(__file__).resolve().parents[1] / "core"
if str(CORE) not in sys.path:
    sys.path.insert(0, str(CORE))

# Hypothesis' per-example deadline measures wall time, which on a shared
# 2-core machine depends on what else runs; properties are checked, not speed
# (speed is measured in bench/). A profile without the deadline, for every test.
from hypothesis import settings  # noqa: E402

settings.register_profile("noblegap", deadline=None)
settings.load_profile("noblegap")
