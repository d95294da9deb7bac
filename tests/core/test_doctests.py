"""The docstring examples of the core and of the site build run as tests.

Each module's examples are one test, so a failing example names its module.
The site build's examples need no built site.
"""

import doctest
import importlib
import sys
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[2]
if str(ROOT) not in sys.path:
    sys.path.insert(0, str(ROOT))

# Modules that run under Node or need a Pyodide tree are left to their own tests.
SKIP = {"site_build.faststart.stdlib_closure"}


def _modules(package_dir, prefix):
    for path in sorted(package_dir.rglob("*.py")):
        if "__pycache__" in path.parts:
            continue
        rel = path.relative_to(package_dir).with_suffix("")
        parts = [p for p in rel.parts if p != "__init__"]
        name = ".".join([prefix, *parts])
        if name not in SKIP:
            yield name


MODULES = list(_modules(ROOT / "core" / "noblegap", "noblegap")) + list(
    _modules(ROOT / "site_build", "site_build"))


def test_the_list_holds_the_core_and_the_build():
    assert "noblegap.verdicts" in MODULES and "noblegap.api" in MODULES
    assert any(m.startswith("site_build") for m in MODULES)


@pytest.mark.parametrize("name", MODULES)
def test_docstring_examples(name):
    module = importlib.import_module(name)
    result = doctest.testmod(module, optionflags=doctest.ELLIPSIS | doctest.NORMALIZE_WHITESPACE)
    assert result.failed == 0, f"{result.failed} of {result.attempted} examples fail in {name}"
