// The saved-jobs page: list, open, rename, duplicate, delete (with undo),
// export and import jobs; reopen a check; print a job's sheets.
import * as store from "./jobstore.js";
import { checkSheet, coverSheet, dateText, qrFor } from "./sheet.js";

const calculators = JSON.parse(document.getElementById("calculators").textContent);
const byName = new Map(calculators.map((c) => [c.name, c]));
const names = calculators.map((c) => c.name);
const $ = (id) => document.getElementById(id);
const sheetHost = $("sheet-host");
const version = sheetHost.dataset.version;

let openId = new URLSearchParams(location.search).get("job");
let undo = null;

function el(tag, cls, text) {
  const node = document.createElement(tag);
  if (cls) node.className = cls;
  if (text !== undefined && text !== null) node.textContent = String(text);
  return node;
}

function button(text, onClick, cls = "btn btn-quiet btn-small") {
  const b = el("button", cls, text);
  b.type = "button";
  b.addEventListener("click", onClick);
  return b;
}

function when(iso) {
  const d = new Date(iso);
  return Number.isNaN(d.getTime()) ? "" : dateText(d);
}

function message(text, isError = false) {
  const p = $("import-status");
  p.textContent = text;
  p.hidden = !text;
  p.classList.toggle("job-error", isError);
}

function showUndo(text, removed) {
  undo = removed;
  $("undo-text").textContent = text;
  $("undo-bar").hidden = false;
}

$("undo-btn").addEventListener("click", async () => {
  if (!undo) return;
  const removed = undo;
  undo = null;
  $("undo-bar").hidden = true;
  await store.restore(removed);
  await refresh();
});

async function refresh() {
  const jobs = await store.listJobs();
  const list = $("job-list");
  list.replaceChildren();
  $("no-jobs").hidden = jobs.length > 0;
  for (const job of jobs) {
    const li = el("li", "job-item");
    li.dataset.jobId = job.id;
    if (job.id === openId) li.classList.add("is-open");
    const head = el("div", "job-head");
    const open = el("a", "job-name", job.name);
    open.href = `jobs.html?job=${encodeURIComponent(job.id)}`;
    open.addEventListener("click", (ev) => {
      ev.preventDefault();
      openJob(job.id);
    });
    head.appendChild(open);
    if (job.reference) head.appendChild(el("span", "job-reference", job.reference));
    li.appendChild(head);
    li.appendChild(el("p", "job-info", `${job.count} check${job.count === 1 ? "" : "s"} · last saved ${when(job.last_saved)}`));
    const acts = el("div", "job-actions");
    acts.appendChild(button("Rename", () => rename(job)));
    acts.appendChild(button("Duplicate", async () => {
      const copy = await store.duplicateJob(job.id);
      message(`Duplicated as “${copy.name}”.`);
      await refresh();
    }));
    acts.appendChild(button("Export", () => exportJob(job.id)));
    acts.appendChild(button("Delete", async () => {
      const removed = await store.deleteJob(job.id);
      if (openId === job.id) closeJob();
      showUndo(`Deleted the job “${job.name}” and its ${removed.checks.length} check(s).`, removed);
      await refresh();
    }));
    li.appendChild(acts);
    list.appendChild(li);
  }
  if (openId) await showJob(openId);
  document.body.dataset.jobs = String(jobs.length);
}

async function rename(job) {
  const name = prompt("New name for this job", job.name);
  if (name === null) return;
  if (!name.trim()) {
    message("A job needs a name: the name was not changed.", true);
    return;
  }
  await store.updateJob(job.id, { name });
  await refresh();
}

function closeJob() {
  openId = null;
  $("job-detail").hidden = true;
  history.replaceState(null, "", "jobs.html");
}

async function openJob(id) {
  openId = id;
  history.replaceState(null, "", `jobs.html?job=${encodeURIComponent(id)}`);
  await refresh();
  $("job-detail").scrollIntoView({ block: "start" });
}

async function showJob(id) {
  const got = await store.getJob(id);
  if (!got) {
    closeJob();
    return;
  }
  const { job, checks } = got;
  $("job-detail").hidden = false;
  $("job-detail").dataset.jobId = job.id;
  $("job-title").textContent = job.name;
  $("job-ref").textContent = job.reference ? `Reference: ${job.reference}` : "";
  const notes = $("job-notes");
  if (document.activeElement !== notes) notes.value = job.notes || "";
  const rows = $("check-rows");
  rows.replaceChildren();
  $("no-checks").hidden = checks.length > 0;
  for (const c of checks) {
    const tr = el("tr");
    tr.dataset.checkId = c.id;
    tr.appendChild(el("td", null, when(c.saved_at)));
    const calc = byName.get(c.calc);
    const label = c.summary.label ? ` — ${c.summary.label}` : "";
    tr.appendChild(el("td", null, `${calc ? calc.title : c.calc}${label}${c.variants ? ` (compared: ${c.variants.length} variants)` : ""}`));
    tr.appendChild(el("td", `verdict-cell verdict-${c.summary.verdict_class || "none"}`, c.summary.verdict || (c.summary.status === "error" ? "input error" : "—")));
    tr.appendChild(el("td", "check-headline", c.summary.headline));
    const td = el("td", "check-actions");
    const reopen = el("a", "btn btn-small", "Reopen");
    reopen.href = store.checkLink(c);
    // The calculator page prints this job's name on the check's sheet.
    reopen.addEventListener("click", () => sessionStorage.setItem("noblegap-current-job", job.id));
    td.appendChild(reopen);
    td.appendChild(button("Remove", async () => {
      const rec = await store.deleteCheck(c.id);
      showUndo("Removed a check from the job.", { checks: [rec] });
      await refresh();
    }));
    tr.appendChild(td);
    rows.appendChild(tr);
  }
}

