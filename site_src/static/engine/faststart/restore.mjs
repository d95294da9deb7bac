// The pieces of the fast start that do not need Pyodide: the snapshot
// container and the runtime's data segments it is a delta against, and the
// wrapper of fetch / WebAssembly.instantiateStreaming that hands the fast
// start the runtime's module and memory.
//
// Used by start.mjs (browser worker and Node parity runner) and by
// site_build/faststart/make_snapshot.mjs (the build), so both read and
// write the same way. The format constants come from names.json
// ("faststart"), written once by the build.
//
// The container's layout, and why it is so: site_build/faststart/FORMAT.md.

function hex(buffer) {
  return [...new Uint8Array(buffer)].map((b) => b.toString(16).padStart(2, "0")).join("");
}

export async function sha256Hex(data) {
  const bytes = typeof data === "string" ? new TextEncoder().encode(data) : data;
  return hex(await crypto.subtle.digest("SHA-256", bytes));
}

const isInt = (n) => Number.isSafeInteger(n) && n >= 0;

/**
 * Check a decompressed container and split it into {header, prefix, gaps,
 * files, pages}. memorySize is the size the (already checked) sidecar
 * gives, names the fast start's names ({format, magic}); nothing is written
 * anywhere (applyPages and applyBase do that).
 */
export function parseSnapshot(bytes, memorySize, names) {
  const magic = new TextDecoder().decode(bytes.subarray(0, 8));
  if (magic !== names.magic) throw new Error("not a noblegap snapshot (bad magic)");
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
  if (header.format !== names.format) throw new Error(`snapshot container format ${header.format}`);
  if (![prefixSize, pageSize, size, at].every(isInt) || pageSize === 0 || prefixSize % 4 || pageSize % 4) {
    throw new Error("snapshot header has bad sizes");
  }
  if (size !== memorySize) throw new Error(`snapshot memory is ${size} bytes, its sidecar says ${memorySize}`);
  if (!base || !isInt(base.size) || base.size % pageSize || typeof base.sha256 !== "string" || !isInt(base.gaps_size)) {
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
  const gapsEnd = prefixEnd + base.gaps_size;
  let offset = gapsEnd;
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
    gaps: decodeRuns(bytes.subarray(prefixEnd, gapsEnd), base.size),
    files,
    pages: bytes.subarray(at),
  };
}

/** [[start, end]] byte ranges from a gap list (see the top), each within [0, size). */
export function decodeRuns(bytes, size) {
  const runs = [];
  let at = 0;
  let end = 0;
  while (at < bytes.length) {
    let skip;
    let length;
    [skip, at] = readLEB(bytes, at);
    [length, at] = readLEB(bytes, at);
    const start = end + skip;
    end = start + length;
    if (end > size) throw new Error("snapshot base gap list runs past the base");
    runs.push([start, end]);
  }
  return runs;
}

/** The gap list of [[start, end]] ranges, sorted and apart. */
export function encodeRuns(runs) {
  const out = [];
  const put = (n) => {
    do {
      let byte = n % 128;
      n = Math.floor(n / 128);
      if (n) byte |= 0x80;
      out.push(byte);
    } while (n);
  };
  let end = 0;
  for (const [start, stop] of runs) {
    put(start - end);
    put(stop - start);
    end = stop;
  }
  return Uint8Array.from(out);
}

/**
 * The base from a freshly instantiated runtime's memory: its first
 * header.base.size bytes, copied, with the gaps between the data segments
 * zeroed. Not checked here: compare its sha256 with header.base.sha256.
 */
export function baseFromMemory(buffer, { header, gaps }) {
  const { size } = header.base;
  if (buffer.byteLength < size) throw new Error("the runtime's memory is smaller than the snapshot's base");
  const base = new Uint8Array(buffer, 0, size).slice();
  for (const [start, end] of gaps) base.fill(0, start, end);
  return base;
}

/**
 * Rebuild Pyodide's memory snapshot in target (zero-filled, memory_size
 * long), in two steps. applyPages: its header and the stored pages past the
 * base, where the heap started as zeros (a plain copy; needs no runtime).
 * applyBase: the base (see baseFromMemory), XOR the stored pages over it.
 */
export function applyPages({ header, prefix, pages }, target) {
  const { prefix_size: prefixSize, page_size: pageSize } = header;
  target.set(prefix, 0);
  const baseEnd = prefixSize + header.base.size;
  let from = 0;
  for (const [first, count] of header.memory_runs) {
    const start = prefixSize + first * pageSize;
    const length = Math.min(count * pageSize, target.length - start);
    const skip = Math.max(0, Math.min(length, baseEnd - start));
    if (skip < length) target.set(pages.subarray(from + skip, from + length), start + skip);
    from += count * pageSize;
  }
}

