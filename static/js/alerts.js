// The error bar (#sw-alert, see app/errors.py): cleared by the next request that succeeds,
// or by a click on it.
(function () {
  function clear() {
    var bar = document.getElementById("sw-alert");
    if (bar) { bar.innerHTML = ""; }
  }
  document.addEventListener("htmx:afterRequest", function (e) {
    if (e.detail && e.detail.successful) { clear(); }
  });
  document.addEventListener("click", function (e) {
    if (e.target && e.target.closest && e.target.closest("#sw-alert")) { clear(); }
  });
})();
