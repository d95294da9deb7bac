// Saved jobs on this device: a small wrapper of our own around IndexedDB.
//
// A job: {id, name, reference, notes, created_at, updated_at}.
// A check: {id, job, calc, inputs, variants?, summary, saved_at}; inputs are
// the raw values as typed, exactly the link's query (URL keys = the
// calculator's input keys), summary = {verdict_class, verdict, headline}.
//
// Jobs and checks are separate records (object stores "jobs" and "checks",
// the latter indexed by job), so two tabs saving into the same job at the
// same moment write two records and both are kept; nothing is ever a
// read-modify-write of a list. Every change is one transaction: a failure
// leaves what was saved untouched.
//
// Export/import: one JSON file a job, format "noblegap-job", version
// JOB_FILE_VERSION (see parseJobFile for what is checked).

export const DB_NAME = "noblegap-jobs";
export const DB_VERSION = 1;
export const JOB_FILE_FORMAT = "noblegap-job";
export const JOB_FILE_VERSION = 1;
export const LIMITS = { fileBytes: 5_000_000, name: 200, reference: 200, notes: 20_000, checks: 10_000, key: 64, value: 1000 };

let dbPromise = null;

function request(req) {
  return new Promise((resolve, reject) => {
    req.onsuccess = () => resolve(req.result);
    req.onerror = () => reject(req.error);
  });
}

function done(tx) {
  return new Promise((resolve, reject) => {
    tx.oncomplete = () => resolve();
    tx.onabort = () => reject(tx.error || new Error("the change was not saved"));
    tx.onerror = () => reject(tx.error || new Error("the change was not saved"));
  });
}

/** The database, created on first use. */
export function openStore() {
  if (!dbPromise) {
    dbPromise = new Promise((resolve, reject) => {
      if (!("indexedDB" in self)) {
        reject(new Error("this browser has no IndexedDB storage"));
        return;
      }
      const req = indexedDB.open(DB_NAME, DB_VERSION);
      req.onupgradeneeded = () => {
        const db = req.result;
        if (!db.objectStoreNames.contains("jobs")) db.createObjectStore("jobs", { keyPath: "id" });
        if (!db.objectStoreNames.contains("checks")) {
          db.createObjectStore("checks", { keyPath: "id" }).createIndex("job", "job", { unique: false });
        }
      };
      req.onsuccess = () => {
        const db = req.result;
        // Another tab opening a newer version: let it, and reopen next time.
        db.onversionchange = () => {
          db.close();
          dbPromise = null;
        };
        resolve(db);
      };
      req.onerror = () => reject(req.error);
      req.onblocked = () => reject(new Error("storage is blocked by another tab of this site; close it and retry"));
    });
    dbPromise.catch(() => {
      dbPromise = null;
    });
  }
  return dbPromise;
}

export function newId() {
  if (self.crypto && crypto.randomUUID) return crypto.randomUUID();
  return `${Date.now().toString(36)}-${Math.random().toString(36).slice(2, 12)}`;
}

const now = () => new Date().toISOString();

// One transaction: if the body fails, the transaction is aborted, so a
// change that cannot finish leaves nothing half-written.
async function tx(stores, mode, body) {
  const db = await openStore();
  const t = db.transaction(stores, mode);
  const finished = done(t);
  let out;
  try {
    out = await body(t);
  } catch (err) {
    finished.catch(() => {});
    try {
      t.abort();
    } catch {
      // already finished
    }
    throw err;
  }
  await finished;
  return out;
}

/** Ask the browser to keep this site's storage; resolves to true, false or null (not supported). */
export async function askPersistence() {
  if (!navigator.storage || !navigator.storage.persist) return null;
  try {
    if (await navigator.storage.persisted()) return true;
    return await navigator.storage.persist();
  } catch {
    return false;
  }
}

/** Words for a persistence answer. */
export function persistenceText(granted) {
  if (granted === true) return "Saved jobs are kept on this device: the browser granted persistent storage.";
  if (granted === false)
    return "The browser did not grant persistent storage: it may clear saved jobs when space runs short. Export the jobs you need to keep a copy.";
  return "This browser cannot promise to keep saved jobs: export the jobs you need to keep a copy.";
}

