// Page script: schema-driven form <-> URL query <-> engine worker <-> result DOM.
// All computation happens in the Python core inside the worker; this file only
// moves inputs and renders the core's "display" structure with textContent.
//
// The result panel is in exactly one state at a time (#result data-state):
//   example  the worked example computed at build time, shown only while the
//            inputs on screen are the example's (and labelled as the example);
//   pending  your inputs are being computed (or wait for the engine): they
//            are echoed, and no number of any other inputs is on screen;
//   live     your result, for the inputs on screen; on a page whose
//            calculator has a headline path (schema.headline_path), a typed
//            edit shows it in two phases (#result data-phase): "headline"
//            (verdict, headline and range, weakest source, warnings; the
//            rest marked as being computed for these inputs, nothing of other
//            inputs), then "full"; only the full result reaches the job bar
//            (the "noblegap:result" event);
//   error    not computed: the marked field needs fixing (no verdict, no
//            numbers); also after a calculation overran or the engine failed
//            (data-reason says which).
import { registerServiceWorker } from "./register-sw.js";
import "./picker.js";
import { worker as firstWorker, takeEarly, restartWorker } from "./boot.js";
import NAMES from "./engine/names.json" with { type: "json" };

// Watchdog limits, stated to the user in the messages below.
const CALC_TIMEOUT_MS = 3000;          // one calculation, once the engine is live
const ENGINE_START_TIMEOUT_MS = 30000; // from opening the page to "ready"
const TYPING_PAUSE_MS = 800;           // an input error waits for this pause (or blur)
const ANNOUNCE_PAUSE_MS = 900;         // the live region speaks after this pause
const PENDING_AFTER_MS = 150;         // an older result is replaced by the echo after this
const UNITS_KEY = "noblegap.units";
const OVERRAN_TEXT = `A calculation took longer than ${CALC_TIMEOUT_MS / 1000} s and was stopped.`;

const schema = JSON.parse(document.getElementById("schema").textContent);
const form = document.getElementById("inputs");
const resultBox = document.getElementById("result");
const resultBody = document.getElementById("result-body");
const stateLabel = document.getElementById("example-label");
const engineStatus = document.getElementById("engine-status");
const progressFill = document.getElementById("progress-fill");
const progressBar = progressFill.parentElement;
const summary = document.getElementById("summary");
const announcer = document.getElementById("announce");
const unitsControl = document.getElementById("f-units");
const fields = new Map(schema.fields.map((f) => [f.key, f]));
const control = (key) => document.getElementById(`f-${key}`);

let worker = firstWorker;
let seq = 0;
let nextId = 1;
let busy = false;
let pending = false;
let ready = false;
let lastInputAt = 0;
let errorTimer = 0;
let announceTimer = 0;
let startTimer = 0;
let stalledKey = null; // inputs whose calculation overran: not retried until edited
let pendingError = null; // an input error held back while the person types
let early = null; // the first call, sent before the engine is ready
let headlineNext = false; // the next calculation is a typed edit's: headline first
const waiting = new Map();

