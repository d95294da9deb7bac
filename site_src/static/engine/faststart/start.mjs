// The fast start: the engine's memory restored from the build's snapshot
// instead of starting Python.
//
// engine.mjs imports this module only when names.json lists a fast start;
// without this folder the site starts the normal way. Everything private
// lives here and in restore.mjs (FORMAT.md in site_build/faststart/ lists
// it, with the Pyodide version reviewed): loadPyodide's _loadSnapshot, and
// the wrapped fetch / WebAssembly.instantiateStreaming (restore.mjs), which
// also compiles the runtime from its pre-compressed twin.
//
// The build boots Pyodide under Node, installs the engine's packages, runs
// noblegap.engine_hooks.warm_up() and saves the WebAssembly memory
// (packages/noblegap-snapshot.json names the file and how to check it).
// Here the runtime is compiled while pyodide.asm.mjs loads and instantiated
// while the snapshot downloads, its data segments are the base the snapshot
// is a delta against, the package files the engine may still read go back
// into site-packages, engine_hooks.after_restore() re-seeds Python's random
// state, and engine_hooks.known_case_error() must find the answer the build
// recorded.
import { NAMES, PYODIDE_VERSION, bindApi, loadPyodide, runtimeOptions } from "../engine.mjs";
import {
  applyBase,
  applyPages,
  baseFromMemory,
  captureRuntimeWasm,
  checkFetched,
  fetchChecked,
  parseSnapshot,
  serveEmptyZip,
  sha256Hex,
} from "./restore.mjs";

const FAST = NAMES.faststart;

/** The id a snapshot must carry for this Pyodide and this lock file. */
export async function snapshotBuildId(pyodideVersion, lockSha256) {
  const text = FAST.build_id.replace("{format}", String(FAST.format))
    .replace("{pyodide}", pyodideVersion)
    .replace("{lock_sha256}", lockSha256);
  return sha256Hex(text);
}

/** Write the package files of a snapshot (or of the build) into site-packages. */
export function installFiles(FS, sitePackages, files) {
  const made = new Set();
  for (const [path, data] of files) {
    const dir = path.includes("/") ? `${sitePackages}/${path.slice(0, path.lastIndexOf("/"))}` : sitePackages;
    if (!made.has(dir)) {
      FS.mkdirTree(dir);
      made.add(dir);
    }
    FS.writeFile(`${sitePackages}/${path}`, data, { canOwn: false });
  }
}

// The page is served by the offline copy (the worker's name says so, boot.js).
const offlineCopy = typeof self !== "undefined" && String(self.name ?? "").includes("offline copy");

/**
 * Unpack a gzip response: {bytes, sha256, packed: true}, the sha256 being
 * that of the compressed bytes as they came. The body is unpacked while it
 * downloads (one branch of it), and kept whole for the hash (the other), so
 * nothing is left to unpack once its last byte is in.
 */
async function gunzipResponse(response, mark = () => {}) {
  if (!response.ok || !response.body) throw new Error(`snapshot file: HTTP ${response.status}`);
  const [kept, unpacked] = response.body.tee();
  const packed = new Response(kept).arrayBuffer().then((buffer) => {
    mark("snapshot downloaded");
    return sha256Hex(new Uint8Array(buffer));
  });
  const bytes = new Response(unpacked.pipeThrough(new DecompressionStream("gzip"))).arrayBuffer();
  const [sha256, raw] = await Promise.all([packed, bytes]);
  return { bytes: new Uint8Array(raw), sha256, packed: true };
}

/**
 * A promise of the default export of the module whose gzip twin is at
 * packedURL: unpacked in the worker and imported from a blob: URL. Should
 * that fail (no stream decompression, a host error, a blocked blob:), the
 * plain module at plainURL is imported instead.
 */
