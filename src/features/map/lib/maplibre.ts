/**
 * The one place the client loads maplibre-gl (imported only by the lazy map canvas, so its chunk and
 * worker stay out of the first load). maplibre-gl 6 has no default export, and its worker is a
 * separate file that the bundler must emit: point maplibre at the emitted URL.
 */
import 'maplibre-gl/dist/maplibre-gl.css';
import { setWorkerUrl } from 'maplibre-gl';
import workerUrl from 'maplibre-gl/dist/maplibre-gl-worker.mjs?url';

setWorkerUrl(workerUrl);

export { LngLatBounds, Map, Marker, NavigationControl, Popup, ScaleControl } from 'maplibre-gl';
export type { GeoJSONSource, GeoJSONSourceSpecification, LngLatLike, MapOptions, StyleSpecification } from 'maplibre-gl';
export { workerUrl as maplibreWorkerUrl };
