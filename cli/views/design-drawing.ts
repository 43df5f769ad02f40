/**
 * A design drawn to scale in elevation, as hand-written SVG: the floor, the primary rings (the
 * tapped part solid, the rest hollow, the tap marked), the strike rail, the coil form and the
 * winding coloured by the voltage along it, the topload with the spot of its peak surface field,
 * the equipotential lines of the solved field (d3-contour over the potential on a grid, computed
 * from the solved charges), the overall height and the strike distance dimensioned, and a title
 * block with the key figures and the one-line caution.
 *
 * Scale: one metre is `scale` SVG units (the root element says so in data-scale, and the title block
 * as a ratio), the same on both axes; heights above the floor go up the page. Every body carries a
 * class (floor, primary-ring, strike-rail, coil-form, winding, topload, center-disc, support,
 * breakout-point, equipotential, peak-field, resonator (a three-coil system's, on its own axis with its
 * field, to the right), feed-line,
 * dimension) so that tests and style sheets can find it.
 */
import { contours } from 'd3-contour';
import type { Design } from '../../core/design.ts';
import type { DesignField } from '../../core/design-field.ts';
import { potentialAt } from '../../core/electrostatics/field-potential.ts';
import { toploadCentreHeight, toploadToRingDistance } from '../../core/outcome/clearance.ts';
import { METRIC_DISPLAY, formatNumber, humanUnit, lengthText } from '../display-units.ts';
import { type Box, type LabelRequest, placeLabels, textBox } from './label-placement.ts';
import { PICTURE_CAUTION, wrapText } from './vega-render.ts';

/** Our own palette for drawings. */
export const DRAWING_COLOURS = {
  paper: '#fbfaf6',
  ink: '#26313b',
  floor: '#6d5d4b',
  copper: '#b8642b',
  copperMuted: '#e7c3a3',
  rail: '#4a5a66',
  form: '#e9e2d0',
  topload: '#9aa7b1',
  equipotential: '#3d7ea6',
  peak: '#d1253f',
  dimension: '#55606a',
  support: '#c9b98f',
  point: '#7a3b8f',
};

/** The winding's voltage ramp, 0 at the base to 1 at the top: slate blue, sage, amber, vermilion. */
const VOLTAGE_RAMP = ['#34557a', '#6f9a8d', '#e2b13c', '#d1452c'];

/** Colour of a voltage fraction on the ramp. */
export function voltageColour(fraction: number): string {
  const x = Math.min(1, Math.max(0, fraction)) * (VOLTAGE_RAMP.length - 1);
  const k = Math.min(VOLTAGE_RAMP.length - 2, Math.floor(x));
  const t = x - k;
  const a = VOLTAGE_RAMP[k];
  const b = VOLTAGE_RAMP[k + 1];
  const channel = (i: number) => {
    const va = Number.parseInt(a.slice(1 + 2 * i, 3 + 2 * i), 16);
    const vb = Number.parseInt(b.slice(1 + 2 * i, 3 + 2 * i), 16);
    return Math.round(va + (vb - va) * t)
      .toString(16)
      .padStart(2, '0');
  };
  return `#${channel(0)}${channel(1)}${channel(2)}`;
}

/** Equipotential levels, fractions of the top voltage. */
export const EQUIPOTENTIAL_LEVELS = [0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9];

export interface DrawingOptions {
  /** First line of the title block (the file or the run and rank). */
  title: string;
  /** Height of the drawing area, SVG units (default 640). */
  height?: number;
  /** Grid cells across the half-width for the field (default 70). */
  fieldColumns?: number;
  /** Height of the picture above the floor, m (default: the highest point plus 15 % and 5 cm); one value for several drawings puts them at one scale. */
  pictureTop?: number;
}

const TITLE_BLOCK_WIDTH = 300;
/** Room between the drawing and the title block for the labels of the right-hand side. */
const LABEL_ROOM = 170;
const MARGIN = 56;

function escapeXml(text: string): string {
  return text.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
}

function n(value: number): string {
  return String(Math.round(value * 100) / 100);
}

/** A metric in its display unit, e.g. '91.46 kHz', or '—'. */
export function metricText(metrics: Record<string, number | null>, key: string, digits = 4): string {
  const value = metrics[key];
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  const display = METRIC_DISPLAY[key];
  if (!display) return formatNumber(value, digits);
  const label = humanUnit(display.label);
  return `${formatNumber(value / display.divisor, digits)}${label === '' ? '' : ` ${label}`}`;
}

