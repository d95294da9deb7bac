// The pieces of the snapshot start that do not need Pyodide: the snapshot
// container and the runtime's data segments it is a delta against.
//
// Used by static/engine.mjs (browser worker and Node parity runner) and by
// tools/make_snapshot.mjs (the build), so both read and write the same way.
//
// Container (after gunzip), format 2:
//
//   "NGSNAP02", u32 LE header length, header JSON,
//   the first prefix_size bytes of Pyodide's memory snapshot (its own header),
//   the package files of header.files, back to back,
//   zero padding to a multiple of 16,
//   the stored pages of the WebAssembly heap.
//
// Pyodide's snapshot is its header followed by the whole heap. Much of that
// heap is still what the runtime starts with: the WebAssembly module's data
// segments (~3 MB), which are in pyodide.asm.wasm and so downloaded anyway.
// Each heap page is stored XOR the same page of that data segment image
// ("base"), and pages that come out all zero are left out
// (header.memory_runs lists the [first page, page count] runs kept). The
// build records the base's length and sha256 (header.base); the restore
// reads the data segments from the runtime binary it has just loaded
// (dataSegmentsImage) and refuses them unless the sha256 matches. (Not the
// live memory: the browser's runtime writes a few words before Python
// starts that Node's does not.)
//
// Package files: the container holds those the restored engine may still
// read (data tables, modules not imported yet, metadata), header.files
// [path, size]; the compiled modules imported before the save are left out
// (header.imported lists them): their code is in the memory and Python never
// reads their files again.

export const SNAPSHOT_FORMAT = 2;
export const SNAPSHOT_MAGIC = "NGSNAP02";

function hex(buffer) {
  return [...new Uint8Array(buffer)].map((b) => b.toString(16).padStart(2, "0")).join("");
}

export async function sha256Hex(data) {
  const bytes = typeof data === "string" ? new TextEncoder().encode(data) : data;
  return hex(await crypto.subtle.digest("SHA-256", bytes));
}

const isInt = (n) => Number.isSafeInteger(n) && n >= 0;

/**
 * Check a decompressed container and split it into {header, prefix, files, pages}.
 * memorySize is the size the (already checked) sidecar gives; nothing is
 * written anywhere: applySnapshot() does that once the base is at hand.
 */
export function parseSnapshot(bytes, memorySize) {
  const magic = new TextDecoder().decode(bytes.subarray(0, 8));
  if (magic !== SNAPSHOT_MAGIC) throw new Error("not a noblegap snapshot (bad magic)");
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const headerLength = view.getUint32(8, true);
  if (12 + headerLength > bytes.length) throw new Error("snapshot header is truncated");
  let header;
  try {
    header = JSON.parse(new TextDecoder().decode(bytes.subarray(12, 12 + headerLength)));
  } catch {
    throw new Error("snapshot header is not JSON");
  }
  const { prefix_size: prefixSize, page_size: pageSize, memory_size: size, memory_offset: at, base } = header;
  if (header.format !== SNAPSHOT_FORMAT) throw new Error(`snapshot container format ${header.format}`);
  if (![prefixSize, pageSize, size, at].every(isInt) || pageSize === 0 || prefixSize % 4 || pageSize % 4) {
    throw new Error("snapshot header has bad sizes");
  }
  if (size !== memorySize) throw new Error(`snapshot memory is ${size} bytes, its sidecar says ${memorySize}`);
  if (!base || !isInt(base.size) || base.size % pageSize || typeof base.sha256 !== "string") {
    throw new Error("snapshot header has no usable base");
  }
  const heapPages = Math.ceil((size - prefixSize) / pageSize);
  if (base.size > heapPages * pageSize) throw new Error("snapshot base is larger than its memory");
  let stored = 0;
  let end = 0;
  for (const run of header.memory_runs) {
    const [first, count] = run;
    if (!isInt(first) || !isInt(count) || first < end || first + count > heapPages) {
      throw new Error("snapshot lists bad memory pages");
    }
    end = first + count;
    stored += count;
  }
  const prefixEnd = 12 + headerLength + prefixSize;
  let offset = prefixEnd;
  const files = [];
  for (const entry of header.files) {
    const [path, fileSize] = entry;
    if (typeof path !== "string" || path.startsWith("/") || path.split("/").includes("..") || !isInt(fileSize)) {
      throw new Error(`snapshot lists a bad file ${JSON.stringify(path)}`);
    }
    files.push([path, bytes.subarray(offset, offset + fileSize)]);
    offset += fileSize;
  }
  if (offset > at || at % 16 || at + stored * pageSize !== bytes.length) {
    throw new Error(`snapshot is ${bytes.length} bytes, its header says ${at + stored * pageSize}`);
  }
  return {
    header,
    prefix: bytes.subarray(12 + headerLength, prefixEnd),
    files,
    pages: bytes.subarray(at),
  };
}

