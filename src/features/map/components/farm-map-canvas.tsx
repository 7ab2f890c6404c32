import type { UnitStatusDto } from '@shared/schemas/farms.schema';
import { useEffect, useRef, useState } from 'react';
import { createPortal } from 'react-dom';
import { useTranslation } from 'react-i18next';
import { boundsOf, centroid, farmGroundFeature, probeFeatures, unitFeatures, type ProbePoint } from '../lib/geo';
import { Map as MapLibreMap, Marker, NavigationControl, ScaleControl, type GeoJSONSource } from '../lib/maplibre';
import { buildMapStyle } from '../lib/map-style';
import { layoutMarkers, type MarkerOffset } from '../lib/marker-layout';
import { mapStatusOf, statusRank } from '../lib/palette';
import { UnitMarker } from './unit-marker';

export interface FarmMapCanvasProps {
  units: readonly UnitStatusDto[];
  probes: readonly ProbePoint[];
  selectedId: string | null;
  onSelect: (unitId: string) => void;
  className?: string;
}

/**
 * Room around the farm when the map opens, px (less on a narrow phone map), with extra on the right
 * where the labels of close-packed units (raceways) are set out as a column.
 */
const fitPadding = (width: number) => {
  const p = width < 500 ? 12 : 36;
  return { top: p, bottom: p, left: p, right: p + 64 };
};

/** Replace a GeoJSON source's data (maplibre applies it in its worker; nothing to wait for here). */
function setSourceData(map: MapLibreMap, id: string, data: Parameters<GeoJSONSource['setData']>[0]) {
  const source = map.getSource(id) as GeoJSONSource | undefined;
  if (source) void source.setData(data);
}

/**
 * The MapLibre map (this module is loaded lazily with maplibre-gl). The style is built here, the
 * units and probes are GeoJSON sources updated in place, and each unit's label is an HTML marker
 * rendered by React through a portal.
 */