// ---------- inputs and the URL ----------
function setControl(key, value) {
  const el = control(key);
  if (!el) return;
  if (el.tagName === "SELECT" && ![...el.options].some((o) => o.value === value)) {
    for (const o of el.querySelectorAll("option[data-unknown]")) o.remove();
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
  const u = unitsControl ? unitsControl.value : "auto";
  if (u && u !== "auto") out.units = u;
  return out;
}

const keyOf = (inputs) => JSON.stringify(inputs);

function fromURL() {
  const params = new URLSearchParams(location.search);
  let any = false;
  for (const key of fields.keys()) {
    if (params.has(key)) {
      setControl(key, params.get(key));
      any = true;
    }
  }
  if (unitsControl && params.has("units")) {
    const u = params.get("units");
    if ([...unitsControl.options].some((o) => o.value === u)) unitsControl.value = u;
  }
  return any;
}

function queryOf(inputs) {
  const params = new URLSearchParams();
  for (const [key, value] of Object.entries(inputs)) params.set(key, value);
  return `${location.pathname}?${params.toString()}`;
}

function toURL() {
  history.replaceState(null, "", queryOf(readInputs()));
}

// The inputs of the worked example, as the build put them on screen.
const exampleInputs = readInputs();
delete exampleInputs.units;
const exampleKey = keyOf(exampleInputs);
const exampleBody = resultBody.cloneNode(true);
const exampleSummary = summary?.querySelector(".summary-text")?.textContent ?? "";
const onExample = () => keyOf(readInputs()) === exampleKey;

// ---------- the engine worker ----------
function attach(w) {
  w.onerror = (ev) => {
    ev.preventDefault();
    engineFailed(ev.message || "the engine could not start");
  };
  w.onmessage = (ev) => {
    if (w !== worker) return;
    const msg = ev.data || {};
    if (msg.type === NAMES.messages.progress) return showProgress(msg);
    if (msg.type === NAMES.messages.ready) return engineReady(msg);
    if (msg.type === NAMES.messages.fatal) return engineFailed(msg.message);
    if (msg.type === NAMES.messages.notice) {
      engineStatus.textContent = `Live engine ready (${msg.note}).`;
      return undefined;
    }
    if (msg.id !== undefined && waiting.has(msg.id)) {
      const entry = waiting.get(msg.id);
      waiting.delete(msg.id);
      clearTimeout(entry.timer);
      entry.resolve(msg);
    }
  };
}

function armWatchdog(id) {
  const entry = waiting.get(id);
  if (!entry || entry.timer) return;
  entry.timer = setTimeout(() => overran(id), CALC_TIMEOUT_MS);
}

function call(fn, args) {
  const id = nextId++;
  return new Promise((resolve) => {
    waiting.set(id, { resolve, timer: 0, key: keyOf(args.inputs || {}) });
    worker.postMessage({ id, fn, args });
    if (ready) armWatchdog(id);
  });
}

// A calculation overran: end the worker, start a fresh one, keep the inputs.
function overran(id) {
  const entry = waiting.get(id);
  if (!entry) return;
  stalledKey = entry.key;
  early = null;
  for (const [, e] of waiting) clearTimeout(e.timer);
  const stranded = [...waiting.values()];
  waiting.clear();
  ready = false;
  worker = restartWorker();
  attach(worker);
  document.body.dataset.engine = "restarting";
  progressFill.style.width = "0%";
  engineStatus.classList.remove("engine-failed");
  engineStatus.textContent = `${OVERRAN_TEXT} The engine is restarting; your inputs are kept.`;
  armStartWatchdog();
  for (const e of stranded) e.resolve({ ok: false, stalled: true });
}

function showProgress(msg) {
  const pct = Math.round(100 * Math.max(0, Math.min(1, msg.fraction || 0)));
  progressFill.style.width = `${pct}%`;
  progressBar.setAttribute("aria-valuenow", String(pct));
  const restarting = document.body.dataset.engine === "restarting";
  engineStatus.textContent = restarting
    ? `${OVERRAN_TEXT} Engine restarting: ${msg.label || msg.phase}…`
    : `Engine: ${msg.label || msg.phase}…`;
  if (msg.phase) document.body.dataset.enginePhase = msg.phase;
}

function engineReady(msg) {
  ready = true;
  clearTimeout(startTimer);
  progressFill.style.width = "100%";
  progressBar.setAttribute("aria-valuenow", "100");
  const restarted = document.body.dataset.engine === "restarting";
  document.body.dataset.engine = "ready";
  if (msg && msg.mode) document.body.dataset.engineMode = msg.mode;
  engineStatus.classList.remove("engine-failed");
  engineStatus.textContent = restarted
    ? `${OVERRAN_TEXT} Live engine restarted: results update as you type.`
    : msg && msg.note ? `Live engine ready (${msg.note}).` : "Live engine ready: results update as you type.";
  for (const id of waiting.keys()) armWatchdog(id);
  // The offline copy is made after the first live result is on screen, so
  // its downloads never compete with the first visit's start.
  const first = compute();
  if (!restarted) first.then(registerServiceWorker, registerServiceWorker);
}

function engineFailed(message) {
  clearTimeout(startTimer);
  ready = false;
  early = null;
  document.body.dataset.engine = "failed";
  engineStatus.textContent =
    `The live engine could not start: ${message}. Check the connection and reload the page ` +
    "(after one complete visit the site also works offline). Your inputs are kept in the link.";
  engineStatus.classList.add("engine-failed");
  for (const [, e] of waiting) clearTimeout(e.timer);
  const stranded = [...waiting.values()];
  waiting.clear();
  for (const e of stranded) e.resolve({ ok: false, failed: true });
  showCurrent();
  registerServiceWorker();
}

function armStartWatchdog() {
  clearTimeout(startTimer);
  startTimer = setTimeout(() => {
    if (ready || document.body.dataset.engine === "failed") return;
    const phase = document.body.dataset.enginePhase;
    engineFailed(
      `it was not ready after ${ENGINE_START_TIMEOUT_MS / 1000} s` +
        (phase ? ` (stuck at: ${phase})` : "") +
        "; a runtime file may not have arrived",
    );
  }, ENGINE_START_TIMEOUT_MS);
}

// The first calculation is sent before the engine is ready: the worker
// queues calls until it is up and answers them in order, so the first live
// result does not wait for a round trip after "ready". Used only if the
// inputs are still the same when the engine is ready.
// A shared link's inputs (not the worked example, which is already on
// screen in full) go as two calls, the headline first, as a typed edit's do.
function sendEarly() {
  const inputs = readInputs();
  const headline = schema.headline_path === true && resultBox.dataset.state !== "example"
    ? call(NAMES.calls.run, { calc: schema.name, inputs, headline_only: true })
    : null;
  early = { key: keyOf(inputs), headline, reply: call(NAMES.calls.run, { calc: schema.name, inputs }) };
}

async function compute() {
  if (!ready) {
    showCurrent();
    return;
  }
  if (busy) {
    pending = true;
    return;
  }
  const inputs = readInputs();
  const key = keyOf(inputs);
  if (key === stalledKey) {
    showStalled();
    return;
  }
  busy = true;
  pending = false;
  // A typed edit and a shared link's first result show the headline first;
  // the worked example restored, Back or Undo wait for the whole result.
  const sentEarly = early && early.key === key ? early : null;
  early = null;
  const headlineFirst = sentEarly ? sentEarly.headline !== null : headlineNext && schema.headline_path === true;
  headlineNext = false;
  // A result of other inputs stays only for the blink of a fast answer.
  if (resultBox.dataset.state === "live" || resultBox.dataset.state === "example") {
    resultBox.classList.add("is-stale");
  }
  const pendTimer = setTimeout(() => showPending(inputs), PENDING_AFTER_MS);
  const superseded = () => pending || keyOf(readInputs()) !== key;
  let whole = sentEarly ? sentEarly.reply : null;
  if (headlineFirst) {
    // Both calls go at once: the worker starts the whole result as soon as
    // the headline is out, while this thread draws the headline.
    const firstReply = sentEarly ? sentEarly.headline : call(NAMES.calls.run, { calc: schema.name, inputs, headline_only: true });
    whole = whole ?? call(NAMES.calls.run, { calc: schema.name, inputs });
    const first = await firstReply;
    if (superseded()) {
      clearTimeout(pendTimer);
      resultBox.classList.remove("is-stale");
      busy = false;
      compute();
      return;
    }
    if (!(first.ok && first.result && first.result.ok)) {
      // Not computed (or stopped): shown as for a whole result; no second phase.
      clearTimeout(pendTimer);
      resultBox.classList.remove("is-stale");
      busy = false;
      if (first.stalled) return showStalled();
      if (first.failed) return showCurrent();
      render(first, inputs);
      return;
    }
    clearTimeout(pendTimer);
    resultBox.classList.remove("is-stale");
    renderHeadline(first);
  }
  const reply = await (whole ?? call(NAMES.calls.run, { calc: schema.name, inputs }));
  clearTimeout(pendTimer);
  resultBox.classList.remove("is-stale");
  busy = false;
  if (superseded()) {
    compute();
    return;
  }
  if (reply.stalled) return showStalled();
  if (reply.failed) return showCurrent();
  render(reply, inputs);
}

// ---------- rendering (textContent only) ----------
function el(tag, cls, text) {
  const node = document.createElement(tag);
  if (cls) node.className = cls;
  if (text !== undefined && text !== null) node.textContent = String(text);
  return node;
}

function sourceNote(src, what) {
  if (!src) return null;
  const d = el("details", "src");
  const s = el("summary", null, "source");
  s.setAttribute("aria-label", `source of ${what}`);
  d.appendChild(s);
  d.appendChild(el("span", "src-text", src.text));
  if (src.confidence) {
    d.appendChild(document.createTextNode(" "));
    d.appendChild(el("span", `conf conf-${src.confidence}`, src.confidence));
  }
  return d;
}

function fold(title, nodes, cls) {
  const d = el("details", `fold ${cls || ""}`.trim());
  d.appendChild(el("summary", null, title));
  for (const n of nodes) d.appendChild(n);
  return d;
}

// Links to the next check, kept only where this site has the page. A link
// that keeps the inputs (an alternative alloy on this page) carries all of
// the inputs on screen with its own changes.
function nextSteps(links) {
  const pages = new Set([...document.querySelectorAll(".top nav a")].map((a) => a.getAttribute("href")));
  const usable = (links || []).filter((l) => pages.has(l.page));
  if (!usable.length) return null;
  const nav = el("nav", "next-steps");
  nav.setAttribute("aria-label", "Next steps");
  nav.appendChild(el("h3", null, "Next steps"));
  let ul = null;
  let group;
  for (const l of usable) {
    if (!ul || (l.group || null) !== group) {
      group = l.group || null;
      if (group) nav.appendChild(el("h4", null, group));
      ul = nav.appendChild(el("ul"));
    }
    const li = el("li");
    const a = el("a", null, l.label);
    const mine = readInputs();
    const params = new URLSearchParams(l.keep ? { ...mine, ...l.inputs } : l.inputs || {});
    if (mine.units) params.set("units", mine.units);
    a.href = `${l.page}?${params.toString()}`;
    li.appendChild(a);
    ul.appendChild(li);
  }
  return nav;
}

// A chart comes in two drawings (wide, narrow); style.css shows the one that
// fits the column (a container query), scaled to the column's width.
function chartImage(c) {
  const fig = el("figure", c.narrow ? "chart chart-pair" : "chart");
  const drawings = [["chart-wide", c]];
  if (c.narrow) drawings.push(["chart-narrow", c.narrow]);
  for (const [cls, d] of drawings) {
    const box = el("div", `chart-scroll ${cls}`);
    const img = document.createElement("img");
    img.alt = c.alt || c.title || "chart";
    img.src = `data:image/svg+xml;charset=utf-8,${encodeURIComponent(d.svg)}`;
    if (d.min_width) img.dataset.minWidth = d.min_width;
    box.appendChild(img);
    fig.appendChild(box);
  }
  fig.appendChild(el("figcaption", null, c.title));
  return fig;
}

function buildTable(t) {
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
  scroll.tabIndex = 0;
  scroll.setAttribute("role", "region");
  scroll.setAttribute("aria-label", t.title);
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
    cells.forEach((cell, j) => {
      const td = el("td", null, cell);
      td.dataset.col = t.columns[j] ?? "";
      tr.appendChild(td);
    });
    if (t.sources) {
      const td = el("td");
      td.dataset.col = "Source";
      const s = sourceNote(t.sources[i], cells[0]);
      if (s) td.appendChild(s);
      tr.appendChild(td);
    }
    body.appendChild(tr);
  });
  table.appendChild(body);
  scroll.appendChild(table);
  sec.appendChild(scroll);
  if (t.note) sec.appendChild(el("p", "table-note", t.note));
  return sec;
}

