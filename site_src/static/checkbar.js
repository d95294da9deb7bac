// A calculator page's job bar: save the current check into a job, print its
// check sheet (with the QR code of its link), and the compare view where the
// calculator has one. static/app.js owns the form and the result; this file
// reads the form and listens to app.js's "noblegap:result" event.
import * as store from "./jobstore.js";
import { checkSheet, dateText, qrFor } from "./sheet.js";

const schema = JSON.parse(document.getElementById("schema").textContent);
const $ = (id) => document.getElementById(id);
const form = $("inputs");
const status = $("job-bar-status");
const panel = $("save-panel");
const sheetHost = $("sheet-host");
const version = sheetHost.dataset.version;
const CURRENT_JOB = "noblegap-current-job";

let last = null; // the last reply app.js rendered
let qrCache = { link: null, svg: null };
let sheetKey = null;

document.addEventListener("noblegap:result", (ev) => {
  last = ev.detail;
});

export function readInputs() {
  const out = {};
  for (const f of schema.fields) {
    const c = $(`f-${f.key}`);
    if (c) out[f.key] = c.value;
  }
  return out;
}

/** Extra query keys other modules add to the link (the compare view's variants). */
export const linkExtras = new Map();

export function currentLink() {
  const params = new URLSearchParams();
  for (const [k, v] of Object.entries(readInputs())) params.set(k, v);
  for (const [k, v] of linkExtras) if (v) params.set(k, v);
  return `${location.origin}${location.pathname}?${params.toString()}`;
}

function lastResult() {
  // The last live result, if it answered the inputs now in the form.
  if (!last || !last.ok || !last.result || !last.result.ok) return null;
  const now = readInputs();
  const used = last.result.inputs || {};
  for (const [k, v] of Object.entries(now)) if (String(used[k] ?? "") !== String(v)) return null;
  return last.result;
}

function summaryOf(result) {
  if (!result) {
    const err = last && !last.ok ? last.error : null;
    return { status: "error", verdict_class: "", verdict: "", headline: err ? err.message : "not computed yet" };
  }
  const d = result.result.display || {};
  return {
    status: "computed",
    verdict_class: d.verdict ? d.verdict.class : "",
    verdict: d.verdict ? d.verdict.label : "",
    headline: d.headline || "",
  };
}

// The job this check belongs to (saved into, or reopened from), kept at hand
// so the sheet can be built synchronously when the browser prints.
let jobCache = null;
async function loadCurrentJob() {
  const id = sessionStorage.getItem(CURRENT_JOB);
  try {
    const got = id ? await store.getJob(id) : null;
    jobCache = got ? got.job : null;
  } catch {
    jobCache = null;
  }
}
loadCurrentJob();

// ---------- saving ----------
async function fillJobs() {
  const sel = $("save-job");
  const jobs = await store.listJobs();
  const keep = sel.value || sessionStorage.getItem(CURRENT_JOB) || "";
  sel.replaceChildren();
  const fresh = document.createElement("option");
  fresh.value = "";
  fresh.textContent = "New job…";
  sel.appendChild(fresh);
  for (const j of jobs) {
    const o = document.createElement("option");
    o.value = j.id;
    o.textContent = `${j.name}${j.reference ? ` (${j.reference})` : ""} · ${j.count} check${j.count === 1 ? "" : "s"}`;
    sel.appendChild(o);
  }
  sel.value = jobs.some((j) => j.id === keep) ? keep : "";
  toggleNew();
}

function toggleNew() {
  const isNew = $("save-job").value === "";
  $("save-new").hidden = !isNew;
  $("save-new-ref").hidden = !isNew;
}

$("save-job").addEventListener("change", toggleNew);

