import type { UnitDto } from '@shared/schemas/units.schema';
import { useEffect, useRef, useState } from 'react';
import { useTranslation } from 'react-i18next';
import { editorStyle } from '../../lib/editor-style';
import { Map as MapLibreMap, Marker, NavigationControl, ScaleControl, type GeoJSONSource, type MapMouseEvent } from '../../lib/maplibre';
import { boundsOfCorners, centroidOf, cornersOf, type LngLat } from '../../lib/polygon';

export interface OutlineEditorCanvasProps {
  units: readonly UnitDto[];
  selectedId: string | null;
  /** The outline being drawn or edited, as its corners (not closed). */
  corners: readonly LngLat[];
  /** True while clicks add corners; false once the outline is closed (its corners can still be dragged). */
  drawing: boolean;
  /** Corners can be dragged (drawing, or editing a closed outline). */
  editable: boolean;
  onCornersChange: (corners: LngLat[]) => void;
  onFinish: () => void;
  onSelectUnit: (unitId: string) => void;
  /** Where to look when the farm has no outlines yet. */
  center: LngLat | null;
  className?: string;
}

/** Pixels within which a click counts as "on" a corner. */
const HIT_PX = 10;

function setData(map: MapLibreMap, id: string, data: Parameters<GeoJSONSource['setData']>[0]) {
  const source = map.getSource(id) as GeoJSONSource | undefined;
  if (source) void source.setData(data);
}

/**
 * The outline editor (loaded lazily with maplibre-gl): click to add corners, drag a corner to move it,
 * double-click, or click the first corner, to close the outline. Drawing is our own: three GeoJSON
 * sources and a few pointer handlers, no drawing plug-in.
 */
