// The pieces of the snapshot start that do not need Pyodide: the snapshot
// container, the runtime's initial memory it is a delta against, and the
// package files, unpacked from the lock file's wheels.
//
// Used by static/engine.mjs (browser worker and Node parity runner) and by
// tools/make_snapshot.mjs (the build), so both read and write the same way.
//
// Container (after gunzip), format 2:
//
//   "NGSNAP02", u32 LE header length, header JSON,
//   the first prefix_size bytes of Pyodide's memory snapshot (its own header),
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
// The package files are not in the container: the worker unpacks them from
// the same wheels the normal start loads (each checked against the lock's
// sha256), and they must be exactly the files the build installed
// (header.files, [path, size]).

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
 * Check a decompressed container and split it into {header, prefix, pages}.
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
  for (const entry of header.files) {
    const [path, fileSize] = entry;
    if (typeof path !== "string" || path.startsWith("/") || path.split("/").includes("..") || !isInt(fileSize)) {
      throw new Error(`snapshot lists a bad file ${JSON.stringify(path)}`);
    }
  }
  const prefixEnd = 12 + headerLength + prefixSize;
  if (prefixEnd > at || at % 16 || at + stored * pageSize !== bytes.length) {
    throw new Error(`snapshot is ${bytes.length} bytes, its header says ${at + stored * pageSize}`);
  }
  return {
    header,
    prefix: bytes.subarray(12 + headerLength, prefixEnd),
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
 * Watch WebAssembly instantiation until release(): bytes() is a promise of
 * the binary of the instance that exports Py_Version, i.e. Python's runtime
 * (Pyodide instantiates small probe modules too), or null before it is
 * instantiated. The streamed response is cloned, so the bytes are read
 * while the browser compiles them.
 */
export function captureRuntimeWasm() {
  const W = globalThis.WebAssembly;
  const original = { instantiate: W.instantiate, instantiateStreaming: W.instantiateStreaming };
  let runtimeBytes = null;
  const keep = (bytes) => (result) => {
    const instance = result instanceof W.Instance ? result : result && result.instance;
    const exports = (instance && instance.exports) || {};
    if (runtimeBytes === null && "Py_Version" in exports) runtimeBytes = bytes;
    return result;
  };
  W.instantiate = function (source, ...rest) {
    const bytes =
      source instanceof ArrayBuffer || ArrayBuffer.isView(source)
        ? Promise.resolve(new Uint8Array(source.buffer ?? source, source.byteOffset ?? 0, source.byteLength))
        : Promise.resolve(null);
    return original.instantiate.call(this, source, ...rest).then(keep(bytes));
  };
  if (original.instantiateStreaming) {
    W.instantiateStreaming = function (source, ...rest) {
      return Promise.resolve(source).then((response) => {
        const bytes = response.clone().arrayBuffer().then((b) => new Uint8Array(b));
        bytes.catch(() => {});
        return original.instantiateStreaming.call(this, response, ...rest).then(keep(bytes));
      });
    };
  }
  return {
    bytes: () => runtimeBytes,
    release() {
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
 * segment; what lies past size is dropped). Only constant offsets
 * (i32.const) are understood.
 */
export function dataSegmentsImage(wasm, size = null) {
  const segments = dataSegments(wasm);
  if (size === null) size = segments.reduce((end, [offset, data]) => Math.max(end, offset + data.length), 0);
  const image = new Uint8Array(size);
  for (const [offset, data] of segments) {
    if (offset < size) image.set(data.subarray(0, size - offset), offset);
  }
  return image;
}

/** "sha256-<base64>" from a hex sha256, for fetch's integrity option. */
export function integrityOf(hexDigest) {
  const bytes = hexDigest.match(/../g).map((h) => parseInt(h, 16));
  return `sha256-${btoa(String.fromCharCode(...bytes))}`;
}

async function inflateRaw(data) {
  const stream = new Blob([data]).stream().pipeThrough(new DecompressionStream("deflate-raw"));
  return new Uint8Array(await new Response(stream).arrayBuffer());
}

/** Every file of a zip archive (a wheel): [[name, bytes]], directories left out. */
export async function unzip(bytes, label = "archive") {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  let eocd = -1;
  for (let i = bytes.length - 22; i >= Math.max(0, bytes.length - 22 - 65535); i--) {
    if (view.getUint32(i, true) === 0x06054b50) {
      eocd = i;
      break;
    }
  }
  if (eocd < 0) throw new Error(`${label}: not a zip archive`);
  const count = view.getUint16(eocd + 10, true);
  let at = view.getUint32(eocd + 16, true);
  const decoder = new TextDecoder();
  const jobs = [];
  for (let n = 0; n < count; n++) {
    if (at + 46 > bytes.length || view.getUint32(at, true) !== 0x02014b50) {
      throw new Error(`${label}: bad central directory`);
    }
    const method = view.getUint16(at + 10, true);
    const compressed = view.getUint32(at + 20, true);
    const size = view.getUint32(at + 24, true);
    const nameLength = view.getUint16(at + 28, true);
    const extraLength = view.getUint16(at + 30, true);
    const commentLength = view.getUint16(at + 32, true);
    const local = view.getUint32(at + 42, true);
    const name = decoder.decode(bytes.subarray(at + 46, at + 46 + nameLength));
    at += 46 + nameLength + extraLength + commentLength;
    if (name.endsWith("/")) continue;
    if (name.startsWith("/") || name.includes("\\") || name.split("/").includes("..")) {
      throw new Error(`${label}: unsafe member name ${JSON.stringify(name)}`);
    }
    if (view.getUint32(local, true) !== 0x04034b50) throw new Error(`${label}: bad local header for ${name}`);
    const start = local + 30 + view.getUint16(local + 26, true) + view.getUint16(local + 28, true);
    const data = bytes.subarray(start, start + compressed);
    if (method !== 0 && method !== 8) throw new Error(`${label}: ${name} uses compression method ${method}`);
    jobs.push(
      (method === 0 ? Promise.resolve(data) : inflateRaw(data)).then((out) => {
        if (out.length !== size) throw new Error(`${label}: ${name} unpacks to ${out.length} bytes, not ${size}`);
        return [name, out];
      }),
    );
  }
  return Promise.all(jobs);
}

/**
 * The files of every wheel in the lock file (site-packages layout), each
 * wheel fetched with its sha256 as Subresource Integrity. Returns
 * [[path, bytes]] sorted by path, as the build lists them.
 */
export async function lockedFiles(lock, lockFileURL, fetchFn) {
  const packages = Object.values(lock.packages ?? {});
  // (a plain path under Node)
  const lockBase = new URL(lockFileURL, "file:///");
  const unpacked = await Promise.all(
    packages.map(async (entry) => {
      const url = new URL(entry.file_name, lockBase).href;
      const response = await fetchFn(url, { integrity: integrityOf(entry.sha256) });
      if (!response.ok) throw new Error(`${entry.file_name}: HTTP ${response.status}`);
      return unzip(new Uint8Array(await response.arrayBuffer()), entry.file_name);
    }),
  );
  const files = new Map();
  for (const list of unpacked) {
    for (const [name, data] of list) {
      const other = files.get(name);
      if (other && (other.length !== data.length || other.some((b, i) => b !== data[i]))) {
        throw new Error(`${name} differs between two wheels`);
      }
      files.set(name, data);
    }
  }
  return [...files].sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
}

/** The files must be exactly the [path, size] list the build installed. */
export function checkFileList(files, expected) {
  const got = files.map(([path, data]) => `${path}:${data.length}`);
  const want = expected.map(([path, size]) => `${path}:${size}`);
  if (got.length !== want.length || got.some((x, i) => x !== want[i])) {
    const missing = want.filter((x) => !got.includes(x));
    const extra = got.filter((x) => !want.includes(x));
    throw new Error(`the wheels' files differ from the snapshot's (missing ${missing.slice(0, 3)}; extra ${extra.slice(0, 3)})`);
  }
}
