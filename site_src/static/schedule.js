// The joint schedule page: a CSV table of joints through the engine in
// chunks (progress bar, cancel), a sortable table of verdicts and headline
// numbers with every row's errors in its row, the results as CSV, and the
// rows saved into a job. Parsing, running and writing the CSV are the core's
// (noblegap.schedule); this file moves text and renders with textContent.
import { connect } from "./engine-client.js";
import * as store from "./jobstore.js";

const $ = (id) => document.getElementById(id);
const titles = JSON.parse($("calc-titles").textContent);
const text = $("sched-text");
const runBtn = $("sched-run");
const cancelBtn = $("sched-cancel");
const statusEl = $("sched-status");
const fill = $("sched-fill");
const bar = $("sched-bar");
const errorEl = $("sched-error");
const rowsEl = $("sched-rows");

// Rows a message: small enough that cancel answers within a fraction of a
// second and the bar moves smoothly, large enough that the messages cost
// little. Two chunks are in flight so the engine never waits for the page.
const CHUNK_MS = 120;
const IN_FLIGHT = 2;

let engineReady = false;
let state = { columns: [], results: [], running: false, cancelled: false };
let sortKey = "line";
let sortDir = 1;

const client = connect({
  onProgress: (msg) => {
    const pct = Math.round(100 * Math.max(0, Math.min(1, msg.fraction || 0)));
    setBar(pct);
    statusEl.textContent = `Engine: ${msg.label || msg.phase}…`;
  },
  onReady: () => {
    engineReady = true;
    document.body.dataset.engine = "ready";
    setBar(0);
    statusEl.textContent = "Engine ready: open or paste a table, then “Check every joint”.";
  },
  onFatal: (message) => {
    document.body.dataset.engine = "failed";
    statusEl.textContent = `The engine could not start (${message}). Reload to try again; your table is kept.`;
  },
});

function setBar(pct) {
  fill.style.width = `${pct}%`;
  bar.setAttribute("aria-valuenow", String(pct));
}

function el(tag, cls, txt) {
  const node = document.createElement(tag);
  if (cls) node.className = cls;
  if (txt !== undefined && txt !== null) node.textContent = String(txt);
  return node;
}

function fmt(x, digits = 3) {
  if (x === undefined || x === null) return "";
  if (x === 0) return "0";
  const a = Math.abs(x);
  if (a >= 1e5 || a < 1e-3) return x.toExponential(2).replace("-", "−");
  return Number(x.toPrecision(digits)).toLocaleString("en", { maximumSignificantDigits: digits }).replace("-", "−");
}

const rate = (r) => r.numbers.penetration_mm_per_yr ?? r.numbers.penetration_mm_per_yr_initial;
// The potential difference with its range (best to worst case) where the check gives one.
function dvText(n) {
  if (n.delta_E_V_min != null && n.delta_E_V_max != null)
    return n.delta_E_V_min === n.delta_E_V_max ? fmt(n.delta_E_V_max) : `${fmt(n.delta_E_V_min)} to ${fmt(n.delta_E_V_max)}`;
  return fmt(n.delta_E_V);
}
function rateText(r) {
  const n = r.numbers;
  if (n.penetration_mm_per_yr_low != null && n.penetration_mm_per_yr_high != null)
    return `${fmt(n.penetration_mm_per_yr_low)} to ${fmt(n.penetration_mm_per_yr_high)}`;
  return fmt(rate(r));
}
const years = (r) => r.numbers.years_to_allowance ?? r.numbers.years_to_perforation;
const RANK = { avoid: 0, caution: 1, ok: 2, "": 3 };
const SORTS = {
  line: (r) => r.line,
  id: (r) => r.id.toLowerCase(),
  calc: (r) => r.calc,
  verdict: (r) => (r.status === "error" ? -1 : RANK[r.verdict_class] ?? 3),
  dv: (r) => r.numbers.delta_E_V_max ?? r.numbers.delta_E_V ?? -Infinity,
  rate: (r) => rate(r) ?? -Infinity,
  years: (r) => years(r) ?? Infinity,
  headline: (r) => (r.status === "error" ? errorText(r) : r.headline).toLowerCase(),
};

function errorText(r) {
  return r.errors
    .map((e) => `${e.field ? `${e.field}: ` : ""}${e.message}${e.allowed && !String(e.message).includes("Allowed:") ? ` Allowed: ${e.allowed}.` : ""}`)
    .join(" · ");
}

