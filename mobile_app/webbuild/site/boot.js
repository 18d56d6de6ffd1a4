// Page-side start-up of Boardside's static build: asks the browser to keep the job store's storage,
// registers Boardside's service worker once the app is on screen (so the first start does not share
// the network and the cores with it), and reloads a page that WebKit restores from its back/forward
// cache (WebKit restores a Flutter page with its frames stopped).
(function () {
  "use strict";
  if (navigator.storage && navigator.storage.persist) {
    navigator.storage.persisted().then((kept) => kept || navigator.storage.persist()).then(
      (kept) => console.info("Boardside: storage kept by the browser:", kept),
      (error) => console.warn("Boardside: persistent storage not granted:", error),
    );
  }

  window.addEventListener("boardside-connected", () => {
    if (!("serviceWorker" in navigator)) {
      return;
    }
    navigator.serviceWorker.register(boardside.serviceWorker).then(
      (registration) => console.info("Boardside: offline copy registered for", registration.scope),
      (error) => console.warn("Boardside: no offline copy:", error),
    );
  }, { once: true });

  window.addEventListener("pageshow", (event) => {
    if (event.persisted && navigator.vendor && navigator.vendor.startsWith("Apple")) {
      window.location.reload();
    }
  });
})();
