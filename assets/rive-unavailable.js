// Local stand-in for the Rive animation runtime that the Flet web client loads from a public CDN on
// every start (see guard.js). Boardside draws no Rive animation: the runtime reports itself
// unavailable, the client carries on without it (as it does offline), and no other host is asked.
window.RiveNative = function () {
  return Promise.reject(new Error("the Rive animation runtime is not part of Boardside"));
};
