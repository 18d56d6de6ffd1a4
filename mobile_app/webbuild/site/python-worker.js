// Python for Boardside's static build, in a module worker: Pyodide, the app archives, the job store's
// browser storage and the Flet connection.
//
// Written for Boardside after flet-web's python-worker.js (same messages to and from the Flet client),
// with these differences: the runtime is imported by a path relative to this file; nothing is
// installed at run time (the archives carry every dependency, so no package index is asked); the work
// starts when the page loads ("start") and the app connects when the client asks ("connect"); Python
// starts from a snapshot after the first start; and the job store's folder is a browser-storage mount
// that one tab at a time owns.
//
// The entry module (config.module) offers warm() (imports only, before the snapshot), prepare() (may
// use the page: runs before the client connects) and run() (starts the Flet app on the connection).
// Archives named in config.extras (the PDF library and fonts) are unpacked only when Python asks
// (loadExtra), the device key that seals the sync password is kept apart from the store (deviceKey), and
// the page's `online` event, forwarded by python.js, reaches the callbacks given to whenOnline.
import { loadPyodide } from "./pyodide/pyodide.mjs";

const fletJs = {};
const whenOnline = [];
let starting = null;

self.onmessage = async (event) => {
  const message = event.data;
  if (message && message.type === "start") {
    starting = start(message.python);
    starting.catch(() => {});
  } else if (message && message.type === "connect") {
    mark("connect-asked");
    self.postMessage(await connect(message));
  } else if (message && message.type === "online") {
    whenOnline.forEach((callback) => callback());
  } else if (typeof fletJs.send === "function") {
    fletJs.send(message);
  } else {
    console.error("Boardside: a message for Python arrived before the app started");
  }
};

// Words for the page's loading screen while Python starts (python.js shows them).
function progress(text) {
  self.postMessage({ type: "progress", text });
}

// Start-up milestones, in the worker's performance timeline and its console (for the benchmark).
function mark(name) {
  performance.mark("boardside:" + name);
  console.debug(`boardside: ${name} at ${Math.round(performance.now())} ms`);
}

async function fetchBytes(url) {
  const response = await fetch(url);
  if (!response.ok) {
    throw new Error(`could not load ${url}: HTTP ${response.status}`);
  }
  return new Uint8Array(await response.arrayBuffer());
}

// The job store's folder: an IndexedDB-backed mount that only the tab holding the store's lock uses.
function storage(pyodide, config) {
  const FS = pyodide.FS;
  let mounted = false;
  let flushing = null;
  let again = false;

  function sync(populate) {
    return new Promise((resolve, reject) => {
      FS.syncfs(populate, (error) => (error ? reject(error) : resolve()));
    });
  }

  async function claim() {
    if (!(self.navigator && self.navigator.locks)) {
      return true;
    }
    return new Promise((resolve) => {
      self.navigator.locks.request(config.lockName, { ifAvailable: true }, (lock) => {
        if (!lock) {
          resolve(false);
          return null;
        }
        resolve(true);
        return new Promise(() => {}); // held until this worker ends with its tab
      });
    });
  }

  async function open() {
    if (mounted) {
      return true;
    }
    if (!(await claim())) {
      return false;
    }
    FS.mkdirTree(config.dataDir);
    FS.mount(FS.filesystems.IDBFS, {}, config.dataDir);
    await sync(true);
    eachFile(config.dataDir, remember);
    mounted = true;
    return true;
  }

  // IndexedDB keeps a file again only when its modification time differs from its copy's; real times
  // have millisecond steps, so two saves within one millisecond would look unchanged. So before each
  // copy every file changed since its last copy gets the next number of a counter as its time (a date
  // in 1970 that no real write gives), and the copies keep those numbers.
  let counter = 0;
  const copiedAt = new Map();

  function eachFile(folder, visit) {
    for (const name of FS.readdir(folder)) {
      if (name === "." || name === "..") {
        continue;
      }
      const path = folder + "/" + name;
      const stat = FS.stat(path);
      if (FS.isDir(stat.mode)) {
        eachFile(path, visit);
      } else {
        visit(path, stat.mtime.getTime());
      }
    }
  }

  function remember(path, time) {
    copiedAt.set(path, time);
    counter = Math.max(counter, time);
  }

  function stampChanged(path, time) {
    if (copiedAt.get(path) !== time) {
      counter += 1;
      FS.utime(path, counter, counter);
      copiedAt.set(path, counter);
    }
  }

  // Copy the store's files to browser storage; called after every committed write. Calls that come
  // while a copy runs are folded into one more copy after it, so the last commit is always copied.
  // Resolves to null, or to why the copy failed (browser storage full, or taken away).
  function flush() {
    if (!mounted) {
      return Promise.resolve(null);
    }
    if (flushing) {
      again = true;
      return flushing;
    }
    flushing = (async () => {
      try {
        do {
          again = false;
          eachFile(config.dataDir, stampChanged);
          await sync(false);
        } while (again);
        return null;
      } catch (error) {
        console.error("Boardside: the store could not be copied to browser storage:", error);
        return String(error);
      } finally {
        flushing = null;
      }
    })();
    return flushing;
  }

  return { dataDir: config.dataDir, open, flush };
}

