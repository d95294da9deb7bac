"""What every stage uses: the build's error, its log line, a file's sha256."""

from __future__ import annotations

import hashlib
import re
import sys
from pathlib import Path


class BuildError(RuntimeError):
    """A build stage failed; the message says which and what to do."""


def log(msg: str) -> None:
    print(f"build: {msg}", file=sys.stderr, flush=True)


def sha256_file(path: Path) -> str:
    h = hashlib.sha256()
    with open(path, "rb") as f:
        for block in iter(lambda: f.read(1 << 20), b""):
            h.update(block)
    return h.hexdigest()


def normalize(name: str) -> str:
    """PEP 503 name: lower case, runs of ``-_.`` become one ``-``.

    >>> normalize("Typing_Extensions")
    'typing-extensions'
    """
    return re.sub(r"[-_.]+", "-", name).lower()