export default function FarmMapCanvas({ units, probes, selectedId, onSelect, className }: FarmMapCanvasProps) {
  const { t } = useTranslation();
  const container = useRef<HTMLDivElement>(null);
  const mapRef = useRef<MapLibreMap | null>(null);
  const markers = useRef(new Map<string, Marker>());
  const [markerEls, setMarkerEls] = useState<Map<string, HTMLElement>>(new Map());
  const [offsets, setOffsets] = useState<Map<string, MarkerOffset>>(new Map());
  const [ready, setReady] = useState(false);
  const fitted = useRef(false);
  const onSelectRef = useRef(onSelect);
  onSelectRef.current = onSelect;
  const unitsRef = useRef(units);
  unitsRef.current = units;

  // Create the map once.
  useEffect(() => {
    if (!container.current) return;
    const map = new MapLibreMap({
      container: container.current,
      style: buildMapStyle(),
      center: [0, 0],
      zoom: 1,
      maxZoom: 20.5,
      attributionControl: false,
      dragRotate: false,
      pitchWithRotate: false,
      touchPitch: false,
      renderWorldCopies: false,
      locale: {
        'Map.Title': t('map.canvasLabel'),
        'NavigationControl.ZoomIn': t('map.zoomIn'),
        'NavigationControl.ZoomOut': t('map.zoomOut'),
        'NavigationControl.ResetBearing': t('map.resetNorth'),
        'ScaleControl.Meters': 'm',
        'ScaleControl.Kilometers': 'km',
      },
    });
    map.touchZoomRotate.disableRotation();
    map.keyboard.disableRotation();
    map.addControl(new NavigationControl({ showCompass: false }), 'top-right');
    map.addControl(new ScaleControl({ unit: 'metric', maxWidth: 120 }), 'bottom-left');
    map.on('load', () => setReady(true));
    map.on('click', 'unit-fill', (e) => {
      const id = e.features?.[0]?.properties?.id;
      if (typeof id === 'string') onSelectRef.current(id);
    });
    map.on('mouseenter', 'unit-fill', () => (map.getCanvas().style.cursor = 'pointer'));
    map.on('mouseleave', 'unit-fill', () => (map.getCanvas().style.cursor = ''));
    mapRef.current = map;
    const markerMap = markers.current;
    return () => {
      for (const m of markerMap.values()) m.remove();
      markerMap.clear();
      map.remove();
      mapRef.current = null;
    };
    // Made once: the map's own control labels take the language of the moment it opens.
  }, []);

  // Units: outlines, farm ground, fit to the farm the first time there is something to show.
  useEffect(() => {
    const map = mapRef.current;
    if (!map || !ready) return;
    setSourceData(map, 'units', unitFeatures(units, selectedId));
    const bounds = boundsOf(units);
    setSourceData(map, 'ground', farmGroundFeature(bounds));
    if (bounds && !fitted.current) {
      fitted.current = true;
      map.fitBounds(bounds, { padding: fitPadding(map.getCanvas().clientWidth), animate: false, maxZoom: 19 });
    }
  }, [ready, units, selectedId]);

  useEffect(() => {
    const map = mapRef.current;
    if (!map || !ready) return;
    setSourceData(map, 'probes', probeFeatures(units, probes));
  }, [ready, units, probes]);

  // One HTML marker per unit with an outline, created and removed as units come and go.
  useEffect(() => {
    const map = mapRef.current;
    if (!map || !ready) return;
    const wanted = new Set<string>();
    let changed = false;
    for (const u of units) {
      const at = u.outline ? centroid(u.outline) : null;
      if (!at) continue;
      wanted.add(u.id);
      const existing = markers.current.get(u.id);
      if (existing) {
        existing.setLngLat(at);
        continue;
      }
      const el = document.createElement('div');
      markers.current.set(u.id, new Marker({ element: el, anchor: 'center' }).setLngLat(at).addTo(map));
      changed = true;
    }
    for (const [id, m] of markers.current) {
      if (!wanted.has(id)) {
        m.remove();
        markers.current.delete(id);
        changed = true;
      }
    }
    // The most urgent labels sit on top.
    for (const u of units) {
      const el = markers.current.get(u.id)?.getElement();
      if (el) el.style.zIndex = String(10 - statusRank[mapStatusOf(u.status)]);
    }
    if (changed) setMarkerEls(new Map([...markers.current].map(([id, m]) => [id, m.getElement()])));
  }, [ready, units]);

  // Keep labels from covering each other: lay them out again whenever the view or the units change.
  useEffect(() => {
    const map = mapRef.current;
    if (!map || !ready) return;
    let frame = 0;
    const relayout = () => {
      cancelAnimationFrame(frame);
      frame = requestAnimationFrame(() => {
        const boxes = [];
        for (const u of unitsRef.current) {
          const marker = markers.current.get(u.id);
          if (!marker) continue;
          const p = map.project(marker.getLngLat());
          const pill = marker.getElement().querySelector('button');
          const w = pill?.offsetWidth || 8 * u.code.length + 34;
          const h = pill?.offsetHeight || 26;
          boxes.push({ id: u.id, x: p.x, y: p.y, w, h, rank: statusRank[mapStatusOf(u.status)] * 1000 + u.walkOrder });
        }
        const canvas = map.getCanvas();
        const next = layoutMarkers(boxes, { width: canvas.clientWidth, height: canvas.clientHeight });
        setOffsets(next);
        // Leader lines live in the map itself, under every label.
        const features = [];
        for (const b of boxes) {
          const o = next.get(b.id);
          if (!o || (o.dx === 0 && o.dy === 0)) continue;
          const from = map.unproject([b.x, b.y]);
          const to = map.unproject([b.x + o.dx, b.y + o.dy]);
          features.push(
            {
              type: 'Feature' as const,
              properties: {},
              geometry: {
                type: 'LineString' as const,
                coordinates: [
                  [from.lng, from.lat],
                  [to.lng, to.lat],
                ],
              },
            },
            { type: 'Feature' as const, properties: {}, geometry: { type: 'Point' as const, coordinates: [from.lng, from.lat] } },
          );
        }
        setSourceData(map, 'leaders', { type: 'FeatureCollection', features });
      });
    };
    relayout();
    map.on('moveend', relayout);
    map.on('zoom', relayout);
    map.on('resize', relayout);
    return () => {
      cancelAnimationFrame(frame);
      map.off('moveend', relayout);
      map.off('zoom', relayout);
      map.off('resize', relayout);
    };
  }, [ready, units, markerEls]);

  return (
    <>
      <div ref={container} className={className} data-testid="farm-map-canvas" data-ready={ready ? 'true' : 'false'} />
      {units.map((u) => {
        const el = markerEls.get(u.id);
        if (!el) return null;
        const status = mapStatusOf(u.status);
        return createPortal(
          <UnitMarker
            code={u.code}
            name={u.name}
            status={status}
            selected={u.id === selectedId}
            offset={offsets.get(u.id) ?? { dx: 0, dy: 0 }}
            onSelect={() => onSelect(u.id)}
          />,
          el,
          u.id,
        );
      })}
    </>
  );
}