/** A path through the isoline rings of one contour level, broken where a ring runs along the grid's border. */
function isolinePath(
  coordinates: number[][][][],
  columns: number,
  rows: number,
  toX: (column: number) => number,
  toY: (row: number) => number,
): string {
  const onBorder = (p: number[]) => p[0] <= 0 || p[0] >= columns || p[1] <= 0 || p[1] >= rows;
  const parts: string[] = [];
  for (const polygon of coordinates) {
    for (const ring of polygon) {
      let pen = false;
      for (let i = 0; i < ring.length; i++) {
        const p = ring[i];
        const previous = i > 0 ? ring[i - 1] : null;
        const borderSegment = previous !== null && onBorder(previous) && onBorder(p);
        if (borderSegment || previous === null) {
          pen = false;
        }
        if (borderSegment) continue;
        // d3-contour's grid coordinates put sample k at k + 0.5.
        const x = toX(p[0] - 0.5);
        const y = toY(p[1] - 0.5);
        parts.push(`${pen ? 'L' : 'M'}${Math.round(x * 10) / 10},${Math.round(y * 10) / 10}`);
        pen = true;
      }
    }
  }
  return parts.join('');
}

/** What the parts of the drawing share: the design, its field, the picture's scale and what is drawn so far. */
interface Canvas {
  design: Design;
  field: DesignField;
  metrics: Record<string, number | null>;
  secondary: DesignField['secondary'];
  primary: DesignField['primary'];
  topload: Design['topload'];
  toploadCentre: number | null;
  X: (r: number) => number;
  Y: (z: number) => number;
  scale: number;
  axisX: number;
  floorY: number;
  drawingWidth: number;
  halfWidth: number;
  fieldTop: number;
  options: DrawingOptions;
  out: string[];
  callouts: Callout[];
  obstacles: Box[];
}

/** Equipotentials of the solved field, mirrored about the axis; returns the levels drawn. */
function drawField(c: Canvas): number {
  const { field, X, Y, halfWidth, fieldTop, options, out } = c;
  const solved = field.field;
  let levelsDrawn = 0;
  if (solved && field.arrangement) {
    const half = Math.max(8, options.fieldColumns ?? 70);
    const cell = halfWidth / half;
    const rows = Math.max(8, Math.ceil(fieldTop / cell));
    const columns = 2 * half + 1;
    const values = new Array<number>(columns * rows);
    const floor = field.arrangement.floor;
    for (let i = 0; i < rows; i++) {
      // Row 0 at the top of the picture (d3-contour's y grows down, as the SVG's does).
      const z = fieldTop - i * (fieldTop / (rows - 1));
      for (let k = 0; k <= half; k++) {
        const value = potentialAt(solved.layout, solved.density, floor, k * cell, z);
        values[i * columns + half + k] = value;
        values[i * columns + half - k] = value;
      }
    }
    const toX = (column: number) => X((column - half) * cell);
    const toY = (row: number) => Y(fieldTop - row * (fieldTop / (rows - 1)));
    const generator = contours().size([columns, rows]).thresholds(EQUIPOTENTIAL_LEVELS);
    out.push('<g class="equipotentials" fill="none">');
    for (const contour of generator(values)) {
      const path = isolinePath(contour.coordinates, columns, rows, toX, toY);
      if (path === '') continue;
      levelsDrawn++;
      out.push(
        `<path class="equipotential" data-level="${contour.value}" d="${path}" stroke="${DRAWING_COLOURS.equipotential}" stroke-width="${contour.value === 0.5 ? 1.4 : 0.8}" stroke-opacity="0.75"/>`,
      );
    }
    out.push('</g>');
  }
  return levelsDrawn;
}

/** The floor, hatched. */
function drawFloor(c: Canvas): void {
  const { floorY, drawingWidth, out } = c;
  out.push(
    `<line class="floor" x1="${MARGIN / 2}" y1="${n(floorY)}" x2="${n(MARGIN * 1.5 + drawingWidth)}" y2="${n(floorY)}" stroke="${DRAWING_COLOURS.floor}" stroke-width="2"/>`,
  );
  for (let x = MARGIN / 2; x < MARGIN * 1.5 + drawingWidth; x += 12) {
    out.push(
      `<line x1="${n(x)}" y1="${n(floorY)}" x2="${n(x - 8)}" y2="${n(floorY + 8)}" stroke="${DRAWING_COLOURS.floor}" stroke-width="0.8"/>`,
    );
  }
}