export default function OutlineEditorCanvas(props: OutlineEditorCanvasProps) {
  const { units, selectedId, corners, drawing, editable, center, className } = props;
  const { t } = useTranslation();
  const container = useRef<HTMLDivElement>(null);
  const mapRef = useRef<MapLibreMap | null>(null);
  const [ready, setReady] = useState(false);
  const fitted = useRef(false);
  const labels = useRef(new Map<string, Marker>());
  const latest = useRef(props);
  latest.current = props;

  useEffect(() => {
    if (!container.current) return;
    const map = new MapLibreMap({
      container: container.current,
      style: editorStyle(),
      center: [0, 0],
      zoom: 1,
      maxZoom: 21,
      attributionControl: false,
      dragRotate: false,
      pitchWithRotate: false,
      touchPitch: false,
      doubleClickZoom: false,
      renderWorldCopies: false,
      locale: {
        'Map.Title': t('setup.map.canvasLabel'),
        'NavigationControl.ZoomIn': t('setup.map.zoomIn'),
        'NavigationControl.ZoomOut': t('setup.map.zoomOut'),
      },
    });
    map.touchZoomRotate.disableRotation();
    map.keyboard.disableRotation();
    map.addControl(new NavigationControl({ showCompass: false }), 'top-right');
    map.addControl(new ScaleControl({ unit: 'metric', maxWidth: 120 }), 'bottom-left');
    mapRef.current = map;

    let dragIndex: number | null = null;
    let dragged = false;

    const cornerAt = (point: { x: number; y: number }): number | null => {
      const cs = latest.current.corners;
      let best: number | null = null;
      let bestD = HIT_PX;
      cs.forEach((c, i) => {
        const p = map.project(c);
        const d = Math.hypot(p.x - point.x, p.y - point.y);
        if (d <= bestD) {
          best = i;
          bestD = d;
        }
      });
      return best;
    };

    const startDrag = (point: { x: number; y: number }, prevent: () => void) => {
      if (!latest.current.editable) return;
      const i = cornerAt(point);
      if (i === null) return;
      prevent();
      dragIndex = i;
      dragged = false;
      map.dragPan.disable();
      map.getCanvas().style.cursor = 'grabbing';
    };
    const moveDrag = (lngLat: { lng: number; lat: number }) => {
      if (dragIndex === null) return;
      dragged = true;
      const next = [...latest.current.corners];
      next[dragIndex] = [lngLat.lng, lngLat.lat];
      latest.current.onCornersChange(next);
    };
    const endDrag = () => {
      if (dragIndex === null) return;
      dragIndex = null;
      map.dragPan.enable();
      map.getCanvas().style.cursor = latest.current.drawing ? 'crosshair' : '';
    };

    map.on('mousedown', (e: MapMouseEvent) => startDrag(e.point, () => e.preventDefault()));
    map.on('mousemove', (e: MapMouseEvent) => {
      if (dragIndex !== null) return moveDrag(e.lngLat);
      const overCorner = latest.current.editable && cornerAt(e.point) !== null;
      map.getCanvas().style.cursor = overCorner ? 'grab' : latest.current.drawing ? 'crosshair' : '';
    });
    map.on('mouseup', endDrag);
    map.on('touchstart', (e) => {
      if (e.points.length === 1 && e.point) startDrag(e.point, () => e.preventDefault());
    });
    map.on('touchmove', (e) => {
      if (dragIndex !== null) {
        e.preventDefault();
        moveDrag(e.lngLat);
      }
    });
    map.on('touchend', endDrag);

    map.on('click', (e: MapMouseEvent) => {
      const p = latest.current;
      if (dragged) {
        dragged = false;
        return;
      }
      if (p.drawing) {
        const hit = cornerAt(e.point);
        if (hit === 0 && p.corners.length >= 3) return p.onFinish();
        // The second click of a double-click lands on the corner the first one made.
        if (hit !== null && hit === p.corners.length - 1) return;
        p.onCornersChange([...p.corners, [e.lngLat.lng, e.lngLat.lat]]);
        return;
      }
      const features = map.queryRenderedFeatures(e.point, { layers: ['unit-fill'] });
      const id = features[0]?.properties?.id;
      if (typeof id === 'string') p.onSelectUnit(id);
    });
    map.on('dblclick', (e: MapMouseEvent) => {
      if (!latest.current.drawing) return;
      e.preventDefault();
      if (latest.current.corners.length >= 3) latest.current.onFinish();
    });
    map.on('load', () => setReady(true));

    const labelMap = labels.current;
    return () => {
      for (const m of labelMap.values()) m.remove();
      labelMap.clear();
      map.remove();
      mapRef.current = null;
    };
    // Made once; handlers read the latest props through a ref.
  }, []);

  // Units on the map; fit to them the first time there is something to show.
  useEffect(() => {
    const map = mapRef.current;
    if (!map || !ready) return;
    setData(map, 'units', {
      type: 'FeatureCollection',
      features: units
        .filter((u) => u.outline)
        .map((u) => ({
          type: 'Feature' as const,
          id: u.id,
          properties: { id: u.id, code: u.code, selected: u.id === selectedId },
          geometry: u.outline!,
        })),
    });
    // Unit codes as HTML labels (no symbol layers: the style needs no glyphs from anywhere).
    const wanted = new Set<string>();
    for (const u of units) {
      const at = u.outline ? centroidOf(cornersOf(u.outline)) : null;
      if (!at) continue;
      wanted.add(u.id);
      let m = labels.current.get(u.id);
      if (!m) {
        const el = document.createElement('div');
        el.className = 'pointer-events-none rounded-md bg-white/90 px-1.5 text-sm font-bold leading-5 text-abyss-950 shadow';
        m = new Marker({ element: el, anchor: 'center' }).setLngLat(at).addTo(map);
        labels.current.set(u.id, m);
      }
      m.setLngLat(at);
      m.getElement().textContent = u.code;
      m.getElement().style.outline = u.id === selectedId ? '2px solid #8a5011' : '';
    }
    for (const [id, m] of labels.current) {
      if (!wanted.has(id)) {
        m.remove();
        labels.current.delete(id);
      }
    }
    if (!fitted.current) {
      const all = units.flatMap((u) => cornersOf(u.outline));
      const b = boundsOfCorners(all);
      if (b) {
        fitted.current = true;
        map.fitBounds(b, { padding: 40, animate: false, maxZoom: 19 });
      } else if (center) {
        fitted.current = true;
        map.jumpTo({ center, zoom: 16.5 });
      }
    }
  }, [ready, units, selectedId, center]);

  // The outline being drawn: a line while open, a polygon once closed, and its corners.
  useEffect(() => {
    const map = mapRef.current;
    if (!map || !ready) return;
    const ring = corners.map((c) => [c[0], c[1]]);
    const geometry =
      !drawing && ring.length >= 3
        ? { type: 'Polygon' as const, coordinates: [[...ring, ring[0]!]] }
        : ring.length >= 2
          ? { type: 'LineString' as const, coordinates: ring }
          : null;
    setData(map, 'draft', { type: 'FeatureCollection', features: geometry ? [{ type: 'Feature', properties: {}, geometry }] : [] });
    setData(map, 'vertices', {
      type: 'FeatureCollection',
      features: editable
        ? corners.map((c, i) => ({
            type: 'Feature' as const,
            properties: { index: i, first: drawing && i === 0 },
            geometry: { type: 'Point' as const, coordinates: [c[0], c[1]] },
          }))
        : [],
    });
    map.getCanvas().style.cursor = drawing ? 'crosshair' : '';
  }, [ready, corners, drawing, editable]);

  return (
    <div
      ref={container}
      className={className}
      data-testid="outline-editor"
      data-ready={ready ? 'true' : 'false'}
      data-corners={corners.length}
    />
  );
}