export function applyBase({ header, pages }, target, base) {
  const { prefix_size: prefixSize, page_size: pageSize } = header;
  if (base.length !== header.base.size) throw new Error("snapshot base has the wrong size");
  target.set(base, prefixSize);
  const words = new Uint32Array(target.buffer, target.byteOffset, target.length >>> 2);
  const src = new Uint32Array(pages.buffer, pages.byteOffset, pages.length >>> 2);
  const baseEnd = prefixSize + base.length;
  let from = 0;
  for (const [first, count] of header.memory_runs) {
    const start = prefixSize + first * pageSize;
    if (start >= baseEnd) break;
    const xorEnd = Math.min(start + count * pageSize, baseEnd, target.length);
    // word by word: every offset here is a multiple of 4
    for (let t = start >>> 2, s = from >>> 2, e = xorEnd >>> 2; t < e; t++, s++) words[t] ^= src[s];
    from += count * pageSize;
  }
}

/** The absolute URL a fetch call asks for (a string, URL or Request), or null. */
function hrefOf(input) {
  try {
    return new URL(String(input instanceof Request ? input.url : input), location).href;
  } catch {
    return null; // not a URL these wrappers are about
  }
}

/**
 * Watch how Pyodide loads its runtime (wasmURL, the browser's), until
 * release(). memory() is then the runtime's WebAssembly memory: that of the
 * instance that exports Py_Version (Pyodide instantiates small probe
 * modules too). bytes is a promise of the runtime's binary under Node (the
 * build reads its data segments), null in a browser.
 *
 * In a browser Pyodide fetches the binary at once but compiles it only
 * after it has loaded and run pyodide.asm.mjs (1.25 MB of JavaScript): here
 * the streaming compile starts as soon as Pyodide asks for the binary, in
 * the background, and Pyodide's instantiateStreaming call is answered with
 * that module. With packedURL (the build's gzip twin of the binary) the
 * compile reads the twin through the browser's DecompressionStream, so the
 * download is the compressed size whatever the host does; should that
 * fail, the plain binary is compiled instead. packedResponse: a promise of
 * the twin's response requested earlier (worker.js), used instead of a new
 * request. Under Node Pyodide reads the file and instantiates the bytes.
 */
export function captureRuntimeWasm(wasmURL = null, packedURL = null, packedResponse = null) {
  const W = globalThis.WebAssembly;
  const original = {
    fetch: globalThis.fetch,
    instantiate: W.instantiate,
    instantiateStreaming: W.instantiateStreaming,
  };
  let memory = null;
  let resolveBytes;
  const bytes = new Promise((resolve) => (resolveBytes = resolve));
  const keep = (result) => {
    const instance = result instanceof W.Instance ? result : result && result.instance;
    const exports = (instance && instance.exports) || {};
    if (memory === null && "Py_Version" in exports && exports.memory instanceof W.Memory) memory = exports.memory;
    return result;
  };
  let seen = null; // the response promise handed to Pyodide, and the compile
  const inBrowser = typeof location !== "undefined" && wasmURL !== null && original.instantiateStreaming;
  if (inBrowser) {
    const isRuntime = (input) => hrefOf(input) === wasmURL;
    const plain = () => W.compileStreaming(original.fetch.call(globalThis, wasmURL, { credentials: "same-origin" }));
    const compile = async () => {
      if (packedURL === null || typeof DecompressionStream !== "function") return plain();
      try {
        const response = await (packedResponse ?? original.fetch.call(globalThis, packedURL, { credentials: "same-origin" }));
        if (!response.ok || !response.body) throw new Error(`HTTP ${response.status}`);
        const body = response.body.pipeThrough(new DecompressionStream("gzip"));
        return await W.compileStreaming(new Response(body, { headers: { "Content-Type": "application/wasm" } }));
      } catch {
        return plain();
      }
    };
    globalThis.fetch = function (input, init) {
      if (seen !== null || !isRuntime(input)) return original.fetch.call(this, input, init);
      const compiled = compile();
      compiled.catch(() => {});
      // Pyodide hands this to instantiateStreaming below, which answers with
      // the compiled module: the body is never read.
      const response = Promise.resolve(new Response(null, { headers: { "Content-Type": "application/wasm" } }));
      seen = { response, compiled, resolved: null };
      response.then((r) => (seen.resolved = r));
      return response;
    };
    W.instantiateStreaming = function (source, imports) {
      // the promise fetch returned, or the response it gave
      if (seen === null || (source !== seen.response && source !== seen.resolved)) {
        return original.instantiateStreaming.call(this, source, imports).then(keep);
      }
      return seen.compiled.then((module) => W.instantiate(module, imports).then((instance) => keep({ instance, module })));
    };
    resolveBytes(null);
  } else {
    W.instantiate = function (source, ...rest) {
      const binary =
        source instanceof ArrayBuffer || ArrayBuffer.isView(source)
          ? new Uint8Array(source.buffer ?? source, source.byteOffset ?? 0, source.byteLength)
          : null;
      return original.instantiate.call(this, source, ...rest).then((result) => {
        keep(result);
        if (binary && memory !== null) resolveBytes(binary);
        return result;
      });
    };
  }
  return {
    memory: () => memory,
    bytes,
    release() {
      resolveBytes(null);
      globalThis.fetch = original.fetch;
      W.instantiate = original.instantiate;
      if (original.instantiateStreaming) W.instantiateStreaming = original.instantiateStreaming;
    },
  };
}