function cleanJob(fields) {
  return {
    name: String(fields.name ?? "").trim().slice(0, LIMITS.name) || "Untitled job",
    reference: String(fields.reference ?? "").trim().slice(0, LIMITS.reference),
    notes: String(fields.notes ?? "").slice(0, LIMITS.notes),
  };
}

export async function createJob(fields) {
  const job = { id: newId(), ...cleanJob(fields), created_at: now(), updated_at: now() };
  await tx(["jobs"], "readwrite", (t) => t.objectStore("jobs").add(job));
  return job;
}

/** Every job with its number of checks and its verdict counts, newest first. */
export async function listJobs() {
  return tx(["jobs", "checks"], "readonly", async (t) => {
    const [jobs, checks] = await Promise.all([
      request(t.objectStore("jobs").getAll()),
      request(t.objectStore("checks").getAll()),
    ]);
    const byJob = new Map();
    for (const c of checks) {
      if (!byJob.has(c.job)) byJob.set(c.job, []);
      byJob.get(c.job).push(c);
    }
    return jobs
      .map((j) => {
        const cs = byJob.get(j.id) || [];
        const last = cs.reduce((m, c) => (c.saved_at > m ? c.saved_at : m), j.updated_at);
        return { ...j, count: cs.length, last_saved: last };
      })
      .sort((a, b) => (a.last_saved < b.last_saved ? 1 : -1));
  });
}

export async function getJob(id) {
  return tx(["jobs", "checks"], "readonly", async (t) => {
    const job = await request(t.objectStore("jobs").get(id));
    if (!job) return null;
    const checks = await request(t.objectStore("checks").index("job").getAll(id));
    checks.sort((a, b) => (a.saved_at < b.saved_at ? -1 : a.saved_at > b.saved_at ? 1 : 0));
    return { job, checks };
  });
}

export async function findJobsByName(name) {
  const want = String(name).trim().toLowerCase();
  return (await listJobs()).filter((j) => j.name.trim().toLowerCase() === want);
}

export async function updateJob(id, patch) {
  return tx(["jobs"], "readwrite", async (t) => {
    const store = t.objectStore("jobs");
    const job = await request(store.get(id));
    if (!job) throw new Error("this job no longer exists (deleted in another tab?)");
    const next = { ...job, ...cleanJob({ ...job, ...patch }), updated_at: now() };
    store.put(next);
    return next;
  });
}

function cleanCheck(check, jobId) {
  const out = {
    id: newId(),
    job: jobId,
    calc: String(check.calc),
    inputs: Object.fromEntries(Object.entries(check.inputs || {}).map(([k, v]) => [k, v == null ? "" : String(v)])),
    summary: {
      verdict_class: String(check.summary?.verdict_class ?? ""),
      verdict: String(check.summary?.verdict ?? ""),
      headline: String(check.summary?.headline ?? ""),
      ...(check.summary?.status ? { status: String(check.summary.status) } : {}),
      ...(check.summary?.label ? { label: String(check.summary.label) } : {}),
    },
    saved_at: check.saved_at ? String(check.saved_at) : now(),
  };
  if (Array.isArray(check.variants) && check.variants.length) out.variants = check.variants.map(String);
  return out;
}

/** Save one check into a job (its own record: concurrent saves all stay). */
export async function addCheck(jobId, check) {
  return addChecks(jobId, [check]).then((c) => c[0]);
}

export async function addChecks(jobId, checks) {
  return tx(["jobs", "checks"], "readwrite", async (t) => {
    const job = await request(t.objectStore("jobs").get(jobId));
    if (!job) throw new Error("this job no longer exists (deleted in another tab?)");
    const records = checks.map((c) => cleanCheck(c, jobId));
    for (const r of records) t.objectStore("checks").add(r);
    t.objectStore("jobs").put({ ...job, updated_at: now() });
    return records;
  });
}

export async function deleteCheck(id) {
  return tx(["checks"], "readwrite", async (t) => {
    const store = t.objectStore("checks");
    const rec = await request(store.get(id));
    store.delete(id);
    return rec;
  });
}

