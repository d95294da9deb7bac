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

def pytest_ignore_collect(collection_path, config):
    """The doctest collector (``--doctest-modules``, pyproject.toml) would
    import every conftest.py as a module named ``conftest``; they are loaded
    as conftests, never collected."""
    return True if collection_path.name == "conftest.py" else None
