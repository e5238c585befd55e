/* Shaftwright what-if studies: draw the study plots, pick a variant, take it into the design. */
(function () {
  "use strict";
  var picked = null;  // variant index

  function el(id) { return document.getElementById(id); }

  function fig() {
    var d = el("study-plot-data"); if (!d) return null;
    try { return JSON.parse(d.textContent); } catch (e) { return null; }
  }

  function describe(meta, k) {
    var vars = meta.variables, vals = meta.values, idx;
    if (vars.length === 1) idx = [k];
    else { var nb = vals[1].length; idx = [Math.floor(k / nb), k % nb]; }
    return vars.map(function (v, i) { return v.path + " = " + vals[i][idx[i]] + (v.unit ? " " + v.unit : ""); }).join(", ");
  }

  function pick(k) {
    var f = fig(); if (!f || !f.layout || !f.layout.meta) return;
    picked = k;
    var meta = f.layout.meta;
    var lab = el("take-label"), btn = el("take-variant");
    if (lab) lab.textContent = "Picked: " + describe(meta, k) + (meta.ok[k] ? " (meets every requirement)" : " (does not meet every requirement)");
    if (btn) btn.disabled = false;
    document.querySelectorAll("#study-table tr.picked").forEach(function (r) { r.classList.remove("picked"); });
    var row = document.querySelector('#study-table tr[data-k="' + k + '"]'); if (row) row.classList.add("picked");
  }

  function take(k) {
    var f = fig(); if (!f) return;
    var meta = f.layout.meta, vars = meta.variables, vals = meta.values, idx;
    if (vars.length === 1) idx = [k]; else { var nb = vals[1].length; idx = [Math.floor(k / nb), k % nb]; }
    var form = el("take-form");
    form.elements.var1.value = vars[0].path; form.elements.value1.value = String(vals[0][idx[0]]);
    form.elements.var2.value = vars.length > 1 ? vars[1].path : "";
    form.elements.value2.value = vars.length > 1 ? String(vals[1][idx[1]]) : "";
    form.elements.take_arrangement.value = "";
    form.submit();
  }

  function draw() {
    var target = el("study-plot"), f = fig();
    if (!target || !f || !window.Plotly) return;
    window.Plotly.react(target, f.data, f.layout, {displaylogo: false, responsive: true,
      modeBarButtonsToRemove: ["lasso2d", "select2d"]}).then(function () {
      target.removeAllListeners && target.removeAllListeners("plotly_click");
      target.on("plotly_click", function (ev) {
        if (!ev || !ev.points || !ev.points.length) return;
        var p = ev.points[0], meta = f.layout.meta, k;
        if (meta.variables.length === 1) k = p.pointIndex;
        else {
          var a = meta.values[0].map(String).indexOf(String(p.x)), b = meta.values[1].map(String).indexOf(String(p.y));
          if (a < 0 || b < 0) return;
          k = a * meta.values[1].length + b;
        }
        if (typeof k === "number" && k >= 0) pick(k);
      });
      document.documentElement.setAttribute("data-study-drawn", "1");
    });
  }

  // the default range follows the chosen variable
  document.addEventListener("change", function (ev) {
    var s = ev.target;
    if (!s.matches || !s.matches("#var1, #var2")) return;
    var opt = s.options[s.selectedIndex], box = el(s.getAttribute("data-range"));
    if (box) box.value = opt && opt.value ? (opt.getAttribute("data-range") || "") : "";
  });

  document.addEventListener("click", function (ev) {
    var t = ev.target;
    if (!t.closest) return;
    if (t.closest("#take-variant")) { if (picked !== null) take(picked); return; }
    var row = t.closest("button.take-row");
    if (row) { take(parseInt(row.getAttribute("data-k"), 10)); return; }
    var arr = t.closest("button.take-arr");
    if (arr) {
      var form = el("take-form");
      form.elements.var1.value = ""; form.elements.var2.value = "";
      form.elements.take_arrangement.value = arr.getAttribute("data-key");
      form.submit();
    }
  });

  document.body.addEventListener("htmx:afterSettle", function (ev) {
    if (ev.target && ev.target.id === "study-result") { picked = null; draw(); }
  });

  function start() {
    draw();
    document.documentElement.setAttribute("data-ready", "1");
  }
  if (document.readyState === "loading") document.addEventListener("DOMContentLoaded", start); else start();
})();
