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
    for (const c of columns) {
      const td = cell(c);
      if (c.anode && c.available) td.classList.add("compare-col-anode");
      tr.appendChild(td);
    }
    body.appendChild(tr);
  };
  row("Verdict", (c) => el("td", `verdict-cell verdict-${c.verdict_class || "none"}`, c.available ? c.verdict || "—" : c.status === "not_applicable" ? "not applicable" : "not computed"));
  row("Local rate, mm/yr", (c) => {
    if (!c.available) return el("td", null, "—");
    const range = c.rate_low_mm_per_yr != null && c.rate_high_mm_per_yr != null ? `${num(c.rate_low_mm_per_yr)} to ${num(c.rate_high_mm_per_yr)}` : num(c.rate_mm_per_yr);
    return el("td", "num", range);
  });
  row("Years to the allowance", (c) => el("td", null, c.available ? c.life_text || num(c.years_to_allowance) : "—"));
  if (columns.some((c) => c.available && c.anode && c.anode.alloy)) {
    const an = (c) => (c.available && c.anode && c.anode.alloy ? c.anode : null);
    row("Anode", (c) => {
      const a = an(c);
      if (!a) return el("td", null, "—");
      const td = el("td", "compare-anode");
      const assumed = new Set(a.assumed || []);
      const part = (text, key) => {
        const span = el("span", assumed.has(key) ? "assumed" : "typed", text);
        if (assumed.has(key)) span.appendChild(el("em", null, " (assumed)"));
        return span;
      };
      td.append(part(a.alloy_name, "alloy"), document.createTextNode(", "), part(`${a.mass_text} net`, "mass"), document.createTextNode(", "), part(a.shape_name, "shape"), document.createTextNode(" "));
      td.appendChild(part(a.size_text, a.shape === "flush" ? "area" : "length"));
      return td;
    });
    row("Anode current and life", (c) => {
      const a = an(c);
      if (!a) return el("td", null, "—");
      const shortest = a.life_shortest_text && a.life_shortest_text !== a.life_text ? ` (shortest case ${a.life_shortest_text})` : "";
      return el("td", "compare-anode-life", `${a.current_text}; lasts ${a.life_text}${shortest}`);
    });
    row("What limits it", (c) => el("td", "compare-note", an(c) ? c.limit_text || "" : "—"));
  }
  row("Note", (c) => {
    const parts = [];
    if (c.verdict_reason) parts.push(`${c.verdict_reason.charAt(0).toUpperCase()}${c.verdict_reason.slice(1)}.`);
    if (c.note) parts.push(c.note);
    if (c.from_memory_mark) parts.push(`[${c.from_memory_mark}]`);
    const td = el("td", "compare-note", parts.join(" "));
    if (c.anode && c.anode.sources && c.anode.sources.length) {
      const det = el("details", "compare-sources");
      det.appendChild(el("summary", null, "Sources"));
      const ul = el("ul");
      for (const src of c.anode.sources) ul.appendChild(el("li", null, src));
      det.appendChild(ul);
      td.appendChild(det);
      // printed sheets carry every citation in full (a closed <details> does not print)
      const printed = el("ul", "compare-sources-print");
      for (const src of c.anode.sources) printed.appendChild(el("li", null, src));
      td.appendChild(printed);
    }
    return td;
  });
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

// ---------- the sacrificial anode's inputs ----------
// The variant id carries what the user typed (noblegap.compare.ANODE_KEYS), each
// value percent-encoded: "anode" alone is the assumed anode; "anode:mass=2%20kg;shape=flush".
const ANODE_KEYS = ["alloy", "mass", "shape", "length", "area"];

