// The touch picker of a long list (the alloys): families that fold open, a
// search box, and buttons large enough for a gloved finger. Picking fills the
// field as if the label had been typed, so the page computes as usual.

function words(text) {
  return text.toLowerCase().normalize("NFKD").replace(/[\u0300-\u036f]/g, "");
}

function setUp(panel) {
  const input = document.getElementById(panel.dataset.for);
  const opener = document.getElementById(panel.id.replace(/^pk-/, "po-"));
  const search = panel.querySelector(".pick-search");
  const none = panel.querySelector(".pick-none");
  if (!input || !opener) return;
  const close = () => {
    panel.hidden = true;
    opener.setAttribute("aria-expanded", "false");
  };
  opener.addEventListener("click", () => {
    const open = panel.hidden;
    panel.hidden = !open;
    opener.setAttribute("aria-expanded", String(open));
    if (open) search.focus();
  });
  search.addEventListener("input", () => {
    const q = words(search.value.trim());
    let shown = 0;
    for (const fam of panel.querySelectorAll(".pick-family")) {
      let inFam = 0;
      for (const b of fam.querySelectorAll(".pick")) {
        const hit = !q || words(b.dataset.value).includes(q);
        b.hidden = !hit;
        if (hit) inFam += 1;
      }
      fam.hidden = inFam === 0;
      fam.open = Boolean(q) && inFam > 0;
      shown += inFam;
    }
    none.hidden = shown > 0;
  });
  panel.addEventListener("click", (ev) => {
    const b = ev.target.closest(".pick");
    if (!b) return;
    input.value = b.dataset.value;
    input.dispatchEvent(new Event("input", { bubbles: true }));
    close();
    input.focus();
  });
  panel.addEventListener("keydown", (ev) => {
    if (ev.key === "Escape") {
      close();
      opener.focus();
    }
  });
}

for (const panel of document.querySelectorAll(".picker")) setUp(panel);