/** The coil form and the winding, coloured by its voltage. */
function drawSecondary(c: Canvas): void {
  const { design, field, secondary, X, Y, scale, out, obstacles } = c;
  if (secondary) {
    const formRadius = design.secondary ? design.secondary.formDiameter / 2 : secondary.radius;
    const formBottom = 0;
    const formTop = secondary.topZ + secondary.overallDiameter;
    out.push(
      `<rect class="coil-form" x="${n(X(-formRadius))}" y="${n(Y(formTop))}" width="${n(2 * formRadius * scale)}" height="${n((formTop - formBottom) * scale)}" fill="${DRAWING_COLOURS.form}" stroke="${DRAWING_COLOURS.ink}" stroke-width="0.6"/>`,
    );
    obstacles.push({ x0: X(-formRadius), y0: Y(formTop), x1: X(formRadius), y1: Y(formBottom) });
    const bands = 40;
    const profile = field.profile ?? ((x: number) => x);
    const length = secondary.topZ - secondary.bottomZ;
    const thickness = Math.max(2, secondary.overallDiameter * scale * 2);
    out.push(
      `<g class="winding" data-bottom-z="${secondary.bottomZ}" data-top-z="${secondary.topZ}" data-radius="${secondary.radius}">`,
    );
    for (let b = 0; b < bands; b++) {
      const z0 = secondary.bottomZ + (length * b) / bands;
      const z1 = secondary.bottomZ + (length * (b + 1)) / bands;
      const colour = voltageColour(profile((b + 0.5) / bands));
      for (const side of [-1, 1]) {
        const x = side < 0 ? X(-secondary.radius) - thickness / 2 : X(secondary.radius) - thickness / 2;
        out.push(
          `<rect x="${n(x)}" y="${n(Y(z1))}" width="${n(thickness)}" height="${n((z1 - z0) * scale + 0.3)}" fill="${colour}"/>`,
        );
      }
    }
    out.push('</g>');
  }
}

/** The primary rings (the tapped part solid, the rest hollow) and the tap. */
function drawPrimary(c: Canvas): void {
  const { primary, X, Y, scale, out, callouts } = c;
  if (primary && primary.rings.length > 0) {
    const radius = Math.max(1.6, primary.conductorRadius * scale);
    out.push(`<g class="primary" data-tap-turns="${primary.tapTurns}">`);
    for (let i = 0; i < primary.rings.length; i++) {
      const ring = primary.rings[i];
      const tapped = i < primary.tapTurns;
      for (const side of [-1, 1]) {
        out.push(
          `<circle class="primary-ring" cx="${n(X(side * ring.r))}" cy="${n(Y(ring.z))}" r="${n(radius)}" fill="${tapped ? DRAWING_COLOURS.copper : DRAWING_COLOURS.copperMuted}" stroke="${DRAWING_COLOURS.copper}" stroke-width="0.6"/>`,
        );
      }
    }
    // The tap: between ring floor(t) and the next, at the fraction of the way.
    const t = Math.min(primary.tapTurns, primary.rings.length - 1);
    const k = Math.max(0, Math.min(primary.rings.length - 1, Math.floor(t)));
    const next = primary.rings[Math.min(primary.rings.length - 1, k + 1)];
    const ring = primary.rings[k];
    const w = t - k;
    const tapR = ring.r + (next.r - ring.r) * w;
    const tapZ = ring.z + (next.z - ring.z) * w;
    const tx = X(tapR);
    const ty = Y(tapZ) + radius + 2;
    out.push(`<path class="tap" d="M${n(tx)},${n(ty)} l-5,10 h10 z" fill="${DRAWING_COLOURS.ink}"/>`);
    callouts.push({
      x: tx,
      y: ty + 5,
      text: `tap ${formatNumber(primary.tapTurns, 3)} turns`,
      fontSize: 10,
      clearance: 7,
      prefer: [0, 1],
      className: 'tap-label',
      colour: DRAWING_COLOURS.ink,
    });
    out.push('</g>');
  }
}

/** The strike rail. */
function drawStrikeRail(c: Canvas): void {
  const { design, secondary, X, Y, scale, out } = c;
  if (design.strikeRail && secondary) {
    const rail = design.strikeRail;
    const z = secondary.bottomZ + rail.elevation;
    const radius = Math.max(1.8, (rail.conductorDiameter / 2) * scale);
    for (const side of [-1, 1]) {
      out.push(
        `<circle class="strike-rail" cx="${n(X((side * rail.diameter) / 2))}" cy="${n(Y(z))}" r="${n(radius)}" fill="${DRAWING_COLOURS.rail}"/>`,
      );
    }
  }
}

