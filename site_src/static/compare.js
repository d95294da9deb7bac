// Alternatives side by side on the fastener (and joint) page: the current
// design and up to three variants (another fastener alloy, isolated, cathode
// coated, sacrificial anode added) as columns, computed by the core
// (noblegap.compare) with the same geometry. The chosen variants go into the
// link (?compare=...) and into a saved check.
import { connect } from "./engine-client.js";

const MAX_VARIANTS = 3;
const FIXED = [
  ["isolate", "Electrically isolated"],
  ["coat_cathode", "Cathode coated"],
  ["anode", "Sacrificial anode added"],
];

function el(tag, cls, text) {
  const node = document.createElement(tag);
  if (cls) node.className = cls;
  if (text !== undefined && text !== null) node.textContent = String(text);
  return node;
}

function num(x) {
  if (x === null || x === undefined) return "—";
  if (x === 0) return "0";
  return Number(x.toPrecision(3)).toLocaleString("en", { maximumSignificantDigits: 3 });
}

/** The columns as a table (rows: verdict, rate, years, note). */
export function tableOf(columns) {
  const table = el("table", "compare-table");
  const head = el("thead");
  const hr = el("tr");
  hr.appendChild(el("th", null, ""));
  for (const c of columns) {
    const th = el("th", null, c.title);
    th.scope = "col";
    th.dataset.variant = c.id;
    hr.appendChild(th);
  }
  head.appendChild(hr);
  table.appendChild(head);
  const body = el("tbody");
  const row = (label, cell) => {
    const tr = el("tr");
    const th = el("th", null, label);
    th.scope = "row";
    tr.appendChild(th);
    for (const c of columns) tr.appendChild(cell(c));
    body.appendChild(tr);
  };
  row("Verdict", (c) => el("td", `verdict-cell verdict-${c.verdict_class || "none"}`, c.available ? c.verdict || "—" : "not computed"));
  row("Local rate, mm/yr", (c) => {
    if (!c.available) return el("td", null, "—");
    const range = c.rate_low_mm_per_yr != null && c.rate_high_mm_per_yr != null ? `${num(c.rate_low_mm_per_yr)} to ${num(c.rate_high_mm_per_yr)}` : num(c.rate_mm_per_yr);
    return el("td", "num", range);
  });
  row("Years to the allowance", (c) => el("td", null, c.available ? c.life_text || num(c.years_to_allowance) : "—"));
  row("Note", (c) => el("td", "compare-note", c.note || ""));
  table.appendChild(body);
  return table;
}

/** For a printed job: the comparison of a saved check, as a block. */
export async function compareTable(call, calc, inputs, variants) {
  const reply = await call("compare", { calc, inputs, variants });
  const out = reply.ok ? reply.result : null;
  const box = el("div", "sheet-compare");
  box.appendChild(el("h2", null, "Variants compared"));
  if (!out || !out.ok) box.appendChild(el("p", null, `Not compared: ${(out && out.error && out.error.message) || "engine error"}`));
  else box.appendChild(tableOf(out.columns));
  return box;
}

// The input an "alloy:<id>" variant changes (noblegap.compare.ALLOY_FIELD).
const ALLOY_FIELD = { fastener: ["fastener", "Another fastener alloy:"], joint: ["second", "Another alloy for the second member:"] };

