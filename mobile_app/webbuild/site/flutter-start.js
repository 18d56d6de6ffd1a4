// Boardside's start of the Flutter engine, appended by the build after flet-web's loader and build
// configuration (the head of its flutter_bootstrap.js). Unlike flet-web's own tail it registers no
// service worker: Flutter's worker would replace Boardside's at the same scope with one that
// unregisters itself. Every browser runs the engine's JavaScript build with the full CanvasKit
// (the renderer comes from the page's flet.webRenderer), so the site carries one engine and one renderer.

// The loading screen, with the worker's progress words, stays until Flutter has drawn its first frame
// and the app has connected (or could not start: then the client's own message shows).
(function () {
    let drawn = false;
    let ready = false;
    function maybeRemove() {
        if (drawn && ready) {
            document.getElementById('loading')?.remove();
        }
    }
    window.addEventListener('flutter-first-frame', () => { drawn = true; maybeRemove(); }, { once: true });
    for (const name of ['boardside-connected', 'boardside-failed']) {
        window.addEventListener(name, () => { ready = true; maybeRemove(); }, { once: true });
    }
})();

var flutterConfig = {
    multiViewEnabled: flet.multiView,
    entrypointBaseUrl: flet.entrypointBaseUrl,
    assetBase: flet.assetBase,
    canvasKitBaseUrl: flet.canvasKitBaseUrl,
    canvasKitVariant: "full",
    fontFallbackBaseUrl: flet.fontFallbackBaseUrl
};
if (flet.webRenderer != "auto") {
    flutterConfig.renderer = flet.webRenderer;
}

_flutter.loader.load({
    config: flutterConfig,
    onEntrypointLoaded: async function (engineInitializer) {
        const engine = await engineInitializer.initializeEngine(flutterConfig);
        flet.flutterApp = await engine.runApp();
        flet.flutterAppResolve(flet.flutterApp);
    }
});
