"""static/engine/faststart/restore.mjs (as built into site/) under Node,
against independent Python code: its data segment reader (the base of the
snapshot) and its reading of a container written by
site_build/faststart/container.py (the files, and Pyodide's memory rebuilt)."""

from __future__ import annotations

import hashlib
import json
import os
import shutil
import subprocess
from pathlib import Path

import pytest

from _site import ensure_site
from site_build.faststart.container import SNAPSHOT_PAGE, snapshot_container


def node(script: str, tmp_path: Path) -> dict:
    if shutil.which("node") is None:
        if os.environ.get("CI"):
            pytest.fail("node is required in CI")
        pytest.skip("node is not installed")
    restore = ensure_site() / "static" / "engine" / "faststart" / "restore.mjs"
    names = ensure_site() / "static" / "engine" / "names.json"
    path = tmp_path / "probe.mjs"
    path.write_text(f'import * as R from {json.dumps(restore.as_uri())};\n'
                    f'import NAMES from {json.dumps(names.as_uri())} with {{ type: "json" }};\n' + script)
    proc = subprocess.run(["node", str(path)], capture_output=True, text=True, timeout=120)
    assert proc.returncode == 0, proc.stderr
    return json.loads(proc.stdout.strip().splitlines()[-1])


SEGMENTS = """
import { readFileSync } from "node:fs";
const wasm = new Uint8Array(readFileSync(process.env.WASM));
const image = R.dataSegmentsImage(wasm);
const cut = R.dataSegmentsImage(wasm, 4096);
console.log(JSON.stringify({size: image.length, sha: await R.sha256Hex(image),
  cutSha: await R.sha256Hex(cut), cutSize: cut.length}));
"""


def test_data_segments_image_of_the_pinned_runtime(tmp_path):
    from test_faststart import _wasm_data_segments

    wasm_path = ensure_site() / "pyodide" / "pyodide.asm.wasm"
    wasm = wasm_path.read_bytes()
    segments = _wasm_data_segments(wasm)
    end = max(offset + len(chunk) for offset, chunk in segments)
    image = bytearray(end)
    for offset, chunk in segments:
        image[offset:offset + len(chunk)] = chunk
    os.environ["WASM"] = str(wasm_path)
    try:
        got = node(SEGMENTS, tmp_path)
    finally:
        del os.environ["WASM"]
    assert got["size"] == (end + 4095) // 4096 * 4096
    image += bytes(got["size"] - end)
    assert got["sha"] == hashlib.sha256(image).hexdigest()
    assert (got["cutSize"], got["cutSha"]) == (4096, hashlib.sha256(image[:4096]).hexdigest())


APPLY = """
import { readFileSync } from "node:fs";
const data = new Uint8Array(readFileSync(new URL("container.bin", import.meta.url)));
// a runtime's memory: the base with junk in its gaps, and more memory after it
const live = new Uint8Array(readFileSync(new URL("live.bin", import.meta.url)));
const size = Number(process.env.MEMORY_SIZE);
const parsed = R.parseSnapshot(data, size, NAMES.faststart);
const target = new Uint8Array(size);
R.applyPages(parsed, target);
const base = R.baseFromMemory(live.buffer, parsed);
const baseOk = (await R.sha256Hex(base)) === parsed.header.base.sha256;
R.applyBase(parsed, target, base);
const files = parsed.files.map(([name, data]) => [name, Buffer.from(data).toString("latin1")]);
// the same container with one file name changed (same length)
function relabel(bytes, from, to) {
  const text = Buffer.from(bytes).toString("latin1").replace(from, to);
  return new Uint8Array(Buffer.from(text, "latin1"));
}
const errors = {};
for (const [name, bytes, memorySize] of [
  ["wrong size", data, size + 4],
  ["bad magic", Uint8Array.from([...data.subarray(0, 7), 0x21, ...data.subarray(8)]), size],
  ["truncated", data.subarray(0, data.length - 100), size],
  ["bad path", relabel(data, "ab/x.py", "../x.py"), size],
]) {
  try { R.parseSnapshot(bytes, memorySize, NAMES.faststart); errors[name] = null; } catch (err) { errors[name] = err.message; }
}
const runs = [[0, 3], [10, 4096], [5000, 5001]];
const roundTrip = R.decodeRuns(R.encodeRuns(runs), 6000);
console.log(JSON.stringify({sha: await R.sha256Hex(target), baseOk, files, errors, roundTrip,
  gaps: parsed.gaps}));
"""


def test_apply_snapshot_rebuilds_the_memory_build_py_packed(tmp_path):
    import random

    rng = random.Random(7)
    page = SNAPSHOT_PAGE
    # a base of 5 pages: "segments" with gaps between them
    base = bytearray(5 * page)
    gaps, at = [], 0
    while at < len(base) - 200:
        seg = min(rng.randrange(20, 900), len(base) - 100 - at)
        base[at:at + seg] = bytes(rng.randrange(1, 256) for _ in range(seg))
        gap = rng.randrange(1, 40)
        gaps.append((at + seg, min(len(base), at + seg + gap)))
        at += seg + gap
    gaps.append((at, len(base)))
    base = bytes(base)
    heap = bytearray(base) + bytearray(11 * page + 50)
    for _ in range(400):                       # scattered edits, some over the base
        at = rng.randrange(len(heap) - 64)
        heap[at:at + rng.randrange(1, 64)] = bytes(rng.randrange(256) for _ in range(64))[:rng.randrange(1, 64)]
    heap = bytes(heap[:len(base) + 11 * page + 50])
    prefix = b"snp\0" + (128).to_bytes(4, "little") + bytes(range(120))
    memory = prefix + heap
    memory += bytes(-len(memory) % 4)
    encoded = bytearray()
    end = 0
    for start, stop in gaps:
        for value in (start - end, stop - start):
            while True:
                byte, value = value & 0x7F, value >> 7
                encoded.append(byte | (0x80 if value else 0))
                if not value:
                    break
        end = stop
    files = {"ab/x.py": b"print(1)\n", "ab/y.pyc": b"imported", "ab/z.csv": b"a,b\n1,2\n"}
    data = snapshot_container(files, memory, base, bytes(encoded), {"version": "0"}, imported=["ab/y.pyc"])
    (tmp_path / "container.bin").write_bytes(data)
    live = bytearray(base) + bytes(rng.randrange(256) for _ in range(3 * page))
    for start, stop in gaps:                    # what a runtime may write before Python starts
        live[start:stop] = bytes(rng.randrange(256) for _ in range(stop - start))
    (tmp_path / "live.bin").write_bytes(bytes(live))
    os.environ["MEMORY_SIZE"] = str(len(memory))
    try:
        got = node(APPLY, tmp_path)
    finally:
        del os.environ["MEMORY_SIZE"]
    assert got["baseOk"]
    assert [tuple(g) for g in got["gaps"]] == gaps
    assert got["sha"] == hashlib.sha256(memory).hexdigest()
    assert got["files"] == [["ab/x.py", "print(1)\n"], ["ab/z.csv", "a,b\n1,2\n"]]
    assert "sidecar says" in got["errors"]["wrong size"]
    assert "bad magic" in got["errors"]["bad magic"]
    assert "header says" in got["errors"]["truncated"]
    assert "bad file" in got["errors"]["bad path"]
    assert got["roundTrip"] == [[0, 3], [10, 4096], [5000, 5001]]