/** A toroid's centre disc: it fills the hole at the mid-plane out to the tube's inner edge (bodies.ts). */
function drawCenterDisc(c: Canvas, radius: number, centre: number): void {
  const { X, Y, scale, out } = c;
  const thickness = Math.max(1.2, 0.004 * scale);
  out.push(
    `<rect class="center-disc" x="${n(X(-radius))}" y="${n(Y(centre) - thickness / 2)}" width="${n(2 * radius * scale)}" height="${n(thickness)}" fill="${DRAWING_COLOURS.topload}" stroke="${DRAWING_COLOURS.ink}" stroke-width="0.6" data-diameter="${2 * radius}"/>`,
  );
}

/** The topload, its peak-field spot and the strike distance. */
function drawTopload(c: Canvas): void {
  const { design, field, metrics, topload, toploadCentre, X, Y, scale, axisX, out, callouts, obstacles } = c;
  if (topload && toploadCentre !== null) {
    if (topload.shape === 'toroid') {
      const outer = topload.outerDiameter / 2;
      const tube = topload.tubeDiameter / 2;
      out.push(
        `<rect class="topload" x="${n(X(-outer))}" y="${n(Y(toploadCentre + tube))}" width="${n(2 * outer * scale)}" height="${n(2 * tube * scale)}" rx="${n(tube * scale)}" fill="${DRAWING_COLOURS.topload}" fill-opacity="0.85" stroke="${DRAWING_COLOURS.ink}" stroke-width="0.8" data-outer-diameter="${topload.outerDiameter}"/>`,
      );
      obstacles.push({ x0: X(-outer), y0: Y(toploadCentre + tube), x1: X(outer), y1: Y(toploadCentre - tube) });
      if (topload.centerDisc) drawCenterDisc(c, outer - 2 * tube, toploadCentre);
    } else {
      out.push(
        `<circle class="topload" cx="${n(axisX)}" cy="${n(Y(toploadCentre))}" r="${n((topload.diameter / 2) * scale)}" fill="${DRAWING_COLOURS.topload}" fill-opacity="0.85" stroke="${DRAWING_COLOURS.ink}" stroke-width="0.8" data-outer-diameter="${topload.diameter}"/>`,
      );
      const r = topload.diameter / 2;
      obstacles.push({ x0: X(-r), y0: Y(toploadCentre + r), x1: X(r), y1: Y(toploadCentre - r) });
    }
    const angle = metrics.topload_peak_field_angle;
    if (angle !== null && angle !== undefined) {
      const centreR = topload.shape === 'toroid' ? (topload.outerDiameter - topload.tubeDiameter) / 2 : 0;
      const radius = topload.shape === 'toroid' ? topload.tubeDiameter / 2 : topload.diameter / 2;
      const px = X(centreR + radius * Math.cos(angle));
      const py = Y(toploadCentre + radius * Math.sin(angle));
      const field = metricText(metrics, 'topload_peak_field', 3);
      const label =
        field !== '—'
          ? `peak field ${field}`
          : `peak field ${metricText(metrics, 'topload_field_per_volt', 3)} per volt`;
      out.push(
        `<g class="peak-field"><circle cx="${n(px)}" cy="${n(py)}" r="5" fill="${DRAWING_COLOURS.peak}" stroke="white" stroke-width="1.2"/></g>`,
      );
      callouts.push({
        x: px,
        y: py,
        text: label,
        fontSize: 11,
        clearance: 7,
        className: 'peak-field-label',
        colour: DRAWING_COLOURS.peak,
      });
    }
    const target = strikeTarget(design, field);
    if (target) {
      const distance = toploadToRingDistance(topload, toploadCentre, target.ring);
      const centreR = topload.shape === 'toroid' ? (topload.outerDiameter - topload.tubeDiameter) / 2 : 0;
      const radius = topload.shape === 'toroid' ? topload.tubeDiameter / 2 : topload.diameter / 2;
      const dr = target.ring.r - centreR;
      const dz = target.ring.z - toploadCentre;
      const length = Math.hypot(dr, dz);
      if (length > radius) {
        const sr = centreR + (radius * dr) / length;
        const sz = toploadCentre + (radius * dz) / length;
        const mx = X((sr + target.ring.r) / 2);
        const my = Y((sz + target.ring.z) / 2);
        out.push(
          `<g class="dimension strike-distance" data-metres="${distance}"><line x1="${n(X(sr))}" y1="${n(Y(sz))}" x2="${n(X(target.ring.r))}" y2="${n(Y(target.ring.z))}" stroke="${DRAWING_COLOURS.dimension}" stroke-dasharray="5 3" stroke-width="1"/></g>`,
        );
        callouts.push({
          x: mx,
          y: my,
          text: `strike ${lengthText(distance)} to ${target.what}`,
          fontSize: 11,
          clearance: 3,
          prefer: [1, 0],
          className: 'strike-distance-label',
          colour: DRAWING_COLOURS.dimension,
        });
      }
    }
  }
}