/** Delete a job and its checks; returns what was removed, for restore() (undo). */
export async function deleteJob(id) {
  return tx(["jobs", "checks"], "readwrite", async (t) => {
    const job = await request(t.objectStore("jobs").get(id));
    const checks = await request(t.objectStore("checks").index("job").getAll(id));
    t.objectStore("jobs").delete(id);
    for (const c of checks) t.objectStore("checks").delete(c.id);
    return { job, checks };
  });
}

/** Put back what deleteJob or deleteCheck returned. */
export async function restore(removed) {
  return tx(["jobs", "checks"], "readwrite", async (t) => {
    if (removed.job) t.objectStore("jobs").put(removed.job);
    for (const c of removed.checks || []) t.objectStore("checks").put(c);
  });
}

export async function duplicateJob(id) {
  const src = await getJob(id);
  if (!src) throw new Error("this job no longer exists");
  return tx(["jobs", "checks"], "readwrite", async (t) => {
    const job = { ...src.job, id: newId(), name: `${src.job.name} (copy)`.slice(0, LIMITS.name), created_at: now(), updated_at: now() };
    t.objectStore("jobs").add(job);
    for (const c of src.checks) t.objectStore("checks").add({ ...c, id: newId(), job: job.id });
    return job;
  });
}

/** The job as one JSON-ready object in the versioned file format. */
export async function exportJob(id, siteVersion) {
  const src = await getJob(id);
  if (!src) throw new Error("this job no longer exists");
  return {
    format: JOB_FILE_FORMAT,
    version: JOB_FILE_VERSION,
    exported_at: now(),
    site_version: siteVersion || "",
    job: { name: src.job.name, reference: src.job.reference, notes: src.job.notes, created_at: src.job.created_at },
    checks: src.checks.map((c) => ({
      calc: c.calc,
      inputs: c.inputs,
      ...(c.variants ? { variants: c.variants } : {}),
      summary: c.summary,
      saved_at: c.saved_at,
    })),
  };
}

export function fileName(job) {
  const base = job.name.replace(/[^A-Za-z0-9._-]+/g, "-").replace(/^-+|-+$/g, "").slice(0, 60) || "job";
  return `${base}.noblegap-job.json`;
}

const isObj = (x) => x !== null && typeof x === "object" && !Array.isArray(x);

/**
 * Read a job file. Returns {ok: true, data} (normalised) or {ok: false,
 * message} saying what is wrong. `calculators` lists the known calculator names.
 */
