// Page script: schema-driven form <-> URL query <-> engine worker <-> result DOM.
// All computation happens in the Python core inside the worker; this file only
// moves inputs and renders the core's "display" structure with textContent.
import { registerServiceWorker } from "./register-sw.js";
import { worker, takeEarly } from "./boot.js";

const schema = JSON.parse(document.getElementById("schema").textContent);
const form = document.getElementById("inputs");
const resultBox = document.getElementById("result");
const resultBody = document.getElementById("result-body");
const exampleLabel = document.getElementById("example-label");
const engineStatus = document.getElementById("engine-status");
const progressFill = document.getElementById("progress-fill");
const progressBar = progressFill.parentElement;
const fields = new Map(schema.fields.map((f) => [f.key, f]));
const control = (key) => document.getElementById(`f-${key}`);

let seq = 0;
let nextId = 1;
let busy = false;
let pending = false;
let ready = false;
let lastInputAt = 0;
const waiting = new Map();

// ---------- inputs and the URL ----------
function setControl(key, value) {
  const el = control(key);
  if (!el) return;
  if (el.tagName === "SELECT" && ![...el.options].some((o) => o.value === value)) {
    const opt = document.createElement("option");
    opt.value = value;
    opt.textContent = `${value} (not recognised)`;
    opt.dataset.unknown = "1";
    el.appendChild(opt);
  }
  el.value = value;
}

function readInputs() {
  const out = {};
  for (const key of fields.keys()) {
    const el = control(key);
    if (el) out[key] = el.value;
  }
  return out;
}

function fromURL() {
  const params = new URLSearchParams(location.search);
  let any = false;
  for (const key of fields.keys()) {
    if (params.has(key)) {
      setControl(key, params.get(key));
      any = true;
    }
  }
  return any;
}

function toURL() {
  const params = new URLSearchParams();
  for (const [key, value] of Object.entries(readInputs())) params.set(key, value);
  history.replaceState(null, "", `${location.pathname}?${params.toString()}`);
}

// ---------- the engine worker ----------
// Started by static/boot.js (early, from <head>).
worker.onerror = (ev) => {
  ev.preventDefault();
  engineFailed(ev.message || "the engine could not start");
};
worker.onmessage = (ev) => {
  const msg = ev.data || {};
  if (msg.type === "progress") return showProgress(msg);
  if (msg.type === "ready") return engineReady(msg);
  if (msg.type === "fatal") return engineFailed(msg.message);
  if (msg.id !== undefined && waiting.has(msg.id)) {
    const resolve = waiting.get(msg.id);
    waiting.delete(msg.id);
    resolve(msg);
  }
};

function call(fn, args) {
  const id = nextId++;
  return new Promise((resolve) => {
    waiting.set(id, resolve);
    worker.postMessage({ id, fn, args });
  });
}

function showProgress(msg) {
  const pct = Math.round(100 * Math.max(0, Math.min(1, msg.fraction || 0)));
  progressFill.style.width = `${pct}%`;
  progressBar.setAttribute("aria-valuenow", String(pct));
  engineStatus.textContent = `Engine: ${msg.label || msg.phase}… (the worked example stays until the live result replaces it)`;
  if (msg.phase) document.body.dataset.enginePhase = msg.phase;
}

function engineReady(msg) {
  ready = true;
  progressFill.style.width = "100%";
  progressBar.setAttribute("aria-valuenow", "100");
  document.body.dataset.engine = "ready";
  if (msg && msg.mode) document.body.dataset.engineMode = msg.mode;
  engineStatus.textContent = msg && msg.note ? `Live engine ready (${msg.note}).` : "Live engine ready: results update as you type.";
  compute();
  registerServiceWorker();
}

function engineFailed(message) {
  document.body.dataset.engine = "failed";
  engineStatus.textContent = `The live engine could not start (${message}). The worked example below is still valid for its inputs; reload to try again.`;
  engineStatus.classList.add("engine-failed");
  registerServiceWorker();
}

