/* Shaftwright: draw the search's front; a click on a point opens that design in the editor. */
(function () {
  "use strict";
  function el(id) { return document.getElementById(id); }

  function draw() {
    var target = el("optimise-plot"), src = el("optimise-plot-data"), f;
    if (!target || !src || !window.Plotly) return;
    try { f = JSON.parse(src.textContent); } catch (e) { return; }
    window.Plotly.react(target, f.data, f.layout, {displaylogo: false, responsive: true,
      modeBarButtonsToRemove: ["lasso2d", "select2d"]}).then(function () {
      target.removeAllListeners && target.removeAllListeners("plotly_click");
      target.on("plotly_click", function (ev) {
        if (!ev || !ev.points || !ev.points.length) return;
        var p = ev.points[0];
        if (p.curveNumber !== 0) return;  // the current design is not a front point
        var btn = document.querySelector('#optimise-table button.open-row[data-k="' + p.pointIndex + '"]');
        if (btn) btn.form.submit();
      });
      document.documentElement.setAttribute("data-front-drawn", String(f.layout.meta.n));
    });
  }

  document.addEventListener("htmx:afterSwap", function (ev) {
    if (ev.detail && ev.detail.target && ev.detail.target.id === "optimise-result") draw();
  });
  window.addEventListener("load", draw);
})();
