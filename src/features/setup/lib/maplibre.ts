/**
 * maplibre-gl for the outline editor (imported only by the lazily loaded editor canvas). maplibre-gl 6
 * has no default export, and its worker is a separate file the bundler emits: point maplibre at it.
 */
import 'maplibre-gl/dist/maplibre-gl.css';
import { setWorkerUrl } from 'maplibre-gl';
import workerUrl from 'maplibre-gl/dist/maplibre-gl-worker.mjs?url';

setWorkerUrl(workerUrl);

export { Map, Marker, NavigationControl, ScaleControl } from 'maplibre-gl';
export type { GeoJSONSource, MapLayerMouseEvent, MapLayerTouchEvent, MapMouseEvent, StyleSpecification } from 'maplibre-gl';