// The first calculation is sent before the engine is ready: the worker
// queues calls until it is up and answers them in order, so the first live
// result does not wait for a round trip after "ready". Used only if the
// inputs are still the same when the engine is ready.
let early = null;
function sendEarly() {
  const inputs = readInputs();
  early = { key: JSON.stringify(inputs), reply: call("run", { calc: schema.name, inputs }) };
}

async function compute() {
  if (!ready) return;
  if (busy) {
    pending = true;
    return;
  }
  busy = true;
  pending = false;
  const inputs = readInputs();
  const sent = early && early.key === JSON.stringify(inputs) ? early.reply : null;
  early = null;
  const reply = await (sent ?? call("run", { calc: schema.name, inputs }));
  busy = false;
  if (pending) {
    compute();
    return;
  }
  render(reply);
}

// ---------- rendering (textContent only) ----------
function el(tag, cls, text) {
  const node = document.createElement(tag);
  if (cls) node.className = cls;
  if (text !== undefined && text !== null) node.textContent = String(text);
  return node;
}

function sourceNote(src) {
  if (!src) return null;
  const d = el("details", "src");
  d.appendChild(el("summary", null, "source"));
  d.appendChild(el("span", "src-text", src.text));
  if (src.confidence) {
    d.appendChild(document.createTextNode(" "));
    d.appendChild(el("span", `conf conf-${src.confidence}`, src.confidence));
  }
  return d;
}

function buildDisplay(d) {
  const frag = document.createDocumentFragment();
  if (d.verdict) {
    const p = el("p", `verdict verdict-${d.verdict.class}`);
    p.appendChild(el("strong", "verdict-label", d.verdict.label));
    p.appendChild(document.createTextNode(" "));
    p.appendChild(el("span", "verdict-reason", d.verdict.reason));
    frag.appendChild(p);
  }
  frag.appendChild(el("p", "headline", d.headline));
  for (const w of d.warnings || []) frag.appendChild(el("p", "warning", `⚠ ${w}`));
  for (const p of d.paragraphs || []) frag.appendChild(el("p", "reading", p));
  if ((d.rows || []).length) {
    const dl = el("dl", "values");
    for (const r of d.rows) {
      const row = el("div", "value-row");
      if (r.key) row.dataset.key = r.key;
      row.appendChild(el("dt", null, r.label));
      const dd = el("dd");
      dd.appendChild(el("span", "value", r.value));
      const s = sourceNote(r.source);
      if (s) dd.appendChild(s);
      row.appendChild(dd);
      dl.appendChild(row);
    }
    frag.appendChild(dl);
  }
  for (const c of d.charts || []) {
    const fig = el("figure", "chart");
    const img = document.createElement("img");
    img.alt = c.alt || c.title || "chart";
    img.src = `data:image/svg+xml;charset=utf-8,${encodeURIComponent(c.svg)}`;
    fig.appendChild(img);
    fig.appendChild(el("figcaption", null, c.title));
    frag.appendChild(fig);
  }
  for (const t of d.tables || []) {
    const sec = el("section", "table-block");
    if (t.key) sec.dataset.key = t.key;
    sec.appendChild(el("h3", null, t.title));
    if (t.filterable) {
      const lab = el("label", "filter", "Filter ");
      const inp = document.createElement("input");
      inp.type = "search";
      inp.className = "table-filter";
      inp.placeholder = "type to filter rows";
      lab.appendChild(inp);
      sec.appendChild(lab);
    }
    const scroll = el("div", "table-scroll");
    const table = el("table");
    const head = el("thead");
    const hr = el("tr");
    for (const col of t.columns) {
      const th = el("th", null, col);
      th.scope = "col";
      hr.appendChild(th);
    }
    if (t.sources) hr.appendChild(el("th", null, "Source"));
    head.appendChild(hr);
    table.appendChild(head);
    const body = el("tbody");
    t.rows.forEach((cells, i) => {
      const tr = el("tr");
      for (const cell of cells) tr.appendChild(el("td", null, cell));
      if (t.sources) {
        const td = el("td");
        const s = sourceNote(t.sources[i]);
        if (s) td.appendChild(s);
        tr.appendChild(td);
      }
      body.appendChild(tr);
    });
    table.appendChild(body);
    scroll.appendChild(table);
    sec.appendChild(scroll);
    if (t.note) sec.appendChild(el("p", "table-note", t.note));
    frag.appendChild(sec);
  }
  for (const n of d.notes || []) frag.appendChild(el("p", "note", n));
  return frag;
}