const LABELS = ["Line", "ID", "Check", "Verdict", "ΔV, V", "Rate, mm/yr", "Years", ""];
function rowNode(r) {
  const tr = el("tr", r.status === "error" ? "row-error" : "");
  tr.dataset.line = String(r.line);
  tr.dataset.status = r.status;
  tr.appendChild(el("td", "num", r.line));
  tr.appendChild(el("td", null, r.id));
  tr.appendChild(el("td", null, titles[r.calc] || r.calc));
  const v = el("td", `verdict-cell verdict-${r.verdict_class || "none"}`, r.status === "error" ? "Input error" : r.verdict || "—");
  tr.appendChild(v);
  tr.appendChild(el("td", "num", dvText(r.numbers)));
  tr.appendChild(el("td", "num", rateText(r)));
  tr.appendChild(el("td", "num", fmt(years(r))));
  const last = el("td", r.status === "error" ? "row-errors" : "row-headline", r.status === "error" ? errorText(r) : r.headline);
  if (r.status === "error") last.setAttribute("role", "note");
  tr.appendChild(last);
  [...tr.children].forEach((td, i) => {
    if (LABELS[i]) td.dataset.label = LABELS[i];
  });
  return tr;
}

function renderAll() {
  const sorted = [...state.results].sort((a, b) => {
    const x = SORTS[sortKey](a);
    const y = SORTS[sortKey](b);
    return (x < y ? -1 : x > y ? 1 : a.line - b.line) * sortDir;
  });
  const frag = document.createDocumentFragment();
  for (const r of sorted) frag.appendChild(rowNode(r));
  rowsEl.replaceChildren(frag);
}

for (const btn of document.querySelectorAll("#sched-table th button")) {
  btn.addEventListener("click", () => {
    const key = btn.dataset.sort;
    sortDir = key === sortKey ? -sortDir : 1;
    sortKey = key;
    for (const th of document.querySelectorAll("#sched-table th")) th.removeAttribute("aria-sort");
    btn.parentElement.setAttribute("aria-sort", sortDir > 0 ? "ascending" : "descending");
    renderAll();
  });
}

function summaryText(s, total, cancelled) {
  const labels = { ok: "acceptable", caution: "need care", avoid: "to avoid" };
  const parts = Object.entries(s.verdicts).map(([k, n]) => `${n} ${labels[k] || k}`);
  const head = cancelled ? `Cancelled after ${s.rows} of ${total} rows: ` : `${s.rows} rows: `;
  return `${head}${s.computed} computed${parts.length ? ` (${parts.join(", ")})` : ""}, ${s.errors} with errors${s.errors ? " — see the rows marked “Input error”" : ""}.`;
}

async function run() {
  if (state.running) return;
  errorEl.hidden = true;
  const { call } = await client;
  const source = text.value;
  state = { columns: [], results: [], running: true, cancelled: false };
  rowsEl.replaceChildren();
  $("sched-summary").textContent = "Reading the table…";
  $("sched-download").disabled = true;
  $("sched-save").disabled = true;
  document.body.dataset.schedule = "running";
  const parsed = await call("schedule", { op: "parse", text: source });
  const p = parsed.ok ? parsed.result : { ok: false, error: parsed.error };
  if (!p.ok) {
    errorEl.textContent = `${p.error.message}${p.error.allowed ? ` Allowed: ${p.error.allowed}.` : ""} Your table is kept; correct it and try again.`;
    errorEl.hidden = false;
    $("sched-summary").textContent = "No table checked.";
    state.running = false;
    document.body.dataset.schedule = "rejected";
    return;
  }
  state.columns = p.columns;
  const rows = p.rows;
  runBtn.disabled = true;
  cancelBtn.disabled = false;
  const t0 = performance.now();
  let next = 0;
  let size = 5;
  let doneRows = 0;
  const update = () => {
    const pct = Math.round((100 * doneRows) / rows.length);
    setBar(pct);
    const secs = (performance.now() - t0) / 1000;
    statusEl.textContent = `${doneRows} of ${rows.length} rows checked · ${secs > 0 ? Math.round(doneRows / secs) : 0} rows/s`;
  };
  const send = async () => {
    while (next < rows.length && !state.cancelled) {
      const chunk = rows.slice(next, next + size);
      next += chunk.length;
      const t = performance.now();
      const reply = await call("schedule", { op: "run", rows: chunk });
      const took = performance.now() - t;
      const results = reply.ok && reply.result.ok ? reply.result.results : chunk.map((r) => ({
        line: r.line, id: r.id, calc: r.calc, cells: r.cells, status: "error", verdict: "", verdict_class: "",
        headline: "", numbers: {}, warnings: [], inputs: {},
        errors: [{ field: null, message: `The engine failed on this row (${(reply.error && reply.error.message) || "unknown error"}).` }],
      }));
      state.results.push(...results);
      const frag = document.createDocumentFragment();
      for (const r of results) frag.appendChild(rowNode(r));
      rowsEl.appendChild(frag);
      doneRows += results.length;
      update();
      // Adapt the chunk to about CHUNK_MS of engine time.
      const per = took / chunk.length;
      size = Math.max(1, Math.min(200, Math.round(CHUNK_MS / Math.max(per, 0.2))));
    }
  };
  await Promise.all(Array.from({ length: IN_FLIGHT }, send));
  const secs = (performance.now() - t0) / 1000;
  state.results.sort((a, b) => a.line - b.line);
  // The rows arrived in line order (chunks are answered in the order sent):
  // redraw only if another sort is chosen, so a long table is not laid out twice.
  if (sortKey !== "line" || sortDir !== 1) renderAll();
  const sum = await call("schedule", { op: "summary", results: state.results });
  $("sched-summary").textContent = summaryText(sum.result.summary, rows.length, state.cancelled);
  statusEl.textContent = `${doneRows} of ${rows.length} rows in ${secs.toFixed(1)} s (${Math.round(doneRows / Math.max(secs, 1e-3))} rows/s)${state.cancelled ? " — cancelled" : ""}.`;
  document.body.dataset.rowsPerSecond = String(Math.round(doneRows / Math.max(secs, 1e-3)));
  document.body.dataset.schedule = state.cancelled ? "cancelled" : "done";
  state.running = false;
  runBtn.disabled = false;
  cancelBtn.disabled = true;
  $("sched-download").disabled = state.results.length === 0;
  $("sched-save").disabled = state.results.length === 0;
  fillJobs();
}

