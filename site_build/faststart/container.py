"""The snapshot container: writer (the reader is static/engine/faststart/restore.mjs).

FORMAT.md beside this file describes the layout.
"""

from __future__ import annotations

import hashlib
import json

from ..common import BuildError
from . import FASTSTART_NAMES

SNAPSHOT_FORMAT = FASTSTART_NAMES["format"]
SNAPSHOT_MAGIC = FASTSTART_NAMES["magic"].encode()

# 4 KiB: the memory's zero runs are often shorter than 64 KiB (and free heap
# blocks are zeroed before the save), so the container unpacks ~2 MB less.
SNAPSHOT_PAGE = FASTSTART_NAMES["page_size"]


def _xor(a: bytes, b: bytes) -> bytes:
    return (int.from_bytes(a, "little") ^ int.from_bytes(b, "little")).to_bytes(len(a), "little")


def snapshot_container(files: dict[str, bytes], memory: bytes, base: bytes, gaps: bytes, pin: dict,
                        imported: list[str] = ()) -> bytes:
    """MAGIC, u32 header length, header JSON, Pyodide's header, gap list, files, padding, heap pages.

    ``memory`` is Pyodide's memory snapshot (its own header, then the whole
    heap); ``base`` the runtime's heap when it was instantiated, before
    Python ran (FORMAT.md describes the format). Each heap page is
    stored XOR the same page of the base (zeros past the base), and pages
    that come out all zero are left out (``memory_runs`` lists the [first
    page, count] runs kept). ``files`` are stored except ``imported``, the
    compiled modules imported before the memory was saved, which Python never
    reads again.
    """
    page = SNAPSHOT_PAGE
    prefix_size = int.from_bytes(memory[4:8], "little")
    if prefix_size % 4 or not 12 <= prefix_size < len(memory):
        raise BuildError(f"Pyodide's snapshot header is {prefix_size} bytes: not a snapshot this build knows")
    heap = memory[prefix_size:]
    zero = bytes(page)
    if len(base) % page:
        raise BuildError(f"the base image is {len(base)} bytes, not a whole number of {page}-byte pages")
    base_pages = len(base) // page
    if len(base) > len(heap):
        raise BuildError("the runtime's initial heap is larger than the snapshot's")
    runs: list[list[int]] = []
    kept = []
    for i in range(0, (len(heap) + page - 1) // page):
        chunk = heap[i * page:(i + 1) * page].ljust(page, b"\0")
        if i < base_pages:
            chunk = _xor(chunk, base[i * page:(i + 1) * page])
        if chunk == zero:
            continue
        kept.append(chunk)
        if runs and runs[-1][0] + runs[-1][1] == i:
            runs[-1][1] += 1
        else:
            runs.append([i, 1])
    prefix = memory[:prefix_size]
    left_out = set(imported)
    if not left_out <= set(files):
        raise BuildError(f"imported files not among the package files: {sorted(left_out - set(files))[:3]}")
    stored = {name: data for name, data in files.items() if name not in left_out}
    total = sum(len(d) for d in stored.values())
    offset = 0
    while True:
        header = json.dumps({
            "format": SNAPSHOT_FORMAT, "pyodide": pin["version"],
            "files": [[name, len(data)] for name, data in stored.items()],
            "imported": sorted(left_out),
            "prefix_size": prefix_size, "memory_offset": offset, "memory_size": len(memory),
            "page_size": page,
            "base": {"size": len(base), "sha256": hashlib.sha256(base).hexdigest(), "gaps_size": len(gaps)},
            "memory_runs": runs,
        }, separators=(",", ":")).encode()
        start = 12 + len(header) + prefix_size + len(gaps) + total
        aligned = (start + 15) // 16 * 16
        if aligned == offset:
            break
        offset = aligned
    parts = [SNAPSHOT_MAGIC, len(header).to_bytes(4, "little"), header, prefix, gaps, *stored.values(),
             b"\0" * (offset - start), *kept]
    return b"".join(parts)