function seriesFilters(v) {
  const frag = document.createDocumentFragment();
  const filters = el("div", "sview-filters");
  const famLabel = el("label", null, "Family ");
  const fam = el("select", "sview-family");
  fam.appendChild(Object.assign(el("option", null, "all families"), { value: "" }));
  for (const g of v.groups) fam.appendChild(Object.assign(el("option", null, g.name), { value: g.name }));
  famLabel.appendChild(fam);
  filters.appendChild(famLabel);
  for (const [cls, text] of [["sview-fasteners", "fastener grades only"], ["sview-stock", "what I can source"]]) {
    const lab = el("label", "sview-check");
    const cb = el("input", cls);
    cb.type = "checkbox";
    lab.appendChild(cb);
    lab.appendChild(document.createTextNode(` ${text}`));
    filters.appendChild(lab);
  }
  frag.appendChild(filters);
  const stock = el("div", "sview-stocklist");
  stock.hidden = true;
  stock.appendChild(el("p", "note", "Tick the alloys you can source (kept on this device):"));
  frag.appendChild(stock);
  return frag;
}

// The series view: families of alloys, each a foldable group of rows with
// the potential range drawn on one shared scale (see series.py, `view`).
function buildSeriesView(v) {
  const box = el("section", "sview");
  box.dataset.key = "series-view";
  box.appendChild(el("h3", null, v.title));
  if (v.window_text) box.appendChild(el("p", "sview-window", v.window_text));
  if (v.filters) box.appendChild(seriesFilters(v));
  for (const g of v.groups) {
    const d = el("details", "sview-group");
    d.dataset.family = g.name;
    if (g.open) d.open = true;
    const s = el("summary", null, `${g.name} (${g.rows.length})`);
    d.appendChild(s);
    const ul = el("ul", "sview-rows");
    for (const r of g.rows) {
      const li = el("li", `sview-row sview-${r.role}`);
      li.dataset.alloy = r.key;
      if (r.fastener) li.dataset.fastener = "1";
      const name = el("span", "sview-name", r.label);
      if (r.fastener) name.appendChild(el("span", "sview-tag", "fastener grade"));
      if (r.role !== "other") name.appendChild(el("span", "sview-role", r.role_text));
      li.appendChild(name);
      const track = el("span", "sview-track");
      track.setAttribute("aria-hidden", "true");
      if (v.window) {
        const w = el("span", "sview-win");
        w.dataset.x0 = v.window[0];
        w.dataset.x1 = v.window[1];
        track.appendChild(w);
      }
      const bar = el("span", "sview-bar");
      bar.dataset.x0 = r.x0;
      bar.dataset.x1 = r.x1;
      track.appendChild(bar);
      li.appendChild(track);
      li.appendChild(el("span", "sview-range", r.range));
      if (r.verdict) li.appendChild(el("span", `sview-verdict verdict-${r.verdict.class}`, r.verdict.label));
      ul.appendChild(li);
    }
    d.appendChild(ul);
    box.appendChild(d);
  }
  if (v.axis) box.appendChild(el("p", "sview-axis", v.axis));
  if (v.citation) box.appendChild(el("p", "table-note", v.citation));
  return box;
}

