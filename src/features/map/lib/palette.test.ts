import { describe, expect, it } from 'vitest';
import { mapPalette, paletteSources, statusGlyph } from './palette';

// The test runs in Node (jsdom on top); the client's tsconfig has no Node types, hence the narrow cast.
type NodeProcess = { cwd(): string; getBuiltinModule(id: 'node:fs'): { readFileSync(path: string, encoding: 'utf8'): string } };
const node = (globalThis as unknown as { process: NodeProcess }).process;
// vitest runs from the repository root.
const css = node.getBuiltinModule('node:fs').readFileSync(`${node.cwd()}/src/index.css`, 'utf8');

function themeColour(variable: string): string | undefined {
  return new RegExp(`${variable}:\\s*(#[0-9a-fA-F]{6})`).exec(css)?.[1]?.toLowerCase();
}

function paletteValue(path: string): string {
  let v: unknown = mapPalette;
  for (const part of path.split('.')) v = (v as Record<string, unknown>)[part];
  return String(v);
}

describe('map palette', () => {
  it('paints with the colours of the house theme in src/index.css', () => {
    for (const [path, variable] of Object.entries(paletteSources)) {
      expect(paletteValue(path), `${path} ← ${variable}`).toBe(themeColour(variable));
    }
  });

  it('gives each status its own shape', () => {
    expect(new Set(Object.values(statusGlyph)).size).toBe(Object.keys(statusGlyph).length);
    expect([statusGlyph.clear, statusGlyph.watch, statusGlyph.act, statusGlyph.silent]).toEqual(['●', '▲', '◆', '○']);
  });
});