/** The insulating support (both sides of the axis for rods) and the breakout point. */
function drawSupportAndPoint(c: Canvas): void {
  const { design, field, metrics, topload, toploadCentre, X, Y, scale, out, callouts } = c;
  if (field.support) {
    const member = field.support;
    const width = Math.max(1.5, (design.support?.diameter ?? 0) * scale);
    // a column stands on the axis (its member runs along its surface); rods are drawn on both sides
    const column = design.support?.kind === 'column';
    for (const side of column ? [0] : [1, -1])
      out.push(
        `<line class="support" x1="${n(X(side * member.r0))}" y1="${n(Y(member.z0))}" x2="${n(X(side * member.r1))}" y2="${n(Y(member.z1))}" stroke="${DRAWING_COLOURS.support}" stroke-width="${n(width)}" stroke-linecap="butt" data-diameter="${design.support?.diameter ?? 0}"/>`,
      );
  }
  const point = design.breakoutPoint;
  const pointLength = metrics.breakout_point_length;
  if (point && topload && toploadCentre !== null && pointLength !== null && pointLength !== undefined) {
    const tip = point.tipRadius;
    const toroid = topload.shape === 'toroid';
    const outer = toroid ? topload.outerDiameter / 2 : topload.diameter / 2;
    const rise = toroid ? topload.tubeDiameter / 2 : topload.diameter / 2;
    const onDisc = toroid && topload.centerDisc === true && point.position === 'top';
    const crownR = toroid && !onDisc ? (topload.outerDiameter - topload.tubeDiameter) / 2 : 0;
    // on a centre disc it stands on the axis from the disc (axis-point.ts)
    const base = onDisc ? toploadCentre : toploadCentre + rise;
    // top: up from the crown (a sphere's pole, a toroid's crown on both sides); rim: out from the equator
    const ends: Array<[number, number, number, number]> =
      point.position === 'top'
        ? (crownR === 0 ? [1] : [1, -1]).map((side) => [side * crownR, base, side * crownR, base + pointLength])
        : [1, -1].map((side) => [side * outer, toploadCentre, side * (outer + pointLength), toploadCentre]);
    const [, , labelR, labelZ] = ends[0] ?? [0, 0, 0, 0];
    callouts.push({
      x: X(labelR),
      y: Y(labelZ),
      text: `breakout point ${lengthText(pointLength, 3)}`,
      fontSize: 11,
      clearance: 4,
      className: 'breakout-point-label',
      colour: DRAWING_COLOURS.point,
    });
    for (const [r0, z0, r1, z1] of ends)
      out.push(
        `<g class="breakout-point" data-length="${pointLength}"><line x1="${n(X(r0))}" y1="${n(Y(z0))}" x2="${n(X(r1))}" y2="${n(Y(z1))}" stroke="${DRAWING_COLOURS.point}" stroke-width="${n(Math.max(1.2, 2 * tip * scale))}"/><circle cx="${n(X(r1))}" cy="${n(Y(z1))}" r="${n(Math.max(1.2, tip * scale))}" fill="${DRAWING_COLOURS.point}"/></g>`,
      );
  }
}

/** The overall height, dimensioned on the left. */
function drawOverallHeight(c: Canvas): void {
  const { metrics, X, Y, floorY, out, obstacles } = c;
  const overall = metrics.overall_height;
  if (overall !== null && overall !== undefined && Number.isFinite(overall)) {
    const x = MARGIN * 0.6;
    const along = textBox(0, 0, `overall height ${lengthText(overall)}`, 11, 'middle');
    const middle = (floorY + Y(overall)) / 2;
    // rotated by −90° about (x − 6, middle): the text's width runs up the page, its ascent to the left
    obstacles.push({ x0: x - 6 + along.y0, y0: middle + along.x0, x1: x - 6 + along.y1, y1: middle + along.x1 });
    out.push(
      `<g class="dimension overall-height" data-metres="${overall}"><line x1="${n(x)}" y1="${n(floorY)}" x2="${n(x)}" y2="${n(Y(overall))}" stroke="${DRAWING_COLOURS.dimension}" stroke-width="1"/><line x1="${n(x - 5)}" y1="${n(Y(overall))}" x2="${n(X(0))}" y2="${n(Y(overall))}" stroke="${DRAWING_COLOURS.dimension}" stroke-width="0.6" stroke-dasharray="2 3"/><path d="M${n(x)},${n(Y(overall))} l-3,8 h6 z M${n(x)},${n(floorY)} l-3,-8 h6 z" fill="${DRAWING_COLOURS.dimension}"/><text transform="translate(${n(x - 6)},${n((floorY + Y(overall)) / 2)}) rotate(-90)" font-size="11" text-anchor="middle" fill="${DRAWING_COLOURS.dimension}">overall height ${lengthText(overall)}</text></g>`,
    );
  }
}

