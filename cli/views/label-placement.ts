/**
 * Placing text labels beside points without collisions, for the plots and the drawing: each label in
 * turn (the caller orders them by priority) takes the first of a ring of candidate positions around
 * its point, nearest first, whose box stays inside the bounds and overlaps no label placed before it
 * and no obstacle (the marks the labels must not cover); a label placed away from its point gets a
 * leader line; a label with no free position is dropped and counted, so the picture can say so.
 *
 * Text boxes are estimated from the font size: TEXT_WIDTH_PER_EM × font size per character wide
 * (0.62 em, about the average advance of DejaVu Sans digits and lower case, from memory, rounded up),
 * TEXT_HEIGHT_PER_EM × font size tall (ascent 0.8 em above the baseline, descent 0.25 em below).
 */

/** A box in picture coordinates, y down. */
export interface Box {
  x0: number;
  y0: number;
  x1: number;
  y1: number;
}

export type TextAnchor = 'start' | 'middle' | 'end';

export const TEXT_WIDTH_PER_EM = 0.62;
export const TEXT_ASCENT_PER_EM = 0.8;
export const TEXT_DESCENT_PER_EM = 0.25;

/** The estimated box of a text drawn at (x, y) on its baseline with the given anchor. */
export function textBox(x: number, y: number, text: string, fontSize: number, anchor: TextAnchor): Box {
  const width = TEXT_WIDTH_PER_EM * fontSize * [...text].length;
  const x0 = anchor === 'start' ? x : anchor === 'middle' ? x - width / 2 : x - width;
  return { x0, y0: y - TEXT_ASCENT_PER_EM * fontSize, x1: x0 + width, y1: y + TEXT_DESCENT_PER_EM * fontSize };
}

export function boxesOverlap(a: Box, b: Box): boolean {
  return a.x0 < b.x1 && b.x0 < a.x1 && a.y0 < b.y1 && b.y0 < a.y1;
}

/** A label wanted beside a point. */
export interface LabelRequest {
  /** The point, picture coordinates. */
  x: number;
  y: number;
  text: string;
  fontSize: number;
  /** Room the point's own mark takes around it, px (the label starts beyond it). */
  clearance: number;
  /** Direction tried first, [dx, dy] in −1, 0, 1 (default up and to the right). */
  prefer?: [number, number];
}

/** A label placed: its text position and anchor, and the leader from the point when it stands away. */
export interface PlacedLabel {
  request: LabelRequest;
  x: number;
  y: number;
  anchor: TextAnchor;
  box: Box;
  leader: { x1: number; y1: number; x2: number; y2: number } | null;
}

export interface Placement {
  placed: PlacedLabel[];
  dropped: LabelRequest[];
}

/** Directions tried around a point, nearest to the usual upper-right first: [dx, dy] unit steps. */
const DIRECTIONS: ReadonlyArray<[number, number]> = [
  [1, -1],
  [1, 0],
  [1, 1],
  [0, -1],
  [-1, -1],
  [-1, 0],
  [-1, 1],
  [0, 1],
];
/** Distances tried beyond the clearance, px: beside the point, then out on a leader line. */
const RINGS = [2, 14, 30, 50];

/** The text position for a label whose near corner or edge is at (cx, cy) in direction (dx, dy). */
function candidate(request: LabelRequest, dx: number, dy: number, distance: number): PlacedLabel {
  const reach = request.clearance + distance;
  const diagonal = dx !== 0 && dy !== 0 ? Math.SQRT1_2 : 1;
  const cx = request.x + dx * reach * diagonal;
  const cy = request.y + dy * reach * diagonal;
  const anchor: TextAnchor = dx > 0 ? 'start' : dx < 0 ? 'end' : 'middle';
  const { fontSize } = request;
  // vertical: above the point the box's bottom sits at cy, below its top, level its middle
  const baseline =
    dy < 0
      ? cy - TEXT_DESCENT_PER_EM * fontSize
      : dy > 0
        ? cy + TEXT_ASCENT_PER_EM * fontSize
        : cy + ((TEXT_ASCENT_PER_EM - TEXT_DESCENT_PER_EM) / 2) * fontSize;
  const box = textBox(cx, baseline, request.text, fontSize, anchor);
  const leader = distance > RINGS[0] ? { x1: request.x, y1: request.y, x2: cx, y2: cy } : null;
  return { request, x: cx, y: baseline, anchor, box, leader };
}

function inside(box: Box, bounds: Box): boolean {
  return box.x0 >= bounds.x0 && box.x1 <= bounds.x1 && box.y0 >= bounds.y0 && box.y1 <= bounds.y1;
}

/**
 * Places the labels in the order given (priority first), each at its first free candidate position;
 * a label with none is dropped. Deterministic for the same input.
 */
export function placeLabels(requests: readonly LabelRequest[], bounds: Box, obstacles: readonly Box[] = []): Placement {
  const taken: Box[] = [...obstacles];
  const placed: PlacedLabel[] = [];
  const dropped: LabelRequest[] = [];
  for (const request of requests) {
    let chosen: PlacedLabel | null = null;
    const directions = request.prefer ? [request.prefer, ...DIRECTIONS] : DIRECTIONS;
    for (const distance of RINGS) {
      for (const [dx, dy] of directions) {
        const trial = candidate(request, dx, dy, distance);
        if (!inside(trial.box, bounds)) continue;
        if (taken.some((box) => boxesOverlap(box, trial.box))) continue;
        chosen = trial;
        break;
      }
      if (chosen !== null) break;
    }
    if (chosen === null) dropped.push(request);
    else {
      placed.push(chosen);
      taken.push(chosen.box);
    }
  }
  return { placed, dropped };
}

/** The box a point mark of the given radius covers. */
export function pointBox(x: number, y: number, radius: number): Box {
  return { x0: x - radius, y0: y - radius, x1: x + radius, y1: y + radius };
}