/**
 * Rebuild Pyodide's memory snapshot in target (zero-filled, memory_size
 * long): its header, then the heap = base XOR the stored pages. base is the
 * first header.base.size bytes of a freshly instantiated runtime's heap.
 */
export function applySnapshot({ header, prefix, pages }, target, base) {
  const { prefix_size: prefixSize, page_size: pageSize } = header;
  if (base.length !== header.base.size) throw new Error("snapshot base has the wrong size");
  target.set(prefix, 0);
  target.set(base, prefixSize);
  const heapEnd = target.length;
  const words = new Uint32Array(target.buffer, target.byteOffset, target.length >>> 2);
  const src = new Uint32Array(pages.buffer, pages.byteOffset, pages.length >>> 2);
  const baseEnd = prefixSize + base.length;
  let from = 0;
  for (const [first, count] of header.memory_runs) {
    const start = prefixSize + first * pageSize;
    const length = Math.min(count * pageSize, heapEnd - start);
    const xorEnd = Math.min(start + length, baseEnd);
    // Over the base: XOR, word by word (every offset here is a multiple of 4).
    for (let t = start >>> 2, s = from >>> 2, e = xorEnd >>> 2; t < e; t++, s++) words[t] ^= src[s];
    // Past the base the heap started as zeros: a plain copy.
    if (start + length > xorEnd) {
      const skip = Math.max(0, xorEnd - start);
      target.set(pages.subarray(from + skip, from + length), start + skip);
    }
    from += count * pageSize;
  }
}

/**
 * Watch how Pyodide loads its runtime binary (wasmURL), until release().
 *
 * bytes is a promise of that binary. In a browser Pyodide fetches it at
 * once but compiles it only after it has loaded and run pyodide.asm.mjs
 * (1.25 MB of JavaScript); here the compile starts as soon as the bytes
 * are in, in the background, and Pyodide's instantiateStreaming call is
 * answered with the module already compiled. Under Node Pyodide reads the file and calls
 * WebAssembly.instantiate with the bytes: the bytes of the instance that
 * exports Py_Version (Pyodide instantiates small probe modules too) are
 * the runtime's.
 */