/** The topload's half-width and its rise above its centre, m. */
function toploadExtent(topload: NonNullable<Design['topload']>): { outer: number; rise: number } {
  return topload.shape === 'toroid'
    ? { outer: topload.outerDiameter / 2, rise: topload.tubeDiameter / 2 }
    : { outer: topload.diameter / 2, rise: topload.diameter / 2 };
}

/**
 * Extent of the picture in metres: the half-width about the secondary's axis (the widest body,
 * with room for the field), the reach to the right (a three-coil resonator's axis and its own
 * half-width beyond it) and the highest point.
 */
function pictureExtent(
  design: Design,
  field: DesignField,
  toploadCentre: number | null,
): { halfWidth: number; right: number; resonatorHalf: number; top: number } {
  const { secondary, primary, resonator } = field;
  let halfWidth = 0.1;
  let top = 0.1;
  if (secondary) {
    halfWidth = Math.max(halfWidth, secondary.radius + secondary.overallDiameter);
    top = Math.max(top, secondary.topZ);
  }
  for (const ring of primary?.rings ?? []) halfWidth = Math.max(halfWidth, ring.r + (primary?.conductorRadius ?? 0));
  if (design.strikeRail) halfWidth = Math.max(halfWidth, design.strikeRail.diameter / 2);
  const topload = design.topload;
  let resonatorHalf = 0;
  if (resonator) {
    resonatorHalf = resonator.winding.radius + resonator.winding.overallDiameter;
    top = Math.max(top, resonator.winding.topZ);
  }
  if (topload && toploadCentre !== null) {
    const { outer, rise } = toploadExtent(topload);
    if (resonator) resonatorHalf = Math.max(resonatorHalf, outer);
    else halfWidth = Math.max(halfWidth, outer);
    top = Math.max(top, toploadCentre + rise);
  }
  halfWidth *= 1.6;
  if (!resonator) return { halfWidth, right: halfWidth, resonatorHalf: 0, top };
  // the resonator's field is drawn on its own axis, short of the secondary's
  resonatorHalf = Math.max(resonatorHalf, Math.min(1.6 * resonatorHalf, resonator.axisSpacing - halfWidth));
  return { halfWidth, right: Math.max(halfWidth, resonator.axisSpacing + resonatorHalf), resonatorHalf, top };
}

/** The SVG drawing of a design (see the module comment). */
export function designDrawingSvg(design: Design, field: DesignField, options: DrawingOptions): string {
  const metrics = field.evaluation.metrics;
  const secondary = field.secondary;
  const primary = field.primary;
  const topload = design.topload;
  const toploadTop = field.resonator ? field.resonator.winding.topZ : secondary ? secondary.topZ : null;
  const toploadCentre = topload ? toploadCentreHeight(topload, toploadTop) : null;

  const { halfWidth, right, resonatorHalf, top } = pictureExtent(design, field, toploadCentre);
  const fieldTop = Math.max(top * 1.15 + 0.05, options.pictureTop ?? 0);
  const drawingHeight = options.height ?? 640;
  const scale = drawingHeight / fieldTop;
  const drawingWidth = (halfWidth + right) * scale;
  const width = Math.ceil(drawingWidth + 2 * MARGIN + LABEL_ROOM + TITLE_BLOCK_WIDTH);
  const height = Math.ceil(drawingHeight + 2 * MARGIN);
  const axisX = MARGIN + halfWidth * scale;
  const floorY = MARGIN + drawingHeight;
  const X = (r: number) => axisX + r * scale;
  const Y = (z: number) => floorY - z * scale;

  const out: string[] = [];
  /** Labels placed at the end so that none overlaps another, the overall height's or a body's. */
  const callouts: Callout[] = [];
  const obstacles: Box[] = [];
  out.push(
    `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}" data-scale="${scale}" data-axis-x="${n(axisX)}" data-floor-y="${n(floorY)}" font-family="DejaVu Sans, Verdana, sans-serif">`,
  );
  out.push(`<rect x="0" y="0" width="${width}" height="${height}" fill="${DRAWING_COLOURS.paper}"/>`);

  const c: Canvas = {
    design,
    field,
    metrics,
    secondary,
    primary,
    topload: field.resonator ? undefined : topload,
    toploadCentre,
    X,
    Y,
    scale,
    axisX,
    floorY,
    drawingWidth,
    halfWidth,
    fieldTop,
    options,
    out,
    callouts,
    obstacles,
  };
  let levelsDrawn = drawField(c);
  drawFloor(c);
  drawSecondary(c);
  drawPrimary(c);
  drawStrikeRail(c);
  drawTopload(c);
  drawSupportAndPoint(c);
  if (field.resonator) levelsDrawn += drawResonator(c, field.resonator, resonatorHalf);
  drawOverallHeight(c);

  const blockX = MARGIN * 1.5 + drawingWidth + LABEL_ROOM;
  out.push(calloutsSvg(callouts, { x0: 0, y0: 0, x1: blockX - 8, y1: height }, obstacles));
  out.push(titleBlock(field, options.title, blockX, MARGIN, scale, levelsDrawn));
  out.push('</svg>');
  return `${out.join('\n')}\n`;
}