// Python starts from a memory snapshot taken on this device at its first start (kept in the browser's
// Cache Storage under the version of the runtime, both archives and this file): starting the
// interpreter and importing the app from nothing takes seconds, restoring memory a fraction of that.
// It is kept as it is, not compressed: unzipping its ~38 MB took 0.4-0.7 s of a 3.5 s start here, on
// the core the web client also needs, and reading it back from storage a fraction of that.
// The snapshot is taken after the entry module's warm(), which only imports (no JavaScript object may
// be held by Python at that point); a snapshot that does not restore is marked and never tried again.
const SNAPSHOT = "python-snapshot";
const SNAPSHOT_FAILED = "python-snapshot-failed";

async function gunzip(bytes) {
  const unzipped = new Blob([bytes]).stream().pipeThrough(new DecompressionStream("gzip"));
  return new Uint8Array(await new Response(unzipped).arrayBuffer());
}

async function keepSnapshot(cache, bytes) {
  try {
    await cache.put(SNAPSHOT, new Response(bytes));
    mark("snapshot-kept");
  } catch (error) {
    console.warn("Boardside: no start-up snapshot kept:", error);
  }
}

// An archive as the build writes it: a zip of stored entries, gzipped whole (webbuild/archive.py),
// unzipped here by the browser's own decompression. A host that sends it with "Content-Encoding: gzip"
// has the browser unzip it already: then it starts with a zip's signature, not gzip's, and is used as
// it is.
async function fetchArchive(url) {
  const bytes = await fetchBytes(url);
  if (bytes[0] !== 0x1f || bytes[1] !== 0x8b) {
    return bytes;
  }
  if (!self.DecompressionStream) {
    throw new Error("this browser cannot decompress the app's archives (no DecompressionStream)");
  }
  return gunzip(bytes);
}

// The entries of a zip archive whose files are stored uncompressed, as the build writes them:
// [path, bytes] from the central directory (APPNOTE 4.3.12, 4.3.16), bytes viewed in place.
function* storedEntries(bytes) {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  let end = bytes.length - 22;
  while (end >= 0 && view.getUint32(end, true) !== 0x06054b50) {
    end -= 1;
  }
  if (end < 0) {
    throw new Error("not a zip archive");
  }
  const decoder = new TextDecoder();
  let at = view.getUint32(end + 16, true);
  for (let left = view.getUint16(end + 10, true); left > 0; left -= 1) {
    const method = view.getUint16(at + 10, true);
    const size = view.getUint32(at + 20, true);
    const nameLength = view.getUint16(at + 28, true);
    const skip = nameLength + view.getUint16(at + 30, true) + view.getUint16(at + 32, true);
    const local = view.getUint32(at + 42, true);
    const name = decoder.decode(bytes.subarray(at + 46, at + 46 + nameLength));
    if (method !== 0) {
      throw new Error(`${name} is compressed in its archive`);
    }
    const start = local + 30 + view.getUint16(local + 26, true) + view.getUint16(local + 28, true);
    yield [name, bytes.subarray(start, start + size)];
    at += 46 + skip;
  }
}

// Archives loaded on demand (config.extras: name -> { url, files }), each fetched and unpacked once,
// with the site's files it shares (files: path under home -> site path, e.g. the PDF's regular font,
// which the page serves for the screen too) fetched beside it and written to their paths.
function extras(pyodide, config) {
  const loading = new Map();
  async function load(extra) {
    const shared = Object.entries(extra.files || {});
    const [bytes, ...files] = await Promise.all([
      fetchArchive(extra.url), ...shared.map(([, url]) => fetchBytes(url))]);
    unpackArchives(pyodide, config, [bytes]);
    shared.forEach(([name], index) => {
      const path = config.home + "/" + name;
      pyodide.FS.mkdirTree(path.slice(0, path.lastIndexOf("/")));
      pyodide.FS.writeFile(path, files[index]);
    });
  }
  return function loadExtra(name) {
    if (!loading.has(name)) {
      const extra = config.extras && config.extras[name];
      const done = extra
        ? load(extra).then(() => {
          mark("extra-" + name);
          return null;
        })
        : Promise.resolve(`no archive named ${name}`);
      loading.set(name, done.catch((error) => {
        loading.delete(name);
        return String(error);
      }));
    }
    return loading.get(name);
  };
}

