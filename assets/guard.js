// Keeps the page on its own host (loaded before the web client, in the server form and the static build).
//
// The Flet web client adds a <script> from a public CDN on every start: the Rive animation runtime
// (cdn.jsdelivr.net/npm/@rive-app/flutter-native-wasm@…/wasm/rive_native.js, then
// wasm_compatibility/rive_native.js). Boardside draws no Rive animation, so every script whose address
// is on another host is pointed at a local stand-in instead (rive-unavailable.js), and fetch() refuses
// other hosts the way it fails offline. Nothing is asked of any host but the page's own.
(function () {
  "use strict";
  const standIn = new URL("rive-unavailable.js", document.baseURI).href;
  const ownOrigin = location.origin;

  function isElsewhere(address) {
    try {
      return new URL(address, document.baseURI).origin !== ownOrigin;
    } catch (error) {
      return false;
    }
  }

  const src = Object.getOwnPropertyDescriptor(HTMLScriptElement.prototype, "src");
  Object.defineProperty(HTMLScriptElement.prototype, "src", {
    configurable: true,
    enumerable: src.enumerable,
    get() {
      return src.get.call(this);
    },
    set(value) {
      if (isElsewhere(String(value))) {
        console.info("Boardside: a script from another host was kept local:", String(value));
        src.set.call(this, standIn);
      } else {
        src.set.call(this, value);
      }
    },
  });

  const ownFetch = window.fetch.bind(window);
  window.fetch = function (resource, options) {
    const address = resource instanceof Request ? resource.url : String(resource);
    if (isElsewhere(address)) {
      return Promise.reject(new TypeError("Boardside asks no other host: " + address));
    }
    return ownFetch(resource, options);
  };
})();