let notesTimer = null;
$("job-notes").addEventListener("input", () => {
  clearTimeout(notesTimer);
  $("notes-status").textContent = "Saving…";
  notesTimer = setTimeout(async () => {
    await store.updateJob(openId, { notes: $("job-notes").value });
    $("notes-status").textContent = "Notes saved.";
  }, 300);
});

$("new-job").addEventListener("submit", async (ev) => {
  ev.preventDefault();
  const name = $("new-job-name").value.trim();
  if (!name) {
    message("Type a name for the new job.", true);
    return;
  }
  const job = await store.createJob({ name, reference: $("new-job-ref").value });
  $("new-job-name").value = "";
  $("new-job-ref").value = "";
  message(`Created the job “${job.name}”.`);
  await persist();
  await openJob(job.id);
});

async function exportJob(id) {
  const data = await store.exportJob(id, version);
  const blob = new Blob([JSON.stringify(data, null, 1)], { type: "application/json" });
  const a = el("a");
  a.href = URL.createObjectURL(blob);
  a.download = store.fileName(data.job);
  document.body.appendChild(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(a.href), 10_000);
  message(`Exported “${data.job.name}” as ${a.download}.`);
}
$("job-export").addEventListener("click", () => openId && exportJob(openId));

function askClash(name) {
  const dlg = $("clash-dialog");
  $("clash-text").textContent = `A job named “${name}” is already saved on this device. Keep both (the imported one is renamed), or replace the saved one with the file?`;
  return new Promise((resolve) => {
    dlg.addEventListener("close", () => resolve(dlg.returnValue || "cancel"), { once: true });
    dlg.showModal();
  });
}

$("import-file").addEventListener("change", async (ev) => {
  const file = ev.target.files && ev.target.files[0];
  ev.target.value = "";
  if (!file) return;
  let text;
  try {
    text = await file.text();
  } catch (err) {
    message(`The file “${file.name}” could not be read (${err.message}). Nothing was changed.`, true);
    return;
  }
  const parsed = store.parseJobFile(text, names);
  if (!parsed.ok) {
    message(`${file.name}: ${parsed.message} Nothing was changed.`, true);
    document.body.dataset.importResult = "rejected";
    return;
  }
  const clash = await store.findJobsByName(parsed.data.job.name);
  let mode = "keep";
  if (clash.length) {
    mode = await askClash(parsed.data.job.name);
    if (mode === "cancel") {
      message("Import cancelled. Nothing was changed.");
      document.body.dataset.importResult = "cancelled";
      return;
    }
  }
  try {
    const job = await store.importJob(parsed.data, mode, mode === "replace" ? clash[0].id : null);
    message(`Imported “${job.name}” with ${parsed.data.checks.length} check(s).`);
    document.body.dataset.importResult = "imported";
    await persist();
    await openJob(job.id);
  } catch (err) {
    message(`The job could not be saved (${err.message}). Nothing was changed.`, true);
    document.body.dataset.importResult = "failed";
  }
});

// ---------- printing a whole job ----------
$("job-print").addEventListener("click", async () => {
  const got = openId && (await store.getJob(openId));
  if (!got) return;
  const btn = $("job-print");
  btn.disabled = true;
  const old = btn.textContent;
  btn.textContent = "Preparing the sheets…";
  try {
    const { connect } = await import("./engine-client.js");
    const { call } = await connect();
    const date = dateText();
    const items = [];
    const sheets = [];
    for (const c of got.checks) {
      const schema = byName.get(c.calc);
      const link = store.checkLink(c);
      const [reply, qrSvg] = await Promise.all([call("run", { calc: c.calc, inputs: c.inputs }), qrFor(call, link)]);
      const res = reply.ok && reply.result && reply.result.ok ? reply.result : null;
      const display = res ? res.result.display : null;
      const inputs = res ? res.inputs : c.inputs;
      let compare = null;
      if (display && c.variants && c.variants.length) {
        const { compareTable } = await import("./compare.js");
        compare = await compareTable(call, c.calc, c.inputs, c.variants);
      }
      items.push({
        title: schema.title + (c.summary.label ? ` — ${c.summary.label}` : ""),
        verdict: display && display.verdict ? display.verdict.label : "",
        verdictClass: display && display.verdict ? display.verdict.class : "",
        headline: display ? display.headline : (reply.error && reply.error.message) || "not computed",
        saved: when(c.saved_at),
      });
      sheets.push(checkSheet({ schema, inputs, display, error: reply.error && reply.error.message, job: got.job, link, qrSvg, version, date, compare }));
    }
    sheetHost.replaceChildren(coverSheet(got.job, items, { date, version }), ...sheets);
    document.documentElement.classList.add("has-sheet");
    document.body.dataset.sheet = "ready";
    window.print();
  } finally {
    btn.disabled = false;
    btn.textContent = old;
  }
});

async function persist() {
  const granted = await store.askPersistence();
  $("store-status").textContent = store.persistenceText(granted);
  document.body.dataset.persist = String(granted);
}

(async () => {
  try {
    await store.openStore();
    await refresh();
    // With jobs saved, ask (again) for persistent storage and say the answer;
    // browsers decide without a prompt, or remember the user's choice.
    if (Number(document.body.dataset.jobs) > 0) await persist();
    else $("store-status").textContent = "Saved jobs are kept in this browser. Persistent storage is asked for when you first save.";
    document.body.dataset.jobsReady = "1";
  } catch (err) {
    $("store-status").textContent = `Saved jobs are not available in this browser (${err.message}). Private windows may block storage.`;
    $("store-status").classList.add("job-error");
    document.body.dataset.jobsReady = "failed";
  }
})();
