// The bridge between the Flet web client and Python running in a worker (Boardside's static build).
//
// The client calls the same three functions as with flet-web's python.js (jsConnect, jsSend,
// jsDisconnect), but the worker is started as soon as the page loads, so Python, the app archives and
// the job store get ready while the Flutter engine starts, instead of after it.
//
// Until the app is connected, the worker's progress ({type: "progress", text}) is shown under the
// loading picture (the first start on a device prepares Python for offline use and takes longest); the
// page hears "boardside-connected" once the app is connected, or "boardside-failed" if it could not start.
//
// The page also tells the worker when the connection comes back: the `online` event is the window's
// (HTML standard, "Offline web applications"), and a worker cannot be relied on to hear its own (an
// emulated network change reaches the page only), so the outbox's sync hears it from here.
(function () {
  "use strict";
  const apps = {};
  let current = null;
  let early = startWorker();

  addEventListener("online", () => current && current.postMessage({ type: "online" }));

  function progress(data) {
    if (!(data && data.type === "progress")) {
      return false;
    }
    const words = document.getElementById("loading-words");
    if (words) {
      words.textContent = data.text;
    }
    return true;
  }

  function startWorker() {
    const worker = new Worker(new URL("python-worker.js", document.baseURI), { type: "module" });
    worker.onmessage = (event) => progress(event.data);
    current = worker;
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
        if (progress(event.data)) {
          return;
        }
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
      window.dispatchEvent(new Event("boardside-failed"));
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
      if (current === app.worker) {
        current = null;
      }
      app.worker.onmessage = null;
      app.worker.onerror = null;
    }
  };
})();