// The device key: seals the sync password (mobile_app/sync/seal.py), kept apart from the job store. An
// HMAC-SHA256 key made by the browser's WebCrypto as non-extractable (its bits cannot be read by any
// script, only used) and kept in an IndexedDB database of its own (config.deviceKeyStore), never in the
// store's files or their copy; the 32 bytes Python uses are its HMAC of a fixed label, derived at each
// start. Resolves to those bytes, or null where the browser keeps no key (its storage refused).
async function deviceKey(config) {
  function ask(request) {
    return new Promise((resolve, reject) => {
      request.onsuccess = () => resolve(request.result);
      request.onerror = () => reject(request.error);
    });
  }
  try {
    const opening = indexedDB.open(config.deviceKeyStore, 1);
    opening.onupgradeneeded = () => opening.result.createObjectStore("keys");
    const db = await ask(opening);
    const made = await crypto.subtle.generateKey({ name: "HMAC", hash: "SHA-256", length: 256 }, false, ["sign"]);
    const key = await new Promise((resolve, reject) => {
      const transaction = db.transaction("keys", "readwrite");
      const keys = transaction.objectStore("keys");
      let kept = null;
      const found = keys.get("device");
      found.onsuccess = () => {
        kept = found.result || made;
        if (!found.result) {
          keys.put(made, "device");
        }
      };
      transaction.oncomplete = () => resolve(kept);
      transaction.onerror = () => reject(transaction.error);
    });
    db.close();
    const label = new TextEncoder().encode("boardside device key 1");
    return new Uint8Array(await crypto.subtle.sign("HMAC", key, label));
  } catch (error) {
    console.warn("Boardside: no device key in this browser:", error);
    return null;
  }
}

function unpackArchives(pyodide, config, archives) {
  const FS = pyodide.FS;
  const folders = new Set();
  for (const bytes of archives) {
    for (const [name, data] of storedEntries(bytes)) {
      const path = config.home + "/" + name;
      const folder = path.slice(0, path.lastIndexOf("/"));
      if (!folders.has(folder)) {
        FS.mkdirTree(folder);
        folders.add(folder);
      }
      FS.writeFile(path, data);
    }
  }
  mark("archives-unpacked");
}

async function restored(config, cache, archives) {
  const stored = cache && !(await cache.match(SNAPSHOT_FAILED)) && (await cache.match(SNAPSHOT));
  if (!stored) {
    return null;
  }
  try {
    // Handed over as a promise: the runtime's script loads while the snapshot is read.
    const snapshot = stored.arrayBuffer();
    const pyodide = await loadPyodide({ env: { HOME: config.home }, _loadSnapshot: snapshot });
    mark("pyodide-restored");
    unpackArchives(pyodide, config, await archives);
    return { pyodide, entry: pyodide.pyimport(config.module) };
  } catch (error) {
    console.warn("Boardside: the start-up snapshot did not restore; starting afresh:", error);
    await cache.put(SNAPSHOT_FAILED, new Response(String(error)));
    return null;
  }
}

async function afresh(config, cache, archives) {
  progress("First start on this device: preparing Boardside to work without a network. This takes a " +
    "little while, once; later starts are quicker.");
  const pyodide = await loadPyodide({ env: { HOME: config.home }, _makeSnapshot: Boolean(cache) });
  mark("pyodide-loaded");
  unpackArchives(pyodide, config, await archives);
  pyodide.globals.set("boardside_home", config.home);
  pyodide.runPython("import sys; sys.path.insert(0, boardside_home)");
  const entry = pyodide.pyimport(config.module);
  entry.warm();
  mark("warmed");
  const extensions = pyodide.runPython(
    "import sys; [n for n, m in list(sys.modules.items()) if str(getattr(m, '__file__', '')).endswith('.so')]",
  ).toJs();
  if (cache && extensions.length === 0) {
    keepSnapshot(cache, pyodide.makeMemorySnapshot());
  } else if (cache) {
    console.warn("Boardside: no start-up snapshot, warm() loaded compiled extensions:", extensions);
  }
  return { pyodide, entry };
}

async function start(config) {
  mark("worker-start");
  progress("Starting Boardside…");
  const archives = Promise.all(config.archives.map((archive) => fetchArchive(archive.url)));
  const cache = self.caches ? await self.caches.open(config.snapshotCache).catch(() => null) : null;
  const { pyodide, entry } = (await restored(config, cache, archives)) || (await afresh(config, cache, archives));
  progress("Opening the jobs on this device…");
  const store = storage(pyodide, config);
  const storeOpened = store.open();
  pyodide.registerJsModule("flet_js", fletJs);
  pyodide.registerJsModule("boardside_js", {
    dataDir: store.dataDir,
    openStorage: store.open,
    flush: store.flush,
    loadExtra: extras(pyodide, config),
    deviceKey: () => deviceKey(config),
    whenOnline: (callback) => whenOnline.push(callback),
    officeCache: config.officeCache,
    mark,
  });
  await storeOpened;
  mark("storage-open");
  await entry.prepare();
  mark("prepared");
  return entry;
}

async function connect(message) {
  try {
    const entry = await starting;
    fletJs.args = message.args;
    fletJs.documentUrl = message.documentUrl;
    entry.run();
    if (typeof fletJs.start_connection !== "function") {
      return "the app did not start a Flet connection";
    }
    await fletJs.start_connection((packet) => {
      const bytes = packet.toJs();
      self.postMessage(bytes, [bytes.buffer]);
    });
    mark("connected");
    return "initialized";
  } catch (error) {
    return String(error);
  }
}
