import * as maplibre from 'maplibre-gl';
import workerUrl from 'maplibre-gl/dist/maplibre-gl-worker.mjs?url';
import 'maplibre-gl/dist/maplibre-gl.css';

/*
 * The one place maplibre-gl is set up. Import `maplibre` from here (and pass it to react-map-gl
 * as `mapLib`) so that the set-up has run before any map is made: the tile workers load from a
 * same-origin script that Vite emits (CSP worker-src 'self' blob:), never from a CDN.
 */
maplibre.setWorkerUrl(workerUrl);

export { maplibre };
