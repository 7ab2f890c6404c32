import type { UnitStatusLevel } from '@shared/schemas/farms.schema';

/**
 * The house theme colours the map paints with. MapLibre needs literal colours, so these mirror the
 * `--color-*` variables of src/index.css (palette.test.ts keeps the two in step).
 */
export const mapPalette = {
  ground: '#f6f3ec', // paper
  farmGround: '#fdf5e8', // ember-50
  farmEdge: '#c3cbcc', // line
  water: '#d8e9e8', // abyss-100
  selected: '#f0ad4a', // ember-400
  selectedHalo: '#061d21', // abyss-950
  probe: '#15525a', // abyss-700
  probeStroke: '#ffffff',
  status: {
    clear: { fill: '#dbefe2', line: '#1d7648' },
    watch: { fill: '#fcebc4', line: '#9c5d00' },
    act: { fill: '#f9dcd8', line: '#b1261c' },
    silent: { fill: '#e3e7e9', line: '#5a666d' },
    unrated: { fill: '#eef5f4', line: '#46555c' },
  },
} as const;

/** The theme variable each palette entry copies, for the test. */
export const paletteSources: Record<string, string> = {
  ground: '--color-paper',
  farmGround: '--color-ember-50',
  farmEdge: '--color-line',
  water: '--color-abyss-100',
  selected: '--color-ember-400',
  selectedHalo: '--color-abyss-950',
  probe: '--color-abyss-700',
  'status.clear.fill': '--color-clear-soft',
  'status.clear.line': '--color-clear',
  'status.watch.fill': '--color-watch-soft',
  'status.watch.line': '--color-watch',
  'status.act.fill': '--color-act-soft',
  'status.act.line': '--color-act',
  'status.silent.fill': '--color-silent-soft',
  'status.silent.line': '--color-silent',
  'status.unrated.fill': '--color-abyss-50',
  'status.unrated.line': '--color-muted',
};

/** A unit with no status from the server yet (the alerts evaluation has not rated it). */
export type MapStatus = UnitStatusLevel | 'unrated';

export const mapStatuses: readonly MapStatus[] = ['act', 'watch', 'silent', 'clear', 'unrated'];

/** Shapes that carry the status without colour (product.md): clear ●, watch ▲, act ◆, silent ○. */
export const statusGlyph: Record<MapStatus, string> = {
  clear: '●',
  watch: '▲',
  act: '◆',
  silent: '○',
  unrated: '–',
};

/** Most urgent first; used for sorting lists and for which marker keeps its place on the map. */
export const statusRank: Record<MapStatus, number> = { act: 0, watch: 1, silent: 2, unrated: 3, clear: 4 };

export function mapStatusOf(status: UnitStatusLevel | null | undefined): MapStatus {
  return status ?? 'unrated';
}