export function captureRuntimeWasm(wasmURL = null) {
  const W = globalThis.WebAssembly;
  const original = {
    fetch: globalThis.fetch,
    instantiate: W.instantiate,
    instantiateStreaming: W.instantiateStreaming,
  };
  let resolveBytes;
  const bytes = new Promise((resolve) => (resolveBytes = resolve));
  let seen = null; // the response promise handed to Pyodide, and its compile
  const inBrowser = typeof location !== "undefined" && wasmURL !== null && original.instantiateStreaming;
  const isRuntime = (input) => {
    try {
      return new URL(String(input instanceof Request ? input.url : input), location).href === wasmURL;
    } catch {
      return false;
    }
  };
  if (inBrowser) {
    globalThis.fetch = function (input, init) {
      const response = original.fetch.call(this, input, init);
      if (seen !== null || !isRuntime(input)) return response;
      // Read whole (the browser drains the body off this thread) and
      // compiled in the background; no tee, whose two branches this
      // thread would have to pump while it is busy running pyodide.asm.mjs.
      const binary = response.then(async (r) => {
        if (!r.ok) throw new Error(`the runtime: HTTP ${r.status}`);
        return new Uint8Array(await r.arrayBuffer());
      });
      const compiled = binary.then((b) => W.compile(b));
      binary.then(resolveBytes, () => resolveBytes(null));
      compiled.catch(() => {});
      seen = { response, compiled };
      return response;
    };
    W.instantiateStreaming = function (source, imports) {
      if (seen === null || source !== seen.response) return original.instantiateStreaming.call(this, source, imports);
      return seen.compiled.then((module) => W.instantiate(module, imports).then((instance) => ({ instance, module })));
    };
  } else {
    W.instantiate = function (source, ...rest) {
      const binary =
        source instanceof ArrayBuffer || ArrayBuffer.isView(source)
          ? new Uint8Array(source.buffer ?? source, source.byteOffset ?? 0, source.byteLength)
          : null;
      return original.instantiate.call(this, source, ...rest).then((result) => {
        const instance = result instanceof W.Instance ? result : result && result.instance;
        if (binary && instance && "Py_Version" in instance.exports) resolveBytes(binary);
        return result;
      });
    };
  }
  return {
    bytes,
    // Once the runtime is instantiated: a binary not seen by then never
    // will be, and bytes gives null.
    release() {
      resolveBytes(null);
      globalThis.fetch = original.fetch;
      W.instantiate = original.instantiate;
      if (original.instantiateStreaming) W.instantiateStreaming = original.instantiateStreaming;
    },
  };
}

function readLEB(bytes, at, signed = false) {
  let result = 0;
  let shift = 0;
  let byte;
  do {
    if (at >= bytes.length || shift > 35) throw new Error("bad LEB128 number in the runtime's WebAssembly");
    byte = bytes[at++];
    result += (byte & 0x7f) * 2 ** shift;
    shift += 7;
  } while (byte & 0x80);
  if (signed && byte & 0x40) result -= 2 ** shift;
  return [result, at];
}

/** The active data segments of a WebAssembly binary: [[offset, bytes]]. */
function dataSegments(wasm) {
  if (wasm[0] !== 0 || wasm[1] !== 0x61 || wasm[2] !== 0x73 || wasm[3] !== 0x6d) {
    throw new Error("the runtime is not a WebAssembly binary");
  }
  const segments = [];
  let at = 8;
  while (at < wasm.length) {
    const id = wasm[at];
    const [length, body] = readLEB(wasm, at + 1);
    at = body + length;
    if (id !== 11) continue;
    let [count, p] = readLEB(wasm, body);
    for (let n = 0; n < count; n++) {
      let flags;
      [flags, p] = readLEB(wasm, p);
      let offset = null;
      if (flags === 0 || flags === 2) {
        if (flags === 2) [, p] = readLEB(wasm, p);
        if (wasm[p] !== 0x41) throw new Error("a data segment of the runtime has a non-constant offset");
        [offset, p] = readLEB(wasm, p + 1, true);
        if (wasm[p++] !== 0x0b) throw new Error("bad data segment offset in the runtime");
        offset >>>= 0;
      } else if (flags !== 1) {
        throw new Error(`unknown data segment kind ${flags} in the runtime`);
      }
      let dataLength;
      [dataLength, p] = readLEB(wasm, p);
      if (p + dataLength > wasm.length) throw new Error("a data segment runs past the end of the runtime");
      if (offset !== null) segments.push([offset, wasm.subarray(p, p + dataLength)]);
      p += dataLength;
    }
  }
  return segments;
}

/**
 * The heap a WebAssembly binary starts with: its active data segments
 * written into zeros, size bytes long (by default up to the end of the last
 * segment, rounded up to a 4 KiB page, the container's page size; what lies
 * past size is dropped). Only constant offsets (i32.const) are understood.
 */
export function dataSegmentsImage(wasm, size = null) {
  const segments = dataSegments(wasm);
  if (size === null) {
    const end = segments.reduce((max, [offset, data]) => Math.max(max, offset + data.length), 0);
    size = Math.ceil(end / 4096) * 4096;
  }
  const image = new Uint8Array(size);
  for (const [offset, data] of segments) {
    if (offset < size) image.set(data.subarray(0, size - offset), offset);
  }
  return image;
}