function anodeEditor() {
  const node = el("fieldset", "compare-anode-inputs");
  node.id = "compare-anode";
  node.hidden = true;
  node.appendChild(el("legend", null, "The sacrificial anode"));
  node.appendChild(el("p", "help", "Values left empty are assumed and shown as assumed in the column; type a value to use your own."));
  const inputs = {};
  const field = (key, label, control) => {
    const wrap = el("label", "compare-anode-field");
    wrap.appendChild(el("span", null, label));
    control.id = `compare-anode-${key}`;
    control.dataset.key = key;
    wrap.appendChild(control);
    const hint = el("span", "compare-anode-hint");
    hint.id = `compare-anode-${key}-hint`;
    control.setAttribute("aria-describedby", hint.id);
    wrap.appendChild(hint);
    node.appendChild(wrap);
    inputs[key] = { control, hint, wrap };
    return control;
  };
  const alloy = field("alloy", "Anode alloy", document.createElement("select"));
  alloy.appendChild(new Option("Assumed: the alloy that suits the water", ""));
  const text = (key, label, example) => {
    const inp = document.createElement("input");
    inp.type = "text";
    inp.autocomplete = "off";
    inp.spellcheck = false;
    inp.maxLength = 60;
    inp.placeholder = example;
    return field(key, label, inp);
  };
  text("mass", "Net mass", "e.g. 5 kg");
  const shape = field("shape", "Shape", document.createElement("select"));
  shape.append(new Option("Assumed: slender stand-off", ""), new Option("Slender stand-off", "standoff"), new Option("Flush-mounted or bracelet", "flush"));
  text("length", "Length (stand-off)", "e.g. 400 mm");
  text("area", "Exposed area (flush)", "e.g. 300 cm²");
  const error = el("p", "compare-anode-error");
  error.setAttribute("role", "alert");
  node.appendChild(error);

  const sync = () => {
    const flush = shape.value === "flush";
    inputs.length.wrap.hidden = flush;
    inputs.area.wrap.hidden = !flush;
  };
  const variant = () => {
    const parts = [];
    for (const key of ANODE_KEYS) {
      if (inputs[key].wrap.hidden) continue;
      const v = inputs[key].control.value.trim();
      if (v) parts.push(`${key}=${encodeURIComponent(v)}`);
    }
    return parts.length ? `anode:${parts.join(";")}` : "anode";
  };
  const load = (vid) => {
    const rest = vid.startsWith("anode:") ? vid.slice(6) : "";
    for (const part of rest.split(";")) {
      const i = part.indexOf("=");
      if (i < 1) continue;
      const key = part.slice(0, i);
      if (!inputs[key]) continue;
      let value = part.slice(i + 1);
      try {
        value = decodeURIComponent(value);
      } catch {
        /* kept as written: the core names what is wrong with it */
      }
      const c = inputs[key].control;
      if (c.tagName === "SELECT" && ![...c.options].some((o) => o.value === value)) c.appendChild(new Option(`${value} (as in the link)`, value));
      c.value = value;
    }
    sync();
  };
  /** Fill the assumed values and any error from the anode column of a result. */
  const show = (col) => {
    const a = col && col.anode;
    if (!a) return;
    for (const [id, name] of a.choices || []) {
      const known = [...alloy.options].find((o) => o.value === id);
      if (known) known.textContent = name; // an id first read from the link gets its name
      else alloy.appendChild(new Option(name, id));
    }
    const assumed = new Set(a.assumed || []);
    const hints = { alloy: a.alloy_name, mass: a.mass_text, shape: a.shape_name, length: a.length_text, area: a.area_text };
    for (const key of ANODE_KEYS) {
      const { control, hint } = inputs[key];
      const bad = a.error_field === `anode_${key}`;
      control.setAttribute("aria-invalid", String(bad));
      hint.textContent = assumed.has(key) && hints[key] ? `assumed: ${hints[key]}` : "";
      if (control.tagName === "INPUT") control.placeholder = assumed.has(key) && hints[key] ? hints[key] : control.placeholder;
    }
    error.textContent = a.error_field ? col.note : "";
  };
  shape.addEventListener("change", sync);
  sync();
  return { node, variant, load, show, sync };
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
  const anodeBox = boxes.find((b) => b.value === "anode");
  const editor = anodeEditor();
  block.appendChild(editor.node);
  const status = el("p", "compare-status note");
  status.setAttribute("role", "status");
  block.appendChild(status);
  const tableBox = el("div", "table-scroll");
  block.appendChild(tableBox);
  result.after(block);

  const chosen = () =>
    boxes.filter((b) => b.checked).map((b) => (b.value === "alloy" ? `alloy:${alloySelect.value}` : b.value === "anode" ? editor.variant() : b.value));
  const showEditor = () => {
    editor.node.hidden = !anodeBox.checked;
  };

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
    block.dataset.state = "computing";
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
    editor.show(out.columns.find((c) => c.id === "anode" || c.id.startsWith("anode:")) || null);
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
    } else if (v === "anode" || v.startsWith("anode:")) {
      editor.load(v);
      anodeBox.checked = true;
    } else {
      const b = boxes.find((x) => x.value === v);
      if (b) b.checked = true;
    }
  }
  limit();
  showEditor();
  syncURL();
  const onChange = () => {
    limit();
    showEditor();
    syncURL();
    refresh();
  };
  choices.addEventListener("change", onChange);
  // The anode's inputs: computed after a typing pause, or at once on a change or blur.
  let pause = null;
  editor.node.addEventListener("input", () => {
    syncURL();
    clearTimeout(pause);
    pause = setTimeout(refresh, 800);
  });
  editor.node.addEventListener("change", () => {
    clearTimeout(pause);
    editor.sync();
    syncURL();
    refresh();
  });
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
