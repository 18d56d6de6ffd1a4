// Readings are decimal numbers: the web client asks a phone for a digits-only keypad
// (inputmode="numeric", no decimal separator on some phones); ask for the decimal keypad instead,
// on every number field the client creates while the page runs.
(function () {
  "use strict";
  function decimal(node) {
    if (node.nodeType !== 1) return;
    if (node.getAttribute("inputmode") === "numeric") node.setAttribute("inputmode", "decimal");
    node.querySelectorAll('[inputmode="numeric"]').forEach(function (el) {
      el.setAttribute("inputmode", "decimal");
    });
  }
  new MutationObserver(function (records) {
    records.forEach(function (record) {
      if (record.type === "attributes") decimal(record.target);
      record.addedNodes.forEach(decimal);
    });
  }).observe(document.documentElement, {
    subtree: true, childList: true, attributes: true, attributeFilter: ["inputmode"],
  });
})();
