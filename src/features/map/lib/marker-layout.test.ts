import { describe, expect, it } from 'vitest';
import { layoutMarkers, type MarkerBox } from './marker-layout';

const box = (id: string, x: number, y: number, rank = 1): MarkerBox => ({ id, x, y, w: 50, h: 28, rank });

function placed(boxes: MarkerBox[], view?: { width: number; height: number }) {
  const offsets = layoutMarkers(boxes, view);
  return boxes.map((b) => ({ ...b, x: b.x + offsets.get(b.id)!.dx, y: b.y + offsets.get(b.id)!.dy }));
}

function noneOverlap(boxes: MarkerBox[]) {
  for (let i = 0; i < boxes.length; i++) {
    for (let j = i + 1; j < boxes.length; j++) {
      const a = boxes[i]!;
      const b = boxes[j]!;
      const apart = Math.abs(a.x - b.x) * 2 >= a.w + b.w || Math.abs(a.y - b.y) * 2 >= a.h + b.h;
      expect(apart, `${a.id} and ${b.id}`).toBe(true);
    }
  }
}

describe('layoutMarkers', () => {
  it('leaves labels that do not touch on their units', () => {
    const offsets = layoutMarkers([box('a', 0, 0), box('b', 200, 0), box('c', 0, 200)]);
    for (const o of offsets.values()) expect(o).toEqual({ dx: 0, dy: 0 });
  });

  it('sets the labels of raceways lying side by side out as a column beside them, left to right from the top', () => {
    const raceways = [box('r3', 120, 100), box('r1', 100, 100), box('r4', 130, 100), box('r2', 110, 100)];
    const out = placed(raceways);
    noneOverlap(out);
    const column = [...out].sort((a, b) => a.y - b.y).map((b) => b.id);
    expect(column).toEqual(['r1', 'r2', 'r3', 'r4']);
    expect(new Set(out.map((b) => b.x)).size).toBe(1);
    expect(out[0]!.x).toBeGreaterThan(130 + 25); // to the right of the group
  });

  it('puts the column on the left when the right would leave the view', () => {
    const out = placed([box('r1', 360, 100), box('r2', 370, 100)], { width: 390, height: 300 });
    for (const b of out) expect(b.x).toBeLessThan(360);
    noneOverlap(out);
  });

  it('nudges a column label off a neighbouring unit’s label, the more urgent one keeping its place', () => {
    const out = placed([box('p6', 190, 100, 0), box('r1', 100, 100, 4), box('r2', 110, 100, 4)]);
    noneOverlap(out);
    expect(out.find((b) => b.id === 'p6')).toMatchObject({ x: 190, y: 100 });
  });
});
