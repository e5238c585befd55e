/* Shaftwright editor: diagrams, field messages, working copy in local storage, drawing links,
   opened result details kept open across live updates, the designer's own bearing table. */
(function () {
  "use strict";
  var desk = document.querySelector(".desk");
  var KEY = desk ? desk.getAttribute("data-storage-key") : "shaftwright:working:/";

  function form() { return document.getElementById("design-form"); }
  function slug(p) { return p.replace(/[^A-Za-z0-9_]+/g, "-").replace(/^-+|-+$/g, ""); }

  function drawPlot() {
    var el = document.getElementById("plot-data"), target = document.getElementById("plot");
    if (!el || !target || !window.Plotly) return;
    var fig; try { fig = JSON.parse(el.textContent); } catch (e) { return; }
    if (!fig) return;
    if (fig.x) fig.data.forEach(function (t) { if (!t.x) t.x = fig.x; });
    window.Plotly.react(target, fig.data, fig.layout, {displaylogo: false, responsive: true,
      modeBarButtonsToRemove: ["lasso2d", "select2d"]});
  }

  // a bad bearing table's messages, one per line, the first ten of them (as the template does)
  function tableLines(msgs) {
    var shown = msgs.slice(0, 10);
    if (msgs.length > 10) shown.push("… and " + (msgs.length - 10) + " more: fix these first.");
    return shown.join("\n");
  }

  function applyIssues() {
    var el = document.getElementById("issue-data"); if (!el) return;
    var slots = {}; try { slots = JSON.parse(el.textContent) || {}; } catch (e) {}
    document.querySelectorAll("#design-form .msg:not(.bt-local)").forEach(function (m) {
      var msgs = slots[m.id];
      var text = msgs ? msgs.join(" ") : "";
      if (msgs && m.id === "m-bearing_table-csv") text = tableLines(msgs);
      if (m.textContent !== text) m.textContent = text;
      var fld = m.closest(".fld");
      if (m.id === "m-bearing_table-csv") { var sec = m.closest(".bt"); if (sec) sec.classList.toggle("bad", !!msgs); }
      if (fld) {
        fld.classList.toggle("bad", !!msgs);
        var inp = fld.querySelector("input,select");
        if (inp) { if (msgs) inp.setAttribute("aria-invalid", "true"); else inp.removeAttribute("aria-invalid"); }
      }
    });
  }

  function syncCases() {
    var el = document.getElementById("plot-data"), sel = document.getElementById("view-case");
    if (!el || !sel) return;
    var fig; try { fig = JSON.parse(el.textContent); } catch (e) { return; }
    if (!fig || !fig.layout || !fig.layout.meta) return;
    var names = fig.layout.meta.cases || [];
    var have = Array.prototype.map.call(sel.options, function (o) { return o.value; });
    if (names.length && names.join("\u0000") !== have.join("\u0000")) {
      sel.innerHTML = "";
      names.forEach(function (n) { var o = document.createElement("option"); o.value = n; o.textContent = n; sel.appendChild(o); });
    }
    if (fig.layout.meta.load_case) sel.value = fig.layout.meta.load_case;
  }

  function snapshot() {
    var f = form(); if (!f) return null;
    var out = {};
    new FormData(f).forEach(function (v, k) { if (typeof v === "string") out[k] = v; });
    var vc = document.getElementById("view-case"); if (vc && vc.value) out.view_case = vc.value;
    return out;
  }
  function save() {
    try { var s = snapshot(); if (s) localStorage.setItem(KEY, JSON.stringify({form: s, t: Date.now()})); } catch (e) {}
  }
  var initial = null;

  function restore() {
    var raw = null; try { raw = localStorage.getItem(KEY); } catch (e) {}
    if (!raw) return;
    var stored; try { stored = JSON.parse(raw); } catch (e) { return; }
    if (!stored || !stored.form) return;
    if (JSON.stringify(stored.form) === JSON.stringify(initial)) return;
    var vals = Object.assign({}, stored.form, {op: "restore"});
    window.htmx.ajax("POST", "/editor/op", {target: "#editor", swap: "outerHTML", values: vals}).then(function () {
      var r = document.getElementById("restored"); if (r) r.hidden = false;
    });
  }

  // a click (or Enter) on a part of the drawing takes the user to its row
  document.addEventListener("click", function (ev) {
    var a = ev.target.closest && ev.target.closest("a.sd-part");
    if (!a) return;
    ev.preventDefault();
    var row = document.getElementById(a.getAttribute("data-row"));
    if (!row) return;
    row.scrollIntoView({block: "center", behavior: "instant"});
    document.querySelectorAll(".row.flash").forEach(function (r) { r.classList.remove("flash"); });
    row.classList.add("flash");
    var first = row.querySelector("input.num, input, select");
    if (first) first.focus({preventScroll: true});
  });

  // an issue link in the status list focuses its field
  document.addEventListener("click", function (ev) {
    var a = ev.target.closest && ev.target.closest("#status a[data-path]");
    if (!a) return;
    var el = document.getElementById("f-" + slug(a.getAttribute("data-path")));
    if (!el && /^bearing_table(\.|$)/.test(a.getAttribute("data-path"))) el = document.getElementById("f-bearing_table-csv");
    if (el && el.getAttribute("data-focus")) el = document.getElementById(el.getAttribute("data-focus"));
    if (el) { ev.preventDefault(); el.focus(); }
  });

  // folded checks and bearing lists that the user opened stay open across live updates
  var openIds = {};
  document.addEventListener("toggle", function (ev) {
    var d = ev.target;
    if (!d.id || !d.closest || !d.closest("#results, #results-detail")) return;
    if (d.open) openIds[d.id] = true; else delete openIds[d.id];
  }, true);
  function reopen() {
    Object.keys(openIds).forEach(function (id) { var d = document.getElementById(id); if (d && !d.open) d.open = true; });
  }

  // a printout of the page shows the folded checks too; the folds come back afterwards
  var printOpened = [];
  window.addEventListener("beforeprint", function () {
    printOpened = [];
    document.querySelectorAll("#results details:not([open]), #results-detail details:not([open])").forEach(function (d) {
      d.open = true; printOpened.push(d);
    });
  });
  window.addEventListener("afterprint", function () {
    printOpened.forEach(function (d) { d.open = false; delete openIds[d.id]; });
    printOpened = [];
  });

  // the designer's own bearing table: the browser reads the .csv file into the two hidden
  // fields, and the form's live solve carries it from there (no upload route)
  var MAX_TABLE_CHARS = 400000;  // the design's limit on bearing_table.csv (engine/model.py)
  function tableMsg(text) { var m = document.getElementById("bt-local-msg"); if (m) m.textContent = text || ""; }
  function setTable(name, csv) {
    var n = document.getElementById("f-bearing_table-name"), c = document.getElementById("f-bearing_table-csv");
    if (!n || !c) return;
    n.value = name; c.value = csv;
    var b = document.getElementById("bt-bundled"); if (b) b.hidden = !csv;
    c.dispatchEvent(new Event("input", {bubbles: true}));  // live solve and working copy
  }
  document.addEventListener("change", function (ev) {
    var inp = ev.target;
    if (!inp || inp.id !== "bt-file" || !inp.files || !inp.files[0]) return;
    var file = inp.files[0];
    tableMsg("");
    if (file.size > 4 * MAX_TABLE_CHARS) {
      tableMsg(file.name + " is " + Math.round(file.size / 1000) + " kB; a bearing table may hold at most " +
               MAX_TABLE_CHARS.toLocaleString("en") + " characters. The table in use is unchanged.");
      inp.value = ""; return;
    }
    var reader = new FileReader();
    reader.onload = function () {
      var text = String(reader.result || "");
      inp.value = "";  // the same file may be loaded again after it is edited
      if (text.length > MAX_TABLE_CHARS) {
        tableMsg(file.name + " holds " + text.length.toLocaleString("en") + " characters; a bearing table may hold at most " +
                 MAX_TABLE_CHARS.toLocaleString("en") + ". The table in use is unchanged.");
        return;
      }
      setTable(file.name, text);
    };
    reader.onerror = function () { inp.value = ""; tableMsg("Could not read " + file.name + ". The table in use is unchanged."); };
    reader.readAsText(file);
  });
  document.addEventListener("click", function (ev) {
    var b = ev.target.closest && ev.target.closest("#bt-bundled");
    if (!b) return;
    tableMsg("");
    var ex = document.querySelector("#design-form input[name='_extra']");
    if (ex) {  // a stray bearing_table carried from a hand-edited file goes too
      try { var o = JSON.parse(ex.value || "{}"); if (o && "bearing_table" in o) { delete o.bearing_table; ex.value = JSON.stringify(o); } } catch (e) {}
    }
    setTable("", "");
    var f = document.getElementById("bt-file"); if (f) f.focus();
  });

  // the form never submits itself (Enter in a field): every edit goes through htmx
  document.addEventListener("submit", function (ev) {
    if (ev.target && ev.target.id === "design-form") ev.preventDefault();
  });
  // typing in a structural control (the kind of part to add, the bearing table file) is not
  // an edit to solve: that control posts its own operation
  document.addEventListener("htmx:confirm", function (ev) {
    var d = ev.detail || {}, t = d.triggeringEvent && d.triggeringEvent.target;
    if (d.elt && d.elt.id === "design-form" && t && t.closest && t.closest("[data-structural]")) ev.preventDefault();
  });
  // "add part" adds a part of the kind chosen beside it
  document.addEventListener("htmx:configRequest", function (ev) {
    var src = ev.detail.elt && ev.detail.elt.getAttribute && ev.detail.elt.getAttribute("data-kind-from");
    var sel = src && document.getElementById(src);
    if (sel) ev.detail.parameters.op = "add:elements:" + sel.value;
  });

  document.addEventListener("input", function (ev) { if (ev.target.closest && ev.target.closest("#design-form")) save(); });
  document.body.addEventListener("htmx:afterSettle", function () { reopen(); applyIssues(); syncCases(); drawPlot(); save(); });

  var so = document.getElementById("start-over");
  if (so) so.addEventListener("click", function () {
    try { localStorage.removeItem(KEY); } catch (e) {}
    window.location.reload();
  });

  window.shaftwright = {
    clearWorkingCopy: function () { try { localStorage.removeItem(KEY); } catch (e) {} },
    storageKey: KEY
  };

  function start() {
    initial = snapshot();
    applyIssues(); drawPlot();
    restore();
    document.documentElement.setAttribute("data-ready", "1");
  }
  if (document.readyState === "loading") document.addEventListener("DOMContentLoaded", start); else start();
})();
