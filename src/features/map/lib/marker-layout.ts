export interface MarkerBox {
  id: string;
  /** Anchor on screen (the unit's centre), px. */
  x: number;
  y: number;
  w: number;
  h: number;
  /** Lower keeps its place first (most urgent status). */
  rank: number;
}

export interface MarkerOffset {
  dx: number;
  dy: number;
}

const GAP = 4;
/** Distance between a cluster's units and the column of their labels, px. */
const COLUMN_GAP = 18;

type Rect = { x: number; y: number; w: number; h: number };

function overlaps(a: Rect, b: Rect) {
  return Math.abs(a.x - b.x) * 2 < a.w + b.w + GAP && Math.abs(a.y - b.y) * 2 < a.h + b.h + GAP;
}

/** Groups of labels that would touch where they stand (union–find over overlapping pairs). */
function clusters(boxes: readonly MarkerBox[]): MarkerBox[][] {
  const parent = boxes.map((_, i) => i);
  const find = (i: number): number => (parent[i] === i ? i : (parent[i] = find(parent[i]!)));
  for (let i = 0; i < boxes.length; i++) {
    for (let j = i + 1; j < boxes.length; j++) if (overlaps(boxes[i]!, boxes[j]!)) parent[find(i)] = find(j);
  }
  const groups = new Map<number, MarkerBox[]>();
  boxes.forEach((b, i) => {
    const root = find(i);
    groups.set(root, [...(groups.get(root) ?? []), b]);
  });
  return [...groups.values()];
}

/** Nearby free spots, nearest first, for a label that still overlaps after the columns are laid. */
function nudges(w: number, h: number): MarkerOffset[] {
  const out: MarkerOffset[] = [{ dx: 0, dy: 0 }];
  for (let ring = 1; ring <= 4; ring++) {
    out.push(
      { dx: 0, dy: -ring * (h + GAP) },
      { dx: 0, dy: ring * (h + GAP) },
      { dx: ring * (w + GAP), dy: 0 },
      { dx: -ring * (w + GAP), dy: 0 },
    );
  }
  return out;
}

/**
 * Keeps unit labels from covering each other. A label that touches no other stays on its unit.
 * Labels that would touch (raceways lie a few metres apart) are set out as a column beside their
 * group, in the order the units lie from left to right, each with a leader line to its unit; the
 * column goes on the right unless it would leave the view. Anything still overlapping is nudged.
 */
export function layoutMarkers(boxes: readonly MarkerBox[], view?: { width: number; height: number }): Map<string, MarkerOffset> {
  const result = new Map<string, MarkerOffset>();
  for (const group of clusters(boxes)) {
    if (group.length === 1) {
      result.set(group[0]!.id, { dx: 0, dy: 0 });
      continue;
    }
    const ordered = [...group].sort((a, b) => a.x - b.x || a.y - b.y);
    const w = Math.max(...group.map((b) => b.w));
    const h = Math.max(...group.map((b) => b.h));
    // The column must clear the units themselves (their anchors), not the labels it replaces.
    const maxX = Math.max(...group.map((b) => b.x));
    const minX = Math.min(...group.map((b) => b.x));
    let x = maxX + COLUMN_GAP + w / 2;
    if (view) {
      const clamped = Math.min(x, view.width - w / 2 - GAP);
      x = clamped - w / 2 >= maxX + COLUMN_GAP / 2 ? clamped : Math.max(minX - COLUMN_GAP - w / 2, w / 2 + GAP);
    }
    const meanY = group.reduce((s, b) => s + b.y, 0) / group.length;
    const step = h + GAP;
    let top = meanY - ((ordered.length - 1) * step) / 2;
    if (view) top = Math.min(Math.max(top, h / 2 + GAP), Math.max(h / 2 + GAP, view.height - h / 2 - GAP - (ordered.length - 1) * step));
    ordered.forEach((b, i) => result.set(b.id, { dx: x - b.x, dy: top + i * step - b.y }));
  }
  // Most urgent first: each keeps its spot, later ones move to the nearest free one.
  const placed: Rect[] = [];
  for (const b of [...boxes].sort((a, c) => a.rank - c.rank)) {
    const base = result.get(b.id)!;
    const choice =
      nudges(b.w, b.h)
        .map((n) => ({ dx: base.dx + n.dx, dy: base.dy + n.dy }))
        .find((o) => !placed.some((p) => overlaps({ x: b.x + o.dx, y: b.y + o.dy, w: b.w, h: b.h }, p))) ?? base;
    placed.push({ x: b.x + choice.dx, y: b.y + choice.dy, w: b.w, h: b.h });
    result.set(b.id, choice);
  }
  return result;
}