function clearFieldErrors() {
  for (const key of fields.keys()) {
    const e = document.getElementById(`e-${key}`);
    if (e) {
      e.hidden = true;
      e.textContent = "";
    }
    const c = control(key);
    if (c) c.removeAttribute("aria-invalid");
    const wrap = form.querySelector(`[data-field="${CSS.escape(key)}"]`);
    if (wrap) wrap.classList.remove("has-error");
  }
}

function showFieldError(err) {
  const key = err.field;
  const e = key && document.getElementById(`e-${key}`);
  if (!e) return false;
  e.textContent = err.message;
  e.hidden = false;
  control(key)?.setAttribute("aria-invalid", "true");
  form.querySelector(`[data-field="${CSS.escape(key)}"]`)?.classList.add("has-error");
  return true;
}

function render(reply) {
  clearFieldErrors();
  seq += 1;
  exampleLabel.hidden = true;
  const old = resultBody.querySelector(".result-error");
  if (old) old.remove();
  if (reply.ok && reply.result && reply.result.ok) {
    resultBody.replaceChildren(buildDisplay(reply.result.result.display));
    resultBox.dataset.state = "live";
  } else {
    const err = (reply.result && reply.result.error) || reply.error || { message: "unknown engine error" };
    const subs = err.errors && err.errors.length ? err.errors : [err];
    const unplaced = subs.filter((s) => !showFieldError(s));
    const box = el("div", "result-error");
    box.setAttribute("role", "alert");
    box.textContent = unplaced.length
      ? unplaced.map((s) => s.message).join(" ")
      : "Result not updated: correct the highlighted input (your entries are kept).";
    resultBody.prepend(box);
    resultBox.dataset.state = "error";
  }
  resultBox.dataset.resultSeq = String(seq);
  document.dispatchEvent(new CustomEvent("noblegap:result", { detail: reply })); // static/checkbar.js
  if (lastInputAt) {
    resultBox.dataset.latencyMs = (performance.now() - lastInputAt).toFixed(2);
  }
}

// ---------- events ----------
function onEdit() {
  lastInputAt = performance.now();
  // The call goes to the worker first; the URL is updated while it computes.
  compute();
  toURL();
}
form.addEventListener("input", onEdit);
form.addEventListener("change", onEdit);
form.addEventListener("submit", (ev) => ev.preventDefault());

document.addEventListener("input", (ev) => {
  const t = ev.target;
  if (!(t instanceof HTMLInputElement) || !t.classList.contains("table-filter")) return;
  const q = t.value.trim().toLowerCase();
  const block = t.closest(".table-block");
  for (const tr of block.querySelectorAll("tbody tr")) {
    tr.hidden = q !== "" && !tr.textContent.toLowerCase().includes(q);
  }
});

document.getElementById("share").addEventListener("click", async () => {
  toURL();
  const status = document.getElementById("share-status");
  try {
    await navigator.clipboard.writeText(location.href);
    status.textContent = "Link copied: it opens this check with these inputs.";
  } catch {
    status.textContent = `Copy this link: ${location.href}`;
  }
});

document.getElementById("reset").addEventListener("click", () => {
  for (const [key, value] of Object.entries(schema.example)) setControl(key, value);
  for (const [key, f] of fields) {
    if (!(key in schema.example)) setControl(key, f.default == null ? "" : String(f.default));
  }
  onEdit();
});

if (fromURL()) {
  exampleLabel.textContent = "Worked example for the default inputs, not yet yours: your result replaces it as soon as the engine is ready.";
  resultBox.dataset.state = "example-stale";
}
document.body.dataset.engine = "loading";

// What the worker said before this script took it over, in order.
for (const ev of takeEarly()) {
  if (ev.type === "error") worker.onerror(ev);
  else worker.onmessage(ev);
}
if (!ready && document.body.dataset.engine === "loading") sendEarly();