runBtn.addEventListener("click", run);
cancelBtn.addEventListener("click", () => {
  state.cancelled = true;
  cancelBtn.disabled = true;
  statusEl.textContent = "Cancelling after the rows in progress…";
});

$("sched-file").addEventListener("change", async (ev) => {
  const file = ev.target.files && ev.target.files[0];
  if (!file) return;
  try {
    const buf = await file.arrayBuffer();
    let t;
    try {
      t = new TextDecoder("utf-8", { fatal: true }).decode(buf);
    } catch {
      t = new TextDecoder("windows-1252").decode(buf);
      statusEl.textContent = `${file.name} is not UTF-8; it was read as Windows-1252.`;
    }
    text.value = t;
    document.body.dataset.fileLoaded = file.name;
  } catch (err) {
    errorEl.textContent = `The file ${file.name} could not be read (${err.message}).`;
    errorEl.hidden = false;
  }
});

$("sched-example").addEventListener("click", async () => {
  const res = await fetch($("template-link").getAttribute("href"));
  text.value = await res.text();
});

$("sched-download").addEventListener("click", async () => {
  const { call } = await client;
  const reply = await call("schedule", { op: "csv", results: state.results, columns: state.columns });
  if (!reply.ok || !reply.result.ok) return;
  const blob = new Blob([reply.result.csv], { type: "text/csv" });
  const a = el("a");
  a.href = URL.createObjectURL(blob);
  a.download = "joint-schedule-results.csv";
  document.body.appendChild(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(a.href), 10_000);
});

async function fillJobs() {
  const sel = $("sched-job");
  try {
    const jobs = await store.listJobs();
    const keep = sel.value;
    sel.replaceChildren(new Option("New job…", ""), ...jobs.map((j) => new Option(`${j.name} · ${j.count} checks`, j.id)));
    sel.value = jobs.some((j) => j.id === keep) ? keep : "";
    $("sched-job-name").hidden = sel.value !== "";
  } catch {
    sel.disabled = true;
  }
}
$("sched-job").addEventListener("change", () => {
  $("sched-job-name").hidden = $("sched-job").value !== "";
});

$("sched-save").addEventListener("click", async () => {
  const out = $("sched-save-status");
  try {
    let jobId = $("sched-job").value;
    if (!jobId) {
      const name = $("sched-job-name").value.trim();
      if (!name) {
        out.textContent = "Type a name for the new job (or choose a saved one).";
        return;
      }
      jobId = (await store.createJob({ name })).id;
    }
    const known = state.results.filter((r) => titles[r.calc]);
    await store.addChecks(jobId, known.map((r) => ({
      calc: r.calc,
      inputs: r.inputs,
      summary: {
        status: r.status,
        verdict_class: r.verdict_class,
        verdict: r.verdict,
        headline: r.status === "error" ? errorText(r) : r.headline,
        label: r.id || `line ${r.line}`,
      },
    })));
    const granted = await store.askPersistence();
    const skipped = state.results.length - known.length;
    out.textContent = `Saved ${known.length} rows as checks of the job${skipped ? ` (${skipped} rows name no known calculator and were not saved)` : ""}. ${store.persistenceText(granted)}`;
    document.body.dataset.savedRows = String(known.length);
    $("sched-job-name").value = "";
    await fillJobs();
  } catch (err) {
    out.textContent = `The rows were not saved (${err.message}).`;
  }
});

fillJobs();