$("save-open").addEventListener("click", async () => {
  const open = panel.hidden;
  panel.hidden = !open;
  $("save-open").setAttribute("aria-expanded", String(open));
  if (open) {
    try {
      await fillJobs();
      ($("save-job").value ? $("save-label") : $("save-name")).focus();
    } catch (err) {
      status.textContent = `Saved jobs are not available in this browser (${err.message}).`;
    }
  }
});

panel.addEventListener("submit", async (ev) => {
  ev.preventDefault();
  let jobId = $("save-job").value;
  try {
    if (!jobId) {
      const name = $("save-name").value.trim();
      if (!name) {
        status.textContent = "Type a name for the new job (or choose a saved one).";
        $("save-name").focus();
        return;
      }
      jobId = (await store.createJob({ name, reference: $("save-ref").value })).id;
    }
    const result = lastResult();
    const variants = linkExtras.get("compare");
    const check = {
      calc: schema.name,
      inputs: result ? result.inputs : readInputs(),
      summary: { ...summaryOf(result), label: $("save-label").value.trim() },
      ...(variants ? { variants: variants.split(",") } : {}),
    };
    await store.addCheck(jobId, check);
    sessionStorage.setItem(CURRENT_JOB, jobId);
    await loadCurrentJob();
    const got = await store.getJob(jobId);
    const granted = await store.askPersistence();
    status.textContent = `Saved in “${got.job.name}” (${got.checks.length} check${got.checks.length === 1 ? "" : "s"}). ${store.persistenceText(granted)}`;
    document.body.dataset.saved = String(got.checks.length);
    $("save-label").value = "";
    $("save-name").value = "";
    $("save-ref").value = "";
    await fillJobs();
  } catch (err) {
    status.textContent = `The check was not saved (${err.message}). Your inputs are unchanged.`;
  }
});

// ---------- the check sheet ----------
function compareBlock() {
  const block = document.getElementById("compare-block");
  if (!block || block.hidden) return null;
  const table = block.querySelector("table");
  return table ? table.cloneNode(true) : null;
}

function buildSheet(qrSvg) {
  const result = lastResult();
  const job = jobCache;
  const link = currentLink();
  const inputs = result ? result.inputs : readInputs();
  const cmp = compareBlock();
  let compare = null;
  if (cmp) {
    compare = document.createElement("div");
    compare.className = "sheet-compare";
    const h = document.createElement("h2");
    h.textContent = "Variants compared";
    compare.append(h, cmp);
  }
  const sheet = checkSheet({
    schema,
    inputs,
    display: result ? result.result.display : null,
    error: last && !last.ok && last.error ? last.error.message : "the result is not up to date with the inputs",
    job,
    link,
    qrSvg,
    version,
    date: dateText(),
    compare,
  });
  sheetHost.replaceChildren(sheet);
  document.documentElement.classList.add("has-sheet");
  sheetKey = link;
  document.body.dataset.sheet = qrSvg ? "ready" : "no-qr";
}

$("print-sheet").addEventListener("click", async () => {
  const btn = $("print-sheet");
  btn.disabled = true;
  status.textContent = "Preparing the check sheet…";
  try {
    const link = currentLink();
    if (qrCache.link !== link) {
      const { connect } = await import("./engine-client.js");
      const { call } = await connect();
      qrCache = { link, svg: await qrFor(call, link) };
    }
    buildSheet(qrCache.svg);
    status.textContent = qrCache.svg ? "" : "The QR code could not be drawn; the sheet shows the link as text.";
    window.print();
  } finally {
    btn.disabled = false;
  }
});

// The browser's own print command: the sheet, with the QR code if the
// button has drawn it for this link (printing cannot wait for the engine).
window.addEventListener("beforeprint", () => {
  const link = currentLink();
  if (sheetKey === link && sheetHost.firstChild) return;
  buildSheet(qrCache.link === link ? qrCache.svg : null);
});

if (["fastener", "joint"].includes(schema.name)) {
  import("./compare.js").then((m) => m.mount({ schema, readInputs, linkExtras, lastResult: () => lastResult() }));
}