/**
 * A three-coil system's resonator on its own axis, `axisSpacing` to the right: its field, form and
 * winding, the topload with its breakout point and support (the same parts as the secondary's, on
 * a canvas shifted to that axis), and the line from the secondary's top across to its base at the
 * line's height (schematic: its route is not modelled beyond its length and height). Returns the equipotential levels drawn.
 */
function drawResonator(c: Canvas, resonator: NonNullable<DesignField['resonator']>, halfWidth: number): number {
  const spec = c.design.resonator;
  if (!spec) return 0;
  const offset = resonator.axisSpacing;
  const design: Design = { ...c.design, secondary: spec.winding };
  delete design.strikeRail;
  const shifted: Canvas = {
    ...c,
    design,
    field: {
      ...c.field,
      secondary: resonator.winding,
      primary: null,
      arrangement: resonator.arrangement,
      field: resonator.field,
      profile: resonator.profile,
      support: resonator.support,
    },
    secondary: resonator.winding,
    primary: null,
    topload: c.design.topload,
    X: (r: number) => c.X(offset + r),
    axisX: c.X(offset),
    halfWidth,
  };
  // the line (drawn under the resonator): up from the secondary's top, across at its height, down to the resonator's base
  const driverTop = c.secondary?.topZ ?? spec.line.height;
  const h = spec.line.height;
  const foot = offset - resonator.winding.radius;
  c.out.push(
    `<polyline class="feed-line" points="${n(c.X(0))},${n(c.Y(driverTop))} ${n(c.X(0))},${n(c.Y(h))} ${n(c.X(foot))},${n(c.Y(h))} ${n(c.X(foot))},${n(c.Y(resonator.winding.bottomZ))}" fill="none" stroke="${DRAWING_COLOURS.copper}" stroke-width="1.5" stroke-dasharray="6 3" data-length="${spec.line.length}" data-height="${h}"/>`,
  );
  c.out.push(`<g class="resonator" data-axis-spacing="${offset}">`);
  const levels = drawField(shifted);
  drawSecondary(shifted);
  drawTopload(shifted);
  drawSupportAndPoint(shifted);
  c.out.push('</g>');
  return levels;
}

/** A label of the drawing beside its point, with the class and colour it is drawn in. */
interface Callout extends LabelRequest {
  className: string;
  colour: string;
}

/**
 * The callouts placed so that no two overlap and none covers an obstacle (label-placement.ts), each
 * with its leader line when it stands away from its point; one that finds no room is left out and
 * listed in a comment (its figure is in the title block or the sheet).
 */
function calloutsSvg(callouts: Callout[], bounds: Box, obstacles: Box[]): string {
  const { placed, dropped } = placeLabels(callouts, bounds, obstacles);
  const out = ['<g class="callouts">'];
  for (const label of placed) {
    const { className, colour, fontSize, text } = label.request as Callout;
    if (label.leader) {
      const { x1, y1, x2, y2 } = label.leader;
      out.push(
        `<line class="leader" x1="${n(x1)}" y1="${n(y1)}" x2="${n(x2)}" y2="${n(y2)}" stroke="${colour}" stroke-width="0.7"/>`,
      );
    }
    out.push(
      `<text class="${className}" x="${n(label.x)}" y="${n(label.y)}" font-size="${fontSize}" text-anchor="${label.anchor}" fill="${colour}">${escapeXml(text)}</text>`,
    );
  }
  for (const label of dropped) out.push(`<!-- no room for the label: ${escapeXml(label.text)} -->`);
  out.push('</g>');
  return out.join('\n');
}

