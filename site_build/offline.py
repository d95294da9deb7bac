"""Stage: the static files and what makes the site work offline.

``site_src/static/*`` goes to ``site/static/`` (the fast start's folder
``static/engine/faststart/`` only when the site has a fast start), except
``sw.js`` and ``manifest.webmanifest``, which go to the site root: the
service worker's scope is the folder it is served from, and the web-app
manifest's ``start_url`` is resolved against its own URL. Then
``build-manifest.json`` lists every file with sha256 and size, and its
content hash names the service worker's cache (``sw.js`` gets the file list
in place of its marker).
"""

from __future__ import annotations

import hashlib
import json
import shutil
from pathlib import Path

from .common import BuildError, sha256_file
from .names import NAMES
from .paths import CORE, DATA, HERE, MANIFEST_NAME, PINS, ROOT, SITE_SRC, STATIC, project_meta

SW_NAME = "sw.js"
SW_MARKER = '"__NOBLEGAP_BUILD__"'
ROOT_STATIC = {"sw.js", "manifest.webmanifest"}
FASTSTART_STATIC = "engine/faststart"


def input_files() -> list[Path]:
    """Every file whose content the built site depends on (never tests/)."""
    files = [ROOT / "build.py", ROOT / "requirements-core.txt", ROOT / "pyproject.toml"]
    for base in (CORE / "noblegap", DATA, SITE_SRC, PINS, HERE):
        if base.exists():
            for p in base.rglob("*"):
                if p.is_file() and "__pycache__" not in p.parts and p.suffix != ".pyc":
                    files.append(p)
    return sorted(set(files))


def inputs_digest(options: dict) -> str:
    """sha256 over the build options and the paths and contents of :func:`input_files`."""
    h = hashlib.sha256(json.dumps(options, sort_keys=True).encode() + b"\n")
    for p in input_files():
        h.update(p.relative_to(ROOT).as_posix().encode() + b"\0")
        h.update(sha256_file(p).encode() + b"\n")
    return h.hexdigest()


def site_is_current(site: Path, options: dict) -> bool:
    """True when ``site`` was built from exactly the current inputs with ``options``."""
    manifest = site / MANIFEST_NAME
    if not manifest.exists():
        return False
    try:
        return json.loads(manifest.read_text()).get("inputs") == inputs_digest(options)
    except ValueError:
        return False


def copy_static(site: Path, faststart: bool) -> None:
    for p in sorted(STATIC.rglob("*")):
        if not p.is_file() or p.name.startswith("."):
            continue
        rel = p.relative_to(STATIC)
        if rel.as_posix() == SW_NAME:
            continue
        if not faststart and rel.as_posix().startswith(FASTSTART_STATIC + "/"):
            continue
        dest = site / rel if rel.as_posix() in ROOT_STATIC else site / "static" / rel
        dest.parent.mkdir(parents=True, exist_ok=True)
        shutil.copyfile(p, dest)
    # data/examples/*.csv: templates a user downloads (the joint schedule's).
    for p in sorted((DATA / "examples").glob("*.csv")):
        (site / "examples").mkdir(exist_ok=True)
        shutil.copyfile(p, site / "examples" / p.name)


def write_manifest_and_sw(site: Path, inputs: str, pin: dict,
                          twins: dict[str, dict[str, str]] | None = None) -> dict:
    """build-manifest.json, and sw.js with the files to precache.

    ``twins`` maps a plain file to {"packed": its gzip twin, "sha256": the
    plain bytes' sha256} (the fast start's pre-compressed runtime and
    snapshot): the service worker precaches the twin only and keeps the plain
    file by unpacking it once, checked against that sha256, so no byte is
    downloaded twice.
    """
    twins = twins or {}
    files = {}
    for p in sorted(site.rglob("*")):
        rel = p.relative_to(site).as_posix()
        if p.is_file() and rel not in (MANIFEST_NAME, SW_NAME):
            files[rel] = {"sha256": sha256_file(p), "size": p.stat().st_size}
    content = hashlib.sha256(
        "".join(f"{k}\0{v['sha256']}\n" for k, v in files.items()).encode()
    ).hexdigest()
    version = project_meta()["version"]
    cache_name = f"noblegap-{version}-{content[:16]}"
    manifest = {
        "name": "noblegap",
        "version": version,
        "pyodide": pin["version"],
        "inputs": inputs,
        "content_sha256": content,
        "cache": cache_name,
        "files": files,
    }
    text = (STATIC / SW_NAME).read_text()
    if text.count(SW_MARKER) != 1:
        raise BuildError(f"site_src/static/{SW_NAME} must contain {SW_MARKER} exactly once")
    build = {"cache": cache_name, "files": sorted(set(files) - set(twins)), "unpack": twins,
             "checked_header": NAMES["checked_header"]}
    (site / SW_NAME).write_text(text.replace(SW_MARKER, json.dumps(build, separators=(",", ":"))))
    (site / MANIFEST_NAME).write_text(json.dumps(manifest, indent=1) + "\n")
    return manifest