export function parseJobFile(text, calculators) {
  const fail = (message) => ({ ok: false, message });
  if (typeof text !== "string" || !text.trim()) return fail("The file is empty.");
  if (text.length > LIMITS.fileBytes)
    return fail(`The file is too large (${text.length.toLocaleString("en")} characters); a job file is at most ${LIMITS.fileBytes.toLocaleString("en")}.`);
  let data;
  try {
    data = JSON.parse(text.replace(/^\uFEFF/, ""));
  } catch (err) {
    const t = text.trim();
    if (t.startsWith("{") && !t.endsWith("}"))
      return fail("The file ends in the middle of its content: it looks truncated (an interrupted download or copy). Export the job again.");
    return fail(`The file is not valid JSON (${err.message}). A job file is the JSON file “Export” writes.`);
  }
  if (!isObj(data) || data.format !== JOB_FILE_FORMAT) {
    const found = isObj(data) && "format" in data ? `its format is ${JSON.stringify(String(data.format)).slice(0, 60)}` : "it has no format field";
    return fail(`This is not a noblegap job file: ${found}, where a job file says "format": "${JOB_FILE_FORMAT}".`);
  }
  if (!Number.isInteger(data.version) || data.version < 1)
    return fail(`The job file's version ${JSON.stringify(data.version)} is not valid: it must be a whole number from 1.`);
  if (data.version > JOB_FILE_VERSION)
    return fail(`The job file was written by a newer noblegap (file version ${data.version}); this site reads versions up to ${JOB_FILE_VERSION}. Open it with an updated site.`);
  const problems = [];
  const job = data.job;
  if (!isObj(job)) problems.push("the job's details (\"job\") are missing");
  else {
    if (typeof job.name !== "string" || !job.name.trim()) problems.push("the job has no name");
    else if (job.name.length > LIMITS.name) problems.push(`the job's name is longer than ${LIMITS.name} characters`);
    for (const k of ["reference", "notes"]) {
      if (job[k] != null && typeof job[k] !== "string") problems.push(`the job's ${k} is not text`);
    }
    if (typeof job.notes === "string" && job.notes.length > LIMITS.notes) problems.push(`the notes are longer than ${LIMITS.notes} characters`);
  }
  if (!Array.isArray(data.checks)) problems.push("the list of checks (\"checks\") is missing");
  else if (data.checks.length > LIMITS.checks) problems.push(`it holds more than ${LIMITS.checks} checks`);
  else {
    data.checks.forEach((c, i) => {
      if (problems.length >= 6) return;
      const where = `check ${i + 1}`;
      if (!isObj(c)) return problems.push(`${where} is not a record`);
      if (typeof c.calc !== "string" || !calculators.includes(c.calc))
        problems.push(`${where} names an unknown calculator ${JSON.stringify(c.calc)} (known: ${calculators.join(", ")})`);
      if (!isObj(c.inputs)) problems.push(`${where} has no inputs`);
      else
        for (const [k, v] of Object.entries(c.inputs)) {
          if (k.length > LIMITS.key || !/^[A-Za-z_][A-Za-z0-9_]*$/.test(k)) problems.push(`${where} has an input named ${JSON.stringify(k.slice(0, 40))}, not an input key`);
          else if (!(typeof v === "string" || typeof v === "number") || String(v).length > LIMITS.value)
            problems.push(`${where}: input ${k} is not text of at most ${LIMITS.value} characters`);
        }
      if (c.variants != null && !(Array.isArray(c.variants) && c.variants.every((v) => typeof v === "string" && v.length <= 200)))
        problems.push(`${where}: its variants are not a list of names`);
      if (c.summary != null && !isObj(c.summary)) problems.push(`${where}: its summary is not a record`);
      if (c.saved_at != null && (typeof c.saved_at !== "string" || Number.isNaN(Date.parse(c.saved_at))))
        problems.push(`${where}: its date is not a date`);
    });
  }
  if (problems.length) return fail(`The job file cannot be imported: ${problems.slice(0, 6).join("; ")}.`);
  return {
    ok: true,
    data: {
      job: cleanJob(job),
      checks: data.checks.map((c) => ({ calc: c.calc, inputs: c.inputs, variants: c.variants, summary: isObj(c.summary) ? c.summary : {}, saved_at: c.saved_at })),
    },
  };
}

/**
 * Save an imported job in one transaction. mode "keep": a new job beside
 * any of the same name (named "name (imported)" if the name is taken);
 * "replace": the job `replaceId` and its checks are replaced.
 */
export async function importJob(data, mode = "keep", replaceId = null) {
  const taken = (await listJobs()).map((j) => j.name.toLowerCase());
  return tx(["jobs", "checks"], "readwrite", async (t) => {
    let name = data.job.name;
    if (mode === "replace" && replaceId) {
      const old = await request(t.objectStore("checks").index("job").getAll(replaceId));
      for (const c of old) t.objectStore("checks").delete(c.id);
      t.objectStore("jobs").delete(replaceId);
    } else if (taken.includes(name.toLowerCase())) {
      let n = 2;
      while (taken.includes(`${data.job.name} (imported ${n})`.toLowerCase())) n += 1;
      name = `${data.job.name} (imported ${n})`.slice(0, LIMITS.name);
    }
    const job = { id: newId(), ...data.job, name, created_at: now(), updated_at: now() };
    t.objectStore("jobs").add(job);
    for (const c of data.checks) t.objectStore("checks").add(cleanCheck(c, job.id));
    return job;
  });
}

/** The link that reopens a check: the calculator's page with its inputs (and variants). */
export function checkLink(check, base = location.href) {
  const params = new URLSearchParams();
  for (const [k, v] of Object.entries(check.inputs || {})) params.set(k, v);
  if (check.variants && check.variants.length) params.set("compare", check.variants.join(","));
  return new URL(`${check.calc}.html?${params.toString()}`, base).href;
}
