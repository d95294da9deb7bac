// The check sheet: what the browser prints for a result (A4 or Letter, one
// page a check), and a whole job's sheets behind a cover listing every check.
//
// Built from the core's display structure with textContent only. The QR
// code of the link comes from the core (noblegap.sheet, the segno library)
// through the engine worker, as SVG shown in an <img>.

export const CAUTIONS = [
  "Screening tool: verify every result with the applicable standards, local codes and a qualified corrosion engineer.",
  "Safety-critical, structural and pressure-retaining joints need review by a licensed engineer.",
  "Values marked from-memory are unconfirmed and must not be relied on; common-practice values are rules of thumb.",
];

function el(tag, cls, text) {
  const node = document.createElement(tag);
  if (cls) node.className = cls;
  if (text !== undefined && text !== null) node.textContent = String(text);
  return node;
}

export function dateText(d = new Date()) {
  const p = (n) => String(n).padStart(2, "0");
  return `${d.getFullYear()}-${p(d.getMonth() + 1)}-${p(d.getDate())} ${p(d.getHours())}:${p(d.getMinutes())}`;
}

function metaTable(pairs) {
  const dl = el("dl", "sheet-meta");
  for (const [k, v] of pairs) {
    if (v === undefined || v === null || v === "") continue;
    const div = el("div");
    div.appendChild(el("dt", null, k));
    div.appendChild(el("dd", null, v));
    dl.appendChild(div);
  }
  return dl;
}

function inputsTable(schema, inputs) {
  // Two label/value pairs a row: compact, and the values as the user typed them.
  const items = schema.fields
    .map((f) => [f.label, inputs[f.key] == null ? "" : String(inputs[f.key]), f])
    .filter(([, v, f]) => v !== "" || !f.optional)
    .map(([label, v, f]) => {
      let shown = v;
      if (f.choices) {
        const ch = f.choices.find((c) => c.id === v);
        if (ch && ch.label !== v) shown = `${ch.label} (${v})`;
      }
      return [label, shown === "" ? "(default)" : shown];
    });
  const table = el("table", "sheet-inputs");
  const body = el("tbody");
  for (let i = 0; i < items.length; i += 2) {
    const tr = el("tr");
    for (const pair of items.slice(i, i + 2)) {
      tr.appendChild(el("th", null, pair[0]));
      tr.appendChild(el("td", null, pair[1]));
    }
    body.appendChild(tr);
  }
  table.appendChild(body);
  return table;
}

function sourcesTable(rows) {
  const table = el("table", "sheet-values");
  const head = el("thead");
  const hr = el("tr");
  for (const c of ["Value", "Source (citation and locator)", "Confidence"]) hr.appendChild(el("th", null, c));
  head.appendChild(hr);
  table.appendChild(head);
  const body = el("tbody");
  // A citation printed once in full; a later row with the same one refers to it.
  const firstRow = new Map();
  rows.forEach((r, i) => {
    const tr = el("tr");
    const cell = el("td", "sv-label", `${i + 1}. ${r.label}: `);
    cell.appendChild(el("strong", "sv-value", r.value));
    tr.appendChild(cell);
    const text = r.source ? r.source.text : "";
    const seen = text && firstRow.has(text);
    if (text && !seen) firstRow.set(text, i + 1);
    tr.appendChild(el("td", "sv-source", seen ? `as for value ${firstRow.get(text)}` : text));
    tr.appendChild(el("td", `sv-conf conf-${r.source ? r.source.confidence : ""}`, r.source ? r.source.confidence : ""));
    body.appendChild(tr);
  });
  table.appendChild(body);
  return table;
}

/**
 * One check's sheet.
 * @param {object} o {schema, inputs, display|null, error|null, job?, link, qrSvg?, version, date, compare?}
 */