// Positions and sizes travel as data attributes (the page's CSP allows no
// inline style attributes); they are applied here through the CSSOM.
function place(root) {
  for (const n of root.querySelectorAll(".sview-bar, .sview-win")) {
    const x0 = Number(n.dataset.x0);
    const x1 = Number(n.dataset.x1);
    n.style.left = `${x0}%`;
    n.style.width = `${Math.max(x1 - x0, n.classList.contains("sview-bar") ? 1 : 0.5)}%`;
  }
  for (const img of root.querySelectorAll("img[data-min-width]")) img.style.minWidth = `${img.dataset.minWidth}px`;
}

// Where the whole result's charts, tables and next steps will be, while they
// are computed for the inputs on screen (the headline phase).
function comingNote() {
  const box = el("section", "result-coming");
  box.setAttribute("aria-busy", "true");
  box.appendChild(el("p", "coming-text",
    "Still being computed for these inputs: the charts, the tables of other choices and mitigations, and the next steps."));
  return box;
}

// coming: the headline phase (the rest is marked as still being computed).
function buildDisplay(d, coming = false) {
  const frag = document.createDocumentFragment();
  if (d.verdict) {
    const p = el("p", `verdict verdict-${d.verdict.class}`);
    p.appendChild(el("strong", "verdict-label", d.verdict.label));
    p.appendChild(document.createTextNode(" "));
    p.appendChild(el("span", "verdict-reason", d.verdict.reason));
    frag.appendChild(p);
  }
  frag.appendChild(el("p", "headline", d.headline));
  const hc = d.headline_confidence;
  if (hc) {
    const basis = el("p", "headline-basis");
    basis.dataset.confidence = hc.level;
    basis.appendChild(el("span", `conf conf-${hc.level}`, hc.level));
    basis.appendChild(document.createTextNode(" "));
    basis.appendChild(el("span", "basis-text", hc.line));
    frag.appendChild(basis);
  }
  for (const w of d.warnings || []) frag.appendChild(el("p", "warning", `⚠ ${w}`));
  if (d.view) frag.appendChild(buildSeriesView(d.view));
  if ((d.paragraphs || []).length) {
    frag.appendChild(fold("What this means", d.paragraphs.map((p) => el("p", "reading", p)), "fold-reading"));
  }
  if ((d.rows || []).length) {
    const dl = el("dl", "values");
    for (const r of d.rows) {
      const row = el("div", "value-row");
      if (r.key) row.dataset.key = r.key;
      row.appendChild(el("dt", null, r.label));
      const dd = el("dd");
      dd.appendChild(el("span", "value", r.value));
      const s = sourceNote(r.source, r.label);
      if (s) dd.appendChild(s);
      row.appendChild(dd);
      dl.appendChild(row);
    }
    frag.appendChild(dl);
  }
  if (coming) frag.appendChild(comingNote());
  for (const c of d.charts || []) frag.appendChild(chartImage(c));
  for (const t of d.tables || []) frag.appendChild(buildTable(t));
  const steps = nextSteps(d.links);
  if (steps) frag.appendChild(steps);
  if ((d.notes || []).length) frag.appendChild(fold("Notes", d.notes.map((n) => el("p", "note", n)), "fold-notes"));
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

// "read as …" beside each typed field, from the core's inputs_read, so a misread cannot hide.
function showReadAs(readAs) {
  for (const key of fields.keys()) {
    const c = control(key);
    if (!c || c.tagName === "SELECT") continue;
    let p = document.getElementById(`r-${key}`);
    const text = readAs && readAs[key];
    if (!p && text) {
      p = el("p", "read-as");
      p.id = `r-${key}`;
      p.setAttribute("aria-live", "off");
      c.insertAdjacentElement("afterend", p);
    }
    if (p) {
      const show = text && text.trim() !== String(c.value).trim();
      p.textContent = show ? `read as ${text}` : "";
      p.hidden = !show;
    }
  }
}

// What the user entered, as the page shows it (labels for lists, never ids).
function echo(inputs) {
  const dl = el("dl", "echo");
  for (const [key, f] of fields) {
    const c = control(key);
    if (!c) continue;
    let shown = inputs[key];
    if (c.tagName === "SELECT") shown = c.options[c.selectedIndex]?.textContent ?? shown;
    if (shown === "" || shown === undefined) shown = "(empty)";
    const row = el("div", "echo-row");
    row.appendChild(el("dt", null, f.label));
    row.appendChild(el("dd", null, shown));
    dl.appendChild(row);
  }
  return dl;
}

function setSummary(state, verdict, headline) {
  if (!summary) return;
  summary.dataset.state = state;
  summary.replaceChildren();
  if (verdict) summary.appendChild(el("strong", `summary-verdict verdict-${verdict.class}`, verdict.label));
  summary.appendChild(el("span", "summary-text", headline));
}

// phase: "headline" or "full" for a live result (see the top of this file).
function setState(state, label, reason, phase = "full") {
  seq += 1;
  resultBox.dataset.state = state;
  if (state === "live") resultBox.dataset.phase = phase;
  else delete resultBox.dataset.phase;
  if (reason) resultBox.dataset.reason = reason;
  else delete resultBox.dataset.reason;
  stateLabel.textContent = label || "";
  stateLabel.hidden = !label;
  stateLabel.className = `example-label state-${state}`;
  resultBox.dataset.resultSeq = String(seq);
  if (lastInputAt) {
    const ms = (performance.now() - lastInputAt).toFixed(2);
    resultBox.dataset.latencyMs = ms;
    if (phase === "headline" && state === "live") resultBox.dataset.headlineLatencyMs = ms;
  }
}

function showExample() {
  clearFieldErrors();
  const failed = document.body.dataset.engine === "failed";
  resultBody.replaceChildren(...exampleBody.cloneNode(true).childNodes);
  place(resultBody);
  setState(
    "example",
    failed
      ? "Only the worked example, for the example inputs shown: the live engine did not start, so nothing else can be computed until it does."
      : "Worked example: the result for the example inputs shown, computed when this site was built.",
  );
  const v = resultBody.querySelector(".verdict");
  setSummary(
    "example",
    v ? { class: [...v.classList].find((c) => c.startsWith("verdict-"))?.slice(8), label: v.querySelector(".verdict-label")?.textContent } : null,
    exampleSummary,
  );
}

function showPending(inputs) {
  const engineState = document.body.dataset.engine;
  let label;
  if (engineState === "failed") label = "Not computed: the live engine did not start (see above). Your inputs:";
  else if (!ready) label = "Your inputs (kept): they are computed as soon as the engine is ready.";
  else label = "Computing your inputs…";
  resultBody.replaceChildren(echo(inputs));
  setState(engineState === "failed" ? "error" : "pending", label, engineState === "failed" ? "engine" : null);
  setSummary("pending", null, engineState === "failed" ? "Not computed (engine not started)"
    : ready ? "Computing your inputs…" : "Your inputs: computed once the engine is ready");
}

// Before the engine can answer: the example if these are its inputs, else an echo.
function showCurrent() {
  if (onExample()) showExample();
  else showPending(readInputs());
}

function showStalled() {
  clearFieldErrors();
  const box = el("div", "result-error", `Not computed: the calculation for these inputs took longer than ${CALC_TIMEOUT_MS / 1000} s and was stopped. Check the values (an unusually long or large entry?) and change one to try again.`);
  box.setAttribute("role", "alert");
  resultBody.replaceChildren(box, echo(readInputs()));
  setState("error", "Not computed: the calculation overran.", "timeout");
  setSummary("error", null, "Not computed: the calculation overran");
}

function renderError(err, inputs) {
  clearTimeout(errorTimer);
  clearFieldErrors();
  const subs = err.errors && err.errors.length ? err.errors : [err];
  const unplaced = subs.filter((s) => !showFieldError(s));
  const box = el("div", "result-error");
  box.setAttribute("role", "alert");
  box.textContent = unplaced.length
    ? `Not computed: ${unplaced.map((s) => s.message).join(" ")}`
    : "Not computed: correct the marked input (your entries are kept).";
  resultBody.replaceChildren(box, echo(inputs));
  setState("error", "Not computed: fix the marked field.");
  setSummary("error", null, "Not computed: fix the marked field");
}

// The headline phase of a typed edit: the reply of a headline-only run.
// Not announced to the job bar: saving, printing and comparing wait for the whole result.
function renderHeadline(reply) {
  clearTimeout(errorTimer);
  showReadAs(reply.result.inputs_read);
  clearFieldErrors();
  const d = reply.result.result.display;
  resultBody.replaceChildren(buildDisplay(d, true));
  place(resultBody);
  setState("live", "", null, "headline");
  setSummary("live", d.verdict, d.summary || d.headline);
}

function render(reply, inputs) {
  clearTimeout(errorTimer);
  showReadAs((reply.result || reply.response || {}).inputs_read);
  document.dispatchEvent(new CustomEvent("noblegap:result", { detail: reply })); // static/checkbar.js
  if (reply.ok && reply.result && reply.result.ok) {
    clearFieldErrors();
    const d = reply.result.result.display;
    resultBody.replaceChildren(buildDisplay(d));
    place(resultBody);
    setState("live", "");
    setSummary("live", d.verdict, d.summary || d.headline);
    announceSoon(d);
    return;
  }
  const err = (reply.result && reply.result.error) || reply.error || { message: "unknown engine error" };
  // While the person is still typing in a field, wait for a pause or blur.
  const typing = document.activeElement && form.contains(document.activeElement) &&
    document.activeElement.tagName === "INPUT" &&
    performance.now() - lastInputAt < TYPING_PAUSE_MS;
  if (typing) {
    showPending(inputs);
    stateLabel.textContent = "Waiting for you to finish typing…";
    const shownKey = keyOf(inputs);
    errorTimer = setTimeout(() => {
      if (keyOf(readInputs()) === shownKey) renderError(err, inputs);
    }, TYPING_PAUSE_MS);
    pendingError = { err, inputs, key: shownKey };
    return;
  }
  renderError(err, inputs);
}

function announceSoon(d) {
  clearTimeout(announceTimer);
  announceTimer = setTimeout(() => {
    if (!announcer || resultBox.dataset.state !== "live") return;
    const v = d.verdict ? `${d.verdict.label}. ` : "";
    announcer.textContent = `Result updated. ${v}${d.headline}`;
  }, ANNOUNCE_PAUSE_MS);
}

// ---------- events ----------
function onEdit(ev) {
  lastInputAt = performance.now();
  delete resultBox.dataset.headlineLatencyMs;
  // Typed or picked in the form: the headline first; any other call of onEdit
  // (the example restored, Undo, Back) waits for the whole result.
  headlineNext = Boolean(ev && ev.type === "input");
  stalledKey = null;
  pendingError = null;
  clearTimeout(errorTimer);
  // The call goes to the worker first; the URL is updated while it computes.
  if (ready) {
    compute();
  } else {
    showCurrent();
  }
  toURL();
}
form.addEventListener("input", onEdit);
// Leaving a field (change on blur, focusout) shows a held-back error at once.
const flushError = () => {
  if (pendingError && pendingError.key === keyOf(readInputs())) {
    renderError(pendingError.err, pendingError.inputs);
    pendingError = null;
  }
};
form.addEventListener("change", flushError);
form.addEventListener("focusout", flushError);
form.addEventListener("submit", (ev) => ev.preventDefault());

if (unitsControl) {
  unitsControl.addEventListener("change", () => {
    try {
      localStorage.setItem(UNITS_KEY, unitsControl.value);
    } catch {
      /* storage may be unavailable (private mode): the link still carries it */
    }
  });
}

document.addEventListener("input", (ev) => {
  const t = ev.target;
  if (!(t instanceof HTMLInputElement) || !t.classList.contains("table-filter")) return;
  const q = t.value.trim().toLowerCase();
  const block = t.closest(".table-block");
  for (const tr of block.querySelectorAll("tbody tr")) {
    tr.hidden = q !== "" && !tr.textContent.toLowerCase().includes(q);
  }
});

// Series view filters (family, fastener grades, what the user can source).
const STOCK_KEY = "noblegap.stock";
function stockSet() {
  try {
    return new Set(JSON.parse(localStorage.getItem(STOCK_KEY) || "[]"));
  } catch {
    return new Set();
  }
}
function applySeriesFilters(view) {
  const fam = view.querySelector(".sview-family").value;
  const onlyFast = view.querySelector(".sview-fasteners").checked;
  const onlyStock = view.querySelector(".sview-stock").checked;
  const stock = stockSet();
  for (const g of view.querySelectorAll(".sview-group")) {
    g.hidden = fam !== "" && g.dataset.family !== fam;
    if (fam !== "" && g.dataset.family === fam) g.open = true;
    for (const r of g.querySelectorAll(".sview-row")) {
      const mine = !r.classList.contains("sview-other");
      r.hidden = !mine && ((onlyFast && !r.dataset.fastener) || (onlyStock && !stock.has(r.dataset.alloy)));
    }
  }
  const list = view.querySelector(".sview-stocklist");
  list.hidden = !onlyStock;
  if (onlyStock && !list.querySelector("input")) {
    const stock2 = stockSet();
    for (const r of view.querySelectorAll(".sview-row")) {
      const lab = el("label", "sview-check");
      const cb = el("input");
      cb.type = "checkbox";
      cb.value = r.dataset.alloy;
      cb.checked = stock2.has(r.dataset.alloy);
      lab.appendChild(cb);
      lab.appendChild(document.createTextNode(` ${r.querySelector(".sview-name").firstChild.textContent}`));
      list.appendChild(lab);
    }
  }
}
resultBody.addEventListener("change", (ev) => {
  const view = ev.target.closest(".sview");
  if (!view) return;
  if (ev.target.closest(".sview-stocklist")) {
    const s = stockSet();
    if (ev.target.checked) s.add(ev.target.value);
    else s.delete(ev.target.value);
    try {
      localStorage.setItem(STOCK_KEY, JSON.stringify([...s]));
    } catch {
      /* kept for this page only */
    }
  }
  applySeriesFilters(view);
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

// "Back to the example" keeps the user's check: the browser's Back button
// returns to it, and an Undo button restores it at once.
function applyInputs(inputs) {
  for (const key of fields.keys()) {
    const f = fields.get(key);
    const v = key in inputs ? inputs[key] : f.default == null ? "" : String(f.default);
    setControl(key, v);
  }
}
document.getElementById("reset").addEventListener("click", () => {
  const mine = readInputs();
  const status = document.getElementById("share-status");
  if (keyOf(mine) !== exampleKey) {
    history.replaceState(null, "", queryOf(mine));
    applyInputs(exampleInputs);
    history.pushState(null, "", queryOf(readInputs()));
    status.replaceChildren(document.createTextNode("Example restored; your check is one step back. "));
    const undo = el("button", "btn btn-quiet btn-undo", "Undo");
    undo.type = "button";
    undo.addEventListener("click", () => {
      applyInputs(mine);
      status.textContent = "Your check is back.";
      onEdit();
    });
    status.appendChild(undo);
  } else {
    applyInputs(exampleInputs);
  }
  onEdit();
});
window.addEventListener("popstate", () => {
  applyInputs({});
  fromURL();
  onEdit();
});

// ---------- start ----------
try {
  const saved = localStorage.getItem(UNITS_KEY);
  if (unitsControl && saved && [...unitsControl.options].some((o) => o.value === saved)) unitsControl.value = saved;
} catch {
  /* no storage: the default (follow what you type) */
}
fromURL();
if (!onExample()) showPending(readInputs());
else showExample();
document.body.dataset.engine = "loading";
attach(worker);
armStartWatchdog();

// What the worker said before this script took it over, in order.
for (const ev of takeEarly()) {
  if (ev.type === "error") worker.onerror(ev);
  else worker.onmessage(ev);
}
if (!ready && document.body.dataset.engine === "loading") sendEarly();