/** What a strike would reach first: the strike rail when there is one, else the outermost primary ring. */
function strikeTarget(design: Design, field: DesignField): { ring: { r: number; z: number }; what: string } | null {
  if (design.strikeRail && field.secondary) {
    return {
      ring: { r: design.strikeRail.diameter / 2, z: field.secondary.bottomZ + design.strikeRail.elevation },
      what: 'the strike rail',
    };
  }
  const rings = field.primary?.rings ?? [];
  if (rings.length === 0) return null;
  return { ring: rings[rings.length - 1], what: 'the outer primary ring' };
}

/** Key figures of a design, label and display text, in the order the title block shows them. */
export const KEY_FIGURES: ReadonlyArray<[string, string]> = [
  ['resonant frequency', 'resonant_frequency'],
  ['total capacitance', 'total_capacitance'],
  ['topload capacitance', 'topload_capacitance'],
  ['secondary inductance', 'secondary_inductance'],
  ['coupling', 'coupling'],
  ['primary tap', 'primary_tap_turns'],
  ['peak voltage', 'peak_voltage'],
  ['breakout voltage', 'breakout_voltage'],
  ['breakout margin', 'breakout_margin'],
  ['peak topload field', 'topload_peak_field'],
  ['overall height', 'overall_height'],
  ['spark length (rule of thumb)', 'spark_length'],
  ['wire length', 'wire_length'],
];

function titleBlock(field: DesignField, title: string, x: number, y: number, scale: number, levels: number): string {
  const metrics = field.evaluation.metrics;
  const lines: string[] = [];
  const w = TITLE_BLOCK_WIDTH - 16;
  let cy = y + 20;
  lines.push(`<g class="title-block" font-size="11" fill="${DRAWING_COLOURS.ink}">`);
  for (const line of wrapText(title, w, 13).slice(0, 3)) {
    lines.push(`<text x="${n(x)}" y="${n(cy)}" font-size="13" font-weight="bold">${escapeXml(line)}</text>`);
    cy += 16;
  }
  lines.push(
    `<text x="${n(x)}" y="${n(cy)}" fill="${DRAWING_COLOURS.dimension}">to scale: 1 m = ${formatNumber(scale, 4)} drawing units</text>`,
  );
  cy += 20;
  for (const [label, key] of KEY_FIGURES) {
    const text = metricText(metrics, key);
    if (text === '—') continue;
    lines.push(`<text x="${n(x)}" y="${n(cy)}">${escapeXml(label)}</text>`);
    lines.push(`<text x="${n(x + w)}" y="${n(cy)}" text-anchor="end" data-metric="${key}">${escapeXml(text)}</text>`);
    cy += 15;
  }
  cy += 10;
  // Legend: the winding's voltage ramp and the equipotentials.
  if (field.secondary) {
    lines.push(`<text x="${n(x)}" y="${n(cy)}">winding voltage, base to top</text>`);
    cy += 6;
    for (let k = 0; k < 20; k++) {
      lines.push(
        `<rect x="${n(x + (k * w) / 20)}" y="${n(cy)}" width="${n(w / 20 + 0.5)}" height="8" fill="${voltageColour(k / 19)}"/>`,
      );
    }
    cy += 24;
  }
  lines.push(
    `<line x1="${n(x)}" y1="${n(cy - 4)}" x2="${n(x + 24)}" y2="${n(cy - 4)}" stroke="${DRAWING_COLOURS.equipotential}"/><text x="${n(x + 30)}" y="${n(cy)}">equipotentials, every 10 % of the top voltage</text>`,
  );
  const peakVoltage = metrics.peak_voltage;
  if (peakVoltage !== null && peakVoltage !== undefined && Number.isFinite(peakVoltage) && peakVoltage > 0) {
    cy += 14;
    lines.push(
      `<text x="${n(x + 30)}" y="${n(cy)}">(${formatNumber(peakVoltage / 1e4, 3)} kV apart at the peak voltage)</text>`,
    );
  }
  cy += 15;
  lines.push(
    `<circle cx="${n(x + 12)}" cy="${n(cy - 4)}" r="4" fill="${DRAWING_COLOURS.peak}"/><text x="${n(x + 30)}" y="${n(cy)}">peak surface field on the topload</text>`,
  );
  cy += 15;
  if (levels === 0) {
    lines.push(`<text x="${n(x)}" y="${n(cy)}">(no field solved: nothing to contour)</text>`);
    cy += 15;
  }
  cy += 10;
  for (const line of wrapText(PICTURE_CAUTION, w, 10)) {
    lines.push(
      `<text class="caution" x="${n(x)}" y="${n(cy)}" font-size="10" fill="${DRAWING_COLOURS.peak}">${escapeXml(line)}</text>`,
    );
    cy += 13;
  }
  lines.push('</g>');
  return lines.join('\n');
}