async function importPacked(packedURL, plainURL, early) {
  try {
    if (typeof DecompressionStream !== "function") throw new Error("no DecompressionStream");
    const response = await (early?.take(packedURL) ?? fetch(packedURL, { credentials: "same-origin" }));
    if (!response.ok || !response.body) throw new Error(`HTTP ${response.status}`);
    const text = await new Response(response.body.pipeThrough(new DecompressionStream("gzip"))).blob();
    const url = URL.createObjectURL(new Blob([text], { type: "text/javascript" }));
    try {
      return (await import(url)).default;
    } finally {
      URL.revokeObjectURL(url);
    }
  } catch {
    return (await import(plainURL)).default;
  }
}

/**
 * The container as the offline copy holds it, unpacked: {bytes, sha256,
 * packed: false}. The service worker checked those bytes against the
 * build's sha256 when it kept them, and says so in the checked header
 * (sw.js): they are not hashed again on every visit (17 MB, 0.1 s on a
 * throttled tablet). Without the header they are hashed here.
 */
async function plainResponse(response) {
  if (!response.ok) throw new Error(`unpacked snapshot: HTTP ${response.status}`);
  const checkedSha = response.headers.get(NAMES.checked_header);
  const bytes = new Uint8Array(await response.arrayBuffer());
  return { bytes, sha256: checkedSha ?? (await sha256Hex(bytes)), packed: false };
}

// The sidecar, checked against this Pyodide and the lock file it will load;
// returns {info, lock}.
async function snapshotInfo(snapshotInfoURL, lockFileURL, fetchFn) {
  const [infoResponse, lockResponse] = await Promise.all([
    fetchFn(snapshotInfoURL, { cache: "no-cache" }),
    fetchFn(lockFileURL),
  ]);
  if (!infoResponse.ok) throw new Error(`no snapshot (${infoResponse.status})`);
  if (!lockResponse.ok) throw new Error(`no lock file (${lockResponse.status})`);
  const info = await infoResponse.json();
  const lockBytes = new Uint8Array(await lockResponse.arrayBuffer());
  const lockSha = await sha256Hex(lockBytes);
  if (info.format !== FAST.format) throw new Error(`snapshot format ${info.format}, expected ${FAST.format}`);
  if (info.pyodide !== PYODIDE_VERSION) {
    throw new Error(`snapshot made with Pyodide ${info.pyodide}, this is ${PYODIDE_VERSION}`);
  }
  const buildId = await snapshotBuildId(PYODIDE_VERSION, lockSha);
  if (info.build_id !== buildId) throw new Error("snapshot build id does not match this Pyodide and lock file");
  const size = info.memory_size;
  if (!Number.isInteger(size) || size <= 0 || size % 4 !== 0) {
    throw new Error(`snapshot sidecar gives a bad memory size ${JSON.stringify(size)}`);
  }
  return { info, lock: JSON.parse(new TextDecoder().decode(lockBytes)) };
}