/**
 * Until release(): a fetch of url (in a browser; the fast start's standard
 * library, which Pyodide fetches itself) is read whole and its sha256
 * compared with the one expected resolves to. checked settles once that is
 * known: resolved when they match, else rejected with the reason; the
 * caller refuses the snapshot then. The bytes are handed on either way (a
 * rejection here would surface inside Pyodide, unhandled), and a failed
 * download fails as it would without this wrapper. earlyResponse: a
 * promise of the response to the same URL requested earlier, used for the
 * first such fetch instead of a new request. Under Node Pyodide reads
 * the file itself: checked is resolved at once.
 */
/**
 * Hand whoever fetches url (Pyodide, for its standard library) an empty zip
 * archive instead, without a request; {checked, release} as checkFetched.
 */
export function serveEmptyZip(url) {
  const original = globalThis.fetch;
  // an end-of-central-directory record and nothing else: a zip with no members
  const empty = new Uint8Array(22);
  empty.set([0x50, 0x4b, 0x05, 0x06]);
  let released = false;
  const wrapper = function (input, init) {
    if (released || hrefOf(input) !== url) return original.call(this, input, init);
    return Promise.resolve(new Response(empty, { headers: { "Content-Type": "application/zip" } }));
  };
  globalThis.fetch = wrapper;
  return {
    checked: Promise.resolve(),
    release() {
      released = true;
      if (globalThis.fetch === wrapper) globalThis.fetch = original;
    },
  };
}

/** The bytes at url once their sha256 is the one expected (a promise of it). */
export async function fetchChecked(url, expected, fetchFn = (u, init) => fetch(u, init)) {
  const response = await fetchFn(url, { credentials: "same-origin" });
  const name = url.split("/").pop();
  if (!response.ok) throw new Error(`${name}: HTTP ${response.status}`);
  const bytes = new Uint8Array(await response.arrayBuffer());
  if ((await sha256Hex(bytes)) !== (await expected)) throw new Error(`${name} is not the one the snapshot was made with`);
  return bytes;
}

export function checkFetched(url, expected, earlyResponse = null) {
  const original = globalThis.fetch;
  if (typeof location === "undefined" || typeof original !== "function") {
    return { checked: Promise.resolve(), release() {} };
  }
  // (a sidecar that fails rejects expected: the caller hears of it elsewhere)
  expected.catch(() => {});
  let settle;
  const checked = new Promise((resolve, reject) => (settle = { resolve, reject }));
  checked.catch(() => {});
  const name = url.split("/").pop();
  let released = false;
  const wrapper = function (input, init) {
    if (released || hrefOf(input) !== url) return original.call(this, input, init);
    // the first request may have been made already (worker.js)
    const fetched = earlyResponse ?? original.call(this, input, init);
    earlyResponse = null;
    fetched.catch((err) => settle.reject(err));
    return fetched.then(async (response) => {
      if (!response.ok) {
        settle.reject(new Error(`${name}: HTTP ${response.status}`));
        return response;
      }
      const bytes = new Uint8Array(await response.arrayBuffer());
      Promise.all([sha256Hex(bytes), expected]).then(
        ([actual, wanted]) => {
          if (actual === wanted) settle.resolve();
          else settle.reject(new Error(`${name} is not the one the snapshot was made with`));
        },
        (err) => settle.reject(err),
      );
      return new Response(bytes, { status: response.status, headers: response.headers });
    });
  };
  globalThis.fetch = wrapper;
  return {
    checked,
    release() {
      released = true;
      if (globalThis.fetch === wrapper) globalThis.fetch = original;
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

/** The byte ranges of [0, size) that no active data segment covers: [[start, end]]. */
export function dataSegmentsGaps(wasm, size) {
  const covered = dataSegments(wasm)
    .map(([offset, data]) => [offset, Math.min(size, offset + data.length)])
    .filter(([start, end]) => start < end)
    .sort((a, b) => a[0] - b[0]);
  const gaps = [];
  let at = 0;
  for (const [start, end] of covered) {
    if (start > at) gaps.push([at, start]);
    at = Math.max(at, end);
  }
  if (at < size) gaps.push([at, size]);
  return gaps;
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