export function checkSheet(o) {
  const s = el("section", "sheet");
  s.dataset.calc = o.schema.name;
  // The header carries the link and its QR code, so the sheet's body keeps
  // the page for the inputs, the result and the sources.
  const head = el("header", "sheet-head");
  const headText = el("div", "sheet-head-text");
  headText.appendChild(el("h1", "sheet-title", `Check sheet · ${o.schema.title}`));
  headText.appendChild(
    metaTable([
      ["Job", o.job ? o.job.name : "(not saved in a job)"],
      ["Reference", o.job ? o.job.reference : ""],
      ["Date", o.date],
      ["Site version", `noblegap ${o.version}`],
    ]),
  );
  const linkBox = el("div", "sheet-link");
  linkBox.appendChild(el("p", "sheet-link-label", "Reopen this check (its inputs are in the link; the site works offline once visited):"));
  linkBox.appendChild(el("p", "sheet-url", o.link));
  headText.appendChild(linkBox);
  head.appendChild(headText);
  if (o.qrSvg) {
    const img = document.createElement("img");
    img.className = "sheet-qr";
    img.alt = "QR code of the link to reopen this check";
    img.src = `data:image/svg+xml;charset=utf-8,${encodeURIComponent(o.qrSvg)}`;
    head.appendChild(img);
  } else {
    head.appendChild(el("p", "sheet-qr-missing", "QR code not drawn: use the page's “Print check sheet” button to include it."));
  }
  s.appendChild(head);
  s.appendChild(el("h2", null, "Inputs as entered"));
  s.appendChild(inputsTable(o.schema, o.inputs));
  s.appendChild(el("h2", null, "Result"));
  if (o.display) {
    const d = o.display;
    if (d.verdict) {
      const p = el("p", `sheet-verdict verdict-${d.verdict.class}`);
      p.appendChild(el("strong", null, d.verdict.label));
      p.appendChild(document.createTextNode(` — ${d.verdict.reason}`));
      s.appendChild(p);
    }
    s.appendChild(el("p", "sheet-headline", d.headline));
    if (d.headline_confidence) s.appendChild(el("p", "sheet-basis", d.headline_confidence.line));
    if (o.compare) s.appendChild(o.compare);
    if ((d.rows || []).length) {
      s.appendChild(el("h2", null, "Key values and their sources"));
      s.appendChild(sourcesTable(d.rows));
    }
  } else {
    s.appendChild(el("p", "sheet-error", `Not computed: ${o.error || "the inputs hold an error"}`));
  }
  s.appendChild(el("h2", null, "Cautions"));
  const ul = el("ul", "sheet-cautions");
  for (const w of (o.display && o.display.warnings) || []) ul.appendChild(el("li", "sheet-warning", w));
  for (const c of CAUTIONS) ul.appendChild(el("li", null, c));
  s.appendChild(ul);
  return s;
}

/** A job's cover: every check and its verdict. */
export function coverSheet(job, items, { date, version }) {
  const s = el("section", "sheet sheet-cover");
  s.appendChild(el("h1", "sheet-title", `Job · ${job.name}`));
  s.appendChild(
    metaTable([
      ["Reference", job.reference],
      ["Date", date],
      ["Site version", `noblegap ${version}`],
      ["Checks", String(items.length)],
    ]),
  );
  if (job.notes) {
    s.appendChild(el("h2", null, "Notes"));
    s.appendChild(el("p", "sheet-notes", job.notes));
  }
  s.appendChild(el("h2", null, "Checks in this job"));
  const table = el("table", "sheet-values sheet-cover-list");
  const hr = el("tr");
  for (const c of ["#", "Check", "Verdict", "Result", "Saved"]) hr.appendChild(el("th", null, c));
  const thead = el("thead");
  thead.appendChild(hr);
  table.appendChild(thead);
  const body = el("tbody");
  items.forEach((it, i) => {
    const tr = el("tr");
    tr.appendChild(el("td", null, String(i + 1)));
    tr.appendChild(el("td", null, it.title));
    tr.appendChild(el("td", `cover-verdict verdict-${it.verdictClass || "none"}`, it.verdict || "not computed"));
    tr.appendChild(el("td", null, it.headline));
    tr.appendChild(el("td", null, it.saved));
    body.appendChild(tr);
  });
  table.appendChild(body);
  s.appendChild(table);
  const ul = el("ul", "sheet-cautions");
  for (const c of CAUTIONS) ul.appendChild(el("li", null, c));
  s.appendChild(ul);
  return s;
}

/** Ask the engine for the QR code of `link`; resolves to SVG text or null. */
export async function qrFor(call, link) {
  try {
    const reply = await call("sheet", { op: "qr", link });
    return reply.ok && reply.result && reply.result.ok ? reply.result.svg : null;
  } catch {
    return null;
  }
}
