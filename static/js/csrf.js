/* Every htmx request carries the session's form token (X-CSRF-Token), read from
   <meta name="csrf-token">; the server refuses a state-changing request of a signed-in
   browser without it (app/security.py). Plain forms carry it in a hidden field instead. */
(function () {
  "use strict";
  document.addEventListener("htmx:configRequest", function (ev) {
    var meta = document.querySelector('meta[name="csrf-token"]');
    var token = meta ? meta.getAttribute("content") : "";
    if (token) ev.detail.headers["X-CSRF-Token"] = token;
  });
})();
