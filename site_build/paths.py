"""Where the build reads from and writes to, and the pins it reads."""

from __future__ import annotations

import json
import os
import re
import tomllib
from pathlib import Path

from .common import BuildError

ROOT = Path(__file__).absolute().parent.parent
HERE = ROOT / "site_build"
CORE = ROOT / "core"
DATA = ROOT / "data"
SITE_SRC = ROOT / "site_src"
TEMPLATES = SITE_SRC / "templates"
STATIC = SITE_SRC / "static"
PINS = ROOT / "pins"
SITE = ROOT / "site"
CACHE = Path(os.environ.get("NOBLEGAP_CACHE", ROOT / ".cache"))

# Where the build writes inside the site; the engine reads them from names.json.
PACKAGES_DIR = "packages"
PYODIDE_DIR = "pyodide"
MANIFEST_NAME = "build-manifest.json"


def load_pyodide_pin() -> dict:
    return json.loads((PINS / "pyodide.json").read_text())


def load_wheel_pins() -> dict:
    return json.loads((PINS / "wheels.json").read_text())["wheels"]


def core_requirements() -> list[tuple[str, str]]:
    """(name, version) for each ``name==version`` line of requirements-core.txt."""
    reqs = []
    for raw in (ROOT / "requirements-core.txt").read_text().splitlines():
        line = raw.split("#", 1)[0].strip()
        if not line:
            continue
        m = re.fullmatch(r"([A-Za-z0-9][A-Za-z0-9._-]*)==([A-Za-z0-9.+!-]+)", line)
        if not m:
            raise BuildError(f"requirements-core.txt: {raw!r} is not an exact 'name==version' pin")
        reqs.append((m.group(1), m.group(2)))
    return reqs


def project_meta() -> dict:
    return tomllib.loads((ROOT / "pyproject.toml").read_text())["project"]
