// The bridge between the Flet web client and Python running in a worker (Boardside's static build).
//
// The client calls the same three functions as with flet-web's python.js (jsConnect, jsSend,
// jsDisconnect), but the worker is started as soon as the page loads, so Python, the app archives and
// the job store get ready while the Flutter engine starts, instead of after it.
(function () {
  "use strict";
  const apps = {};
  let early = startWorker();

  function startWorker() {
    const worker = new Worker(new URL("python-worker.js", document.baseURI), { type: "module" });
    const failed = new Promise((resolve) => {
      worker.onerror = (event) => resolve("the Python worker could not start: " + (event.message || event));
    });
    worker.postMessage({ type: "start", python: boardside.python });
    return { worker, failed };
  }

  globalThis.jsConnect = async function (appId, args, dartOnMessage) {
    const started = early || startWorker();
    early = null;
    const app = { worker: started.worker, dartOnMessage };
    apps[appId] = app;
    const answered = new Promise((resolve) => {
      app.worker.onmessage = (event) => {
        if (typeof event.data === "string") {
          resolve(event.data);
        } else {
          app.dartOnMessage(event.data);
        }
      };
    });
    app.worker.postMessage({ type: "connect", args: args, documentUrl: document.URL });
    const outcome = await Promise.race([answered, started.failed]);
    if (outcome !== "initialized") {
      console.error("Python worker init error:", outcome);
      await globalThis.jsDisconnect(appId);
      throw outcome;
    }
    window.dispatchEvent(new Event("boardside-connected"));
  };

  globalThis.jsSend = async function (appId, data) {
    const app = apps[appId];
    if (app) {
      app.worker.postMessage(data, [data.buffer]);
    }
  };

  globalThis.jsDisconnect = async function (appId) {
    const app = apps[appId];
    if (app) {
      delete apps[appId];
      app.worker.terminate();
      app.worker.onmessage = null;
      app.worker.onerror = null;
    }
  };
})();