export async function startFromSnapshot({ indexURL, lockFileURL, snapshotInfoURL, fetchFn, stdout, stderr, phase, mark, early }) {
  snapshotInfoURL ??= new URL(`../../../${NAMES.packages_dir}/${FAST.info_file}`, import.meta.url).href;
  phase("fetch runtime", "Fetching the Python runtime and the prepared engine");
  // fetch as it is before the wrappers below are put in place
  const unwrappedFetch = globalThis.fetch;
  // loadPyodide starts at once (the runtime downloads meanwhile); it waits
  // for the memory, which is only handed over once the sidecar matches.
  const checked = snapshotInfo(snapshotInfoURL, lockFileURL, fetchFn);
  // The file is requested at the same time as the sidecar (one round trip
  // less); its bytes are used only if the sidecar names this file, and they
  // must still have the sidecar's sha256.
  // Served by the offline copy: the container it unpacked once (checked
  // against the sidecar's raw_sha256), else the gzip file.
  const snapshotBase = new URL(snapshotInfoURL, "file:///");
  const guessURL = new URL(FAST.snapshot_file, snapshotBase).href;
  const stop = new AbortController();
  // the worker's early request when it made one (worker.js), else our own
  const request = (url) => early?.take(url) ?? fetchFn(url, { signal: stop.signal });
  const unpack = (url) => request(url).then((response) => gunzipResponse(response, mark));
  const plainURL = new URL(FAST.unpacked_snapshot_file, snapshotBase).href;
  const guessed = offlineCopy
    ? fetchFn(plainURL, { signal: stop.signal }).then(plainResponse).catch(() => unpack(guessURL))
    : unpack(guessURL);
  guessed.catch(() => {});
  // No usable sidecar (the normal start follows): stop the downloads.
  checked.catch(() => {
    stop.abort();
    early?.abort(guessURL);
  });
  // Pyodide needs only the memory's size to compile and instantiate its
  // WebAssembly, and reads the memory itself only after fsInit below has
  // returned: so it gets a zero-filled buffer of the sidecar's size at once,
  // compiles while the snapshot downloads and unpacks, and the buffer is
  // filled before fsInit returns. Should anything fail, the buffer's magic
  // number is zero (or wiped by fsInit), Pyodide rejects it and the normal
  // start follows with the real error as the reason.
  const memory = checked.then(({ info }) => new Uint8Array(info.memory_size));
  const container = (async () => {
    const { info } = await checked;
    mark("snapshot info checked");
    const url = new URL(info.file, snapshotBase).href;
    const { bytes, sha256, packed } = await (url === guessURL ? guessed : unpack(url));
    mark(packed ? "snapshot unpacked" : "snapshot read unpacked");
    if (bytes.length !== info.raw_size) {
      throw new Error(`snapshot unpacks to ${bytes.length} bytes, its sidecar says ${info.raw_size}`);
    }
    if (sha256 !== (packed ? info.sha256 : info.raw_sha256)) throw new Error("snapshot file does not match its sha256");
    return parseSnapshot(bytes, info.memory_size, FAST);
  })();
  // loadPyodide awaits the memory only after it has loaded its own script:
  // keep an early rejection from surfacing as unhandled meanwhile (it still
  // rejects loadPyodide, and so starts the normal way).
  for (const promise of [checked, container, memory]) promise.catch(() => {});
  // The runtime's binary, compiled as soon as its response arrives; its
  // memory, once instantiated, holds the base the snapshot is a delta against.
  // From its gzip twin (names.json "compressed") when the site has one,
  // except when the page is served by the offline copy (the worker's name
  // says so, boot.js): that holds the plain file, unpacked once, and the
  // browser can keep the compiled code of a stored response.
  const runtimeBase = typeof location === "undefined" ? null : new URL(indexURL, location);
  const wasmURL = runtimeBase && new URL("pyodide.asm.wasm", runtimeBase).href;
  const packed = offlineCopy ? null : FAST.compressed?.["pyodide.asm.wasm"];
  // The standard library: only the members the snapshot has not imported
  // (names.json "stdlib_rest_file"), checked against the sidecar. Resuming
  // and the first calculations need none of them (the snapshot has imported
  // what they use), so in the browser Pyodide is handed an empty zip at once
  // and the file is fetched only once the snapshot is here: a first visit's
  // bytes go to what the first result needs. `rest` installs it later in
  // place of the empty one (see `complete` below). Under Node (the build's
  // checks) Pyodide reads the file itself.
  const stdLibURL = runtimeBase
    ? new URL(FAST.stdlib_rest_file, runtimeBase).href
    : `${indexURL.endsWith("/") ? indexURL : indexURL + "/"}${FAST.stdlib_rest_file}`;
  const restSha = checked.then(({ info }) => info.stdlib_rest_sha256);
  restSha.catch(() => {}); // (a bad sidecar is reported by `checked`)
  const deferred = runtimeBase !== null;
  const stdlib = deferred ? serveEmptyZip(stdLibURL) : checkFetched(stdLibURL, restSha);
  const rest = deferred
    ? container.then(() => fetchChecked(stdLibURL, restSha, (url, init) => unwrappedFetch.call(globalThis, url, init)))
    : Promise.resolve(null);
  rest.catch(() => {});
  const packedURL = runtimeBase && packed ? new URL(packed, runtimeBase).href : null;
  const capture = captureRuntimeWasm(wasmURL, packedURL, packedURL && early?.take(packedURL));
  // The runtime's script, from its gzip twin where there is one (and not
  // served by the offline copy, which holds the plain file): Pyodide's
  // private createPyodideModule option takes the module's export instead of
  // importing pyodide.asm.mjs itself (FORMAT.md).
  const packedScript = offlineCopy || !runtimeBase ? null : FAST.compressed?.["pyodide.asm.mjs"];
  const createPyodideModule = packedScript
    ? importPacked(new URL(packedScript, runtimeBase).href, new URL("pyodide.asm.mjs", runtimeBase).href, early)
    : null;
  createPyodideModule?.catch(() => {});
  // What needs no runtime is written as soon as the container is here:
  // Pyodide's header and the pages past the base.
  const paged = Promise.all([container, memory]).then(([snapshot, target]) => {
    applyPages(snapshot, target);
    mark("pages copied");
    return snapshot;
  });
  paged.catch(() => {});
  let containerError = null;
  const pyodide = await loadPyodide({
    ...runtimeOptions({ indexURL, lockFileURL, stdout, stderr }),
    stdLibURL,
    _loadSnapshot: memory,
    ...(createPyodideModule ? { createPyodideModule } : {}),
    // Runs once the WebAssembly is instantiated and before Python resumes
    // from the memory: the base pages are rebuilt from the runtime's fresh
    // memory, and the snapshot's package files go back where the build had
    // them. Never throws (Pyodide does not await this hook's errors): a
    // failure is kept and reported instead of Pyodide's complaint about the
    // memory, whose magic number is wiped so Pyodide never resumes from it.
    fsInit: async (FS, { sitePackages }) => {
      mark("runtime instantiated");
      const runtimeMemory = capture.memory();
      capture.release();
      try {
        if (!runtimeMemory) throw new Error("the runtime's memory was not seen");
        await stdlib.checked;
        stdlib.release();
        const snapshot = await paged;
        const base = baseFromMemory(runtimeMemory.buffer, snapshot);
        if ((await sha256Hex(base)) !== snapshot.header.base.sha256) {
          throw new Error("the runtime's data segments differ from the ones the snapshot was made against");
        }
        phase("restore snapshot");
        applyBase(snapshot, await memory, base);
        mark("memory rebuilt");
        installFiles(FS, sitePackages, snapshot.files);
        mark("files installed");
      } catch (err) {
        containerError = err;
        (await memory.catch(() => new Uint8Array(8))).fill(0, 0, 8);
      }
    },
  })
    .catch((err) => {
      throw containerError ?? err;
    })
    .finally(() => {
      capture.release();
      stdlib.release();
    });
  if (containerError) throw containerError;
  const { info } = await checked;
  phase("check engine");
  const bound = bindApi(pyodide);
  bound.hooks.after_restore();
  const problem = bound.hooks.known_case_error(JSON.stringify(info.known_case));
  if (problem) throw new Error(problem);
  bound.hooks.freeze();
  // The rest of the standard library, written over the empty zip once it is
  // here; calls that may import from it wait for this (worker.js).
  // Should that file fail (a host error, other bytes than the sidecar
  // names), the site's whole standard library (the normal start's) is put
  // there instead, and complete resolves to a note saying so.
  const install = (bytes) => {
    pyodide.FS.writeFile(bound.hooks.stdlib_zip_path(), bytes);
    bound.hooks.stdlib_arrived();
    mark("standard library installed");
  };
  const complete = rest.then(
    (bytes) => {
      if (bytes !== null) install(bytes);
      return null;
    },
    async (err) => {
      const whole = new URL(NAMES.stdlib_file, runtimeBase).href;
      const response = await unwrappedFetch.call(globalThis, whole, { credentials: "same-origin" });
      if (!response.ok) throw new Error(`${NAMES.stdlib_file}: HTTP ${response.status}`);
      install(new Uint8Array(await response.arrayBuffer()));
      return `${err && err.message ? err.message : err}; the whole standard library was loaded instead`;
    },
  );
  complete.catch(() => {});
  return { pyodide, ...bound, mode: NAMES.modes.faststart, complete };
}
