import type { StyleSpecification } from 'maplibre-gl';

/** Colours from the house theme (src/index.css); the map canvas needs literal values. */
export const editorPalette = {
  ground: '#e9efe6',
  unitFill: '#86b8ba',
  unitLine: '#15525a',
  selectedFill: '#f6c877',
  selectedLine: '#8a5011',
  draftFill: '#f0ad4a',
  draftLine: '#b8701a',
  vertex: '#ffffff',
  vertexStroke: '#061d21',
  firstVertex: '#e0922a',
} as const;

const empty = { type: 'FeatureCollection' as const, features: [] };

/**
 * The editor's own style: plain ground, the farm's units, the outline being drawn and its corners.
 * GeoJSON sources only, no symbol layers (no glyphs or sprites), so nothing is fetched from anywhere.
 */
export function editorStyle(): StyleSpecification {
  return {
    version: 8,
    sources: {
      units: { type: 'geojson', data: empty, promoteId: 'id' },
      draft: { type: 'geojson', data: empty },
      vertices: { type: 'geojson', data: empty },
    },
    layers: [
      { id: 'background', type: 'background', paint: { 'background-color': editorPalette.ground } },
      {
        id: 'unit-fill',
        type: 'fill',
        source: 'units',
        paint: {
          'fill-color': [
            'case',
            ['==', ['get', 'selected'], true],
            editorPalette.selectedFill,
            editorPalette.unitFill,
          ] as unknown as string,
          'fill-opacity': 0.85,
        },
      },
      {
        id: 'unit-line',
        type: 'line',
        source: 'units',
        paint: {
          'line-color': [
            'case',
            ['==', ['get', 'selected'], true],
            editorPalette.selectedLine,
            editorPalette.unitLine,
          ] as unknown as string,
          'line-width': ['case', ['==', ['get', 'selected'], true], 3, 1.5] as unknown as number,
        },
      },
      {
        id: 'draft-fill',
        type: 'fill',
        source: 'draft',
        filter: ['==', ['geometry-type'], 'Polygon'],
        paint: { 'fill-color': editorPalette.draftFill, 'fill-opacity': 0.35 },
      },
      {
        id: 'draft-line',
        type: 'line',
        source: 'draft',
        paint: { 'line-color': editorPalette.draftLine, 'line-width': 3, 'line-dasharray': [2, 1] },
      },
      {
        id: 'draft-vertex',
        type: 'circle',
        source: 'vertices',
        paint: {
          'circle-radius': ['case', ['==', ['get', 'first'], true], 9, 7] as unknown as number,
          'circle-color': ['case', ['==', ['get', 'first'], true], editorPalette.firstVertex, editorPalette.vertex] as unknown as string,
          'circle-stroke-color': editorPalette.vertexStroke,
          'circle-stroke-width': 2.5,
        },
      },
    ],
  };
}