export function mount({ schema, readInputs, linkExtras }) {
  const [alloyKey, alloyLabel] = ALLOY_FIELD[schema.name] || [null, ""];
  const alloyField = schema.fields.find((f) => f.key === alloyKey);
  const result = document.getElementById("result");
  const block = el("section", "compare-block");
  block.id = "compare-block";
  block.setAttribute("aria-labelledby", "compare-title");
  const h = el("h3", null, "Compare alternatives (same geometry)");
  h.id = "compare-title";
  block.appendChild(h);
  block.appendChild(el("p", "help", `Tick up to ${MAX_VARIANTS} variants to see them beside the current design. They are kept in the link and in a saved check.`));
  const choices = el("div", "compare-choices");
  const boxes = [];
  const addBox = (id, label, extra) => {
    const lab = el("label");
    const cb = document.createElement("input");
    cb.type = "checkbox";
    cb.value = id;
    cb.dataset.variant = id;
    lab.append(cb, document.createTextNode(label));
    if (extra) lab.appendChild(extra);
    choices.appendChild(lab);
    boxes.push(cb);
    return cb;
  };
  let alloySelect = null;
  if (alloyField) {
    alloySelect = document.createElement("select");
    alloySelect.id = "compare-alloy";
    alloySelect.setAttribute("aria-label", "Other fastener alloy");
    for (const ch of alloyField.choices || []) alloySelect.appendChild(new Option(ch.label, ch.id));
    addBox("alloy", alloyLabel, alloySelect);
  }
  for (const [id, label] of FIXED) addBox(id, label);
  block.appendChild(choices);
  const status = el("p", "compare-status note");
  status.setAttribute("role", "status");
  block.appendChild(status);
  const tableBox = el("div", "table-scroll");
  block.appendChild(tableBox);
  result.after(block);

  const chosen = () =>
    boxes.filter((b) => b.checked).map((b) => (b.value === "alloy" ? `alloy:${alloySelect.value}` : b.value));

  function syncURL() {
    const v = chosen().join(",");
    linkExtras.set("compare", v);
    const params = new URLSearchParams(location.search);
    if (v) params.set("compare", v);
    else params.delete("compare");
    history.replaceState(null, "", `${location.pathname}?${params.toString()}`);
  }

  function limit() {
    const n = boxes.filter((b) => b.checked).length;
    for (const b of boxes) b.disabled = !b.checked && n >= MAX_VARIANTS;
  }

  let seq = 0;
  async function refresh() {
    const variants = chosen();
    block.dataset.variants = variants.join(",");
    if (!variants.length) {
      tableBox.replaceChildren();
      status.textContent = "";
      block.dataset.state = "empty";
      return;
    }
    const mine = ++seq;
    status.textContent = "Computing the variants…";
    const { call } = await connect();
    const reply = await call("compare", { calc: schema.name, inputs: readInputs(), variants });
    if (mine !== seq) return;
    const out = reply.ok ? reply.result : null;
    if (!out || !out.ok) {
      status.textContent = `Not compared: ${(out && out.error && out.error.message) || (reply.error && reply.error.message) || "engine error"}`;
      tableBox.replaceChildren();
      block.dataset.state = "error";
      return;
    }
    status.textContent = "";
    tableBox.replaceChildren(tableOf(out.columns));
    block.dataset.state = "ready";
  }

  // From the link: ?compare=alloy:A96061,isolate
  const fromLink = new URLSearchParams(location.search).get("compare");
  for (const v of (fromLink || "").split(",").map((s) => s.trim()).filter(Boolean)) {
    if (v.startsWith("alloy:") && alloySelect) {
      const id = v.slice(6);
      if (![...alloySelect.options].some((o) => o.value === id)) alloySelect.appendChild(new Option(`${id} (not recognised)`, id));
      alloySelect.value = id;
      boxes.find((b) => b.value === "alloy").checked = true;
    } else {
      const b = boxes.find((x) => x.value === v);
      if (b) b.checked = true;
    }
  }
  limit();
  syncURL();
  const onChange = () => {
    limit();
    syncURL();
    refresh();
  };
  choices.addEventListener("change", onChange);
  // app.js rewrites the query on every edit; put the variants back after it.
  const form = document.getElementById("inputs");
  form.addEventListener("input", syncURL);
  form.addEventListener("change", syncURL);
  document.getElementById("reset")?.addEventListener("click", () => setTimeout(syncURL, 0));
  // Offer the calculator's own suggestion (its "change_fastener" mitigation)
  // as the other alloy, until the user picks one.
  let alloyTouched = Boolean(fromLink && fromLink.includes("alloy:"));
  alloySelect?.addEventListener("change", () => {
    alloyTouched = true;
  });
  document.addEventListener("noblegap:result", (ev) => {
    const res = ev.detail && ev.detail.ok && ev.detail.result && ev.detail.result.ok ? ev.detail.result.result : null;
    if (alloySelect && !alloyTouched && res) {
      const suggested = (res.mitigations || []).find((m) => m.id === "change_fastener" && m.fastener);
      const current = ev.detail.result.inputs[alloyKey];
      const pick = suggested ? suggested.fastener : [...alloySelect.options].map((o) => o.value).find((v) => v !== current);
      if (pick && [...alloySelect.options].some((o) => o.value === pick)) alloySelect.value = pick;
      syncURL();
    }
    if (chosen().length) refresh();
  });
  if (chosen().length) refresh();
}
