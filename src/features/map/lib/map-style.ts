import type { StyleSpecification } from 'maplibre-gl';
import { mapPalette } from './palette';

const empty = { type: 'FeatureCollection' as const, features: [] };

const byStatus = (part: 'fill' | 'line') =>
  [
    'match',
    ['get', 'status'],
    'clear',
    mapPalette.status.clear[part],
    'watch',
    mapPalette.status.watch[part],
    'act',
    mapPalette.status.act[part],
    'silent',
    mapPalette.status.silent[part],
    mapPalette.status.unrated[part],
  ] as unknown as string;

/**
 * The farm map's own style: a plain ground, the farm's yard, unit outlines filled and stroked by
 * status, a highlight for the selected unit, and probe dots. No tiles, glyphs or sprites (there are
 * no symbol layers; unit labels are HTML markers), so the map needs nothing beyond this page.
 */
export function buildMapStyle(): StyleSpecification {
  return {
    version: 8,
    sources: {
      ground: { type: 'geojson', data: empty },
      units: { type: 'geojson', data: empty, promoteId: 'id' },
      probes: { type: 'geojson', data: empty },
      leaders: { type: 'geojson', data: empty },
    },
    layers: [
      { id: 'background', type: 'background', paint: { 'background-color': mapPalette.ground } },
      { id: 'farm-ground', type: 'fill', source: 'ground', paint: { 'fill-color': mapPalette.farmGround } },
      {
        id: 'farm-edge',
        type: 'line',
        source: 'ground',
        paint: { 'line-color': mapPalette.farmEdge, 'line-width': 2, 'line-dasharray': [4, 3] },
      },
      { id: 'unit-fill', type: 'fill', source: 'units', paint: { 'fill-color': byStatus('fill'), 'fill-opacity': 0.92 } },
      {
        id: 'unit-line',
        type: 'line',
        source: 'units',
        filter: ['!=', ['get', 'status'], 'silent'],
        paint: { 'line-color': byStatus('line'), 'line-width': ['interpolate', ['linear'], ['zoom'], 15, 2, 19, 4] },
      },
      {
        // Silent units get a dashed edge, echoing the hollow ○ of their badge.
        id: 'unit-line-silent',
        type: 'line',
        source: 'units',
        filter: ['==', ['get', 'status'], 'silent'],
        paint: {
          'line-color': mapPalette.status.silent.line,
          'line-width': ['interpolate', ['linear'], ['zoom'], 15, 2, 19, 4],
          'line-dasharray': [2, 1.5],
        },
      },
      {
        id: 'unit-selected-halo',
        type: 'line',
        source: 'units',
        filter: ['==', ['get', 'selected'], true],
        paint: { 'line-color': mapPalette.selectedHalo, 'line-width': 7 },
      },
      {
        id: 'unit-selected',
        type: 'line',
        source: 'units',
        filter: ['==', ['get', 'selected'], true],
        paint: { 'line-color': mapPalette.selected, 'line-width': 4 },
      },
      {
        id: 'probe-points',
        type: 'circle',
        source: 'probes',
        paint: {
          'circle-radius': ['interpolate', ['linear'], ['zoom'], 15, 3.5, 19, 7],
          'circle-color': [
            'match',
            ['get', 'health'],
            'ok',
            mapPalette.probe,
            'attention',
            mapPalette.status.watch.line,
            'silent',
            mapPalette.probeStroke,
            mapPalette.status.silent.line,
          ] as unknown as string,
          'circle-stroke-color': [
            'match',
            ['get', 'health'],
            'silent',
            mapPalette.status.silent.line,
            mapPalette.probeStroke,
          ] as unknown as string,
          'circle-stroke-width': 2,
        },
      },
      // Leader lines from a unit to its label when the label had to move off the unit.
      {
        id: 'leader-lines',
        type: 'line',
        source: 'leaders',
        filter: ['==', ['geometry-type'], 'LineString'],
        paint: { 'line-color': mapPalette.selectedHalo, 'line-width': 1.5 },
      },
      {
        id: 'leader-anchors',
        type: 'circle',
        source: 'leaders',
        filter: ['==', ['geometry-type'], 'Point'],
        paint: { 'circle-radius': 3, 'circle-color': mapPalette.selectedHalo },
      },
    ],
  };
}
