/**
 * Stock catalogues: the sizes that can be bought, as named sets a sweep file can draw from
 * (`form_diameter: { stock: pipe_metric, from: 100 mm, to: 250 mm }`). Each catalogue is a data
 * file beside this one that names its source; a stock set becomes an ordinary set of values (a
 * `choose` dimension), so the CSV columns, labels and the rest work unchanged.
 */
import { awgDiameter } from '../../core/wire/awg.ts';
import { insulatedDiameter } from '../../core/wire/insulation.ts';
import type { WireValue } from '../../optimize/design-tree.ts';
import { ASTM_B88_ROWS, EN_1057_OUTSIDE_DIAMETERS_MM } from './copper-tube.ts';
import { AWG_RANGE, IEC_60317_NOMINAL_DIAMETERS_MM } from './magnet-wire.ts';
import { ASTM_D1785_ROWS } from './pipe-astm-d1785.ts';
import { ISO_161_OUTSIDE_DIAMETERS_MM } from './pipe-iso161.ts';

const MM = 1e-3;
const INCH = 0.0254;

/** One size of a catalogue. */
export interface StockSize {
  /** Short label, for `check`, the console and the CSV: '110 mm', '4 in sch 40', 'AWG 26'. */
  label: string;
  /** The value a design takes: a length in m, or a wire. */
  value: number | WireValue;
  /** The size's diameter, m (the outside diameter; a wire's bare diameter): what from/to bound. */
  diameter: number;
  /** The listing's cells after the label, in the catalogue's columns (null: not made). */
  cells: Array<number | string | null>;
}

/** A named catalogue of stock sizes. */
export interface StockCatalogue {
  name: string;
  /** 'length' catalogues fit length fields (form or conductor diameters); 'wire' ones fit wire fields. */
  kind: 'length' | 'wire';
  title: string;
  /** The standard and the table, with its reference key. */
  source: string;
  /** How sure the values are (all typed from memory of the standard unless said otherwise). */
  note: string;
  /** Column headers of the listing after the label, with units. */
  columns: string[];
  sizes: StockSize[];
}

/** A number of mm rounded for display (the catalogues' own precision, at most 3 decimals). */
function mm(value: number): number {
  return Math.round((value / MM) * 1000) / 1000;
}

/** The AWG number as written: 0 → '1/0', −3 → '4/0'. */
function awgText(gauge: number): string {
  return gauge <= 0 ? `${1 - gauge}/0` : String(gauge);
}

function pipeMetric(): StockCatalogue {
  return {
    name: 'pipe_metric',
    kind: 'length',
    title: 'thermoplastic pipe, nominal outside diameters',
    source: 'ISO 161-1, table of nominal outside diameters (refs §12.1 [iso161])',
    note: 'typed from memory of the standard; 10 mm to 1000 mm of its series',
    columns: ['outside mm'],
    sizes: ISO_161_OUTSIDE_DIAMETERS_MM.map((dn) => ({
      label: `${dn} mm`,
      value: dn * MM,
      diameter: dn * MM,
      cells: [dn],
    })),
  };
}

function pipeInch(schedule: 40 | 80): StockCatalogue {
  return {
    name: `pipe_inch_sch${schedule}`,
    kind: 'length',
    title: `inch PVC pipe, schedule ${schedule}: outside diameter (the form's diameter), wall and inside`,
    source: `ASTM D1785, table of outside diameters and wall thicknesses, schedule ${schedule} (refs §12.2 [astmD1785])`,
    note: 'typed from memory of the standard; the wall is the minimum wall, inside = outside − 2 walls',
    columns: ['outside in', 'outside mm', 'wall mm', 'inside mm'],
    sizes: ASTM_D1785_ROWS.map((row) => {
      const wall = schedule === 40 ? row.wallSchedule40 : row.wallSchedule80;
      return {
        label: `${row.size} in sch ${schedule}`,
        value: row.outside * INCH,
        diameter: row.outside * INCH,
        cells: [row.outside, mm(row.outside * INCH), mm(wall * INCH), mm((row.outside - 2 * wall) * INCH)],
      };
    }),
  };
}

function tubeInch(): StockCatalogue {
  return {
    name: 'tube_inch',
    kind: 'length',
    title: 'copper tube (inch), outside diameters and the walls of types K, L and M',
    source: 'ASTM B88, table of dimensions of water tube, types K, L, M (refs §12.3 [astmB88])',
    note: 'typed from memory of the standard; outside = nominal size + 1/8 in; "-": not made in that type',
    columns: ['outside in', 'outside mm', 'wall K mm', 'wall L mm', 'wall M mm'],
    sizes: ASTM_B88_ROWS.map((row) => ({
      label: `${row.size} in tube`,
      value: row.outside * INCH,
      diameter: row.outside * INCH,
      cells: [
        row.outside,
        mm(row.outside * INCH),
        mm(row.wallK * INCH),
        mm(row.wallL * INCH),
        row.wallM === null ? null : mm(row.wallM * INCH),
      ],
    })),
  };
}

function tubeMetric(): StockCatalogue {
  return {
    name: 'tube_metric',
    kind: 'length',
    title: 'copper tube (metric), outside diameters',
    source: 'EN 1057, table of outside diameters (refs §12.4 [en1057])',
    note: 'typed from memory of the standard; several walls are made for each diameter (not listed)',
    columns: ['outside mm'],
    sizes: EN_1057_OUTSIDE_DIAMETERS_MM.map((od) => ({
      label: `${od} mm`,
      value: od * MM,
      diameter: od * MM,
      cells: [od],
    })),
  };
}

/** The overall diameters the evaluation uses for grades 1 and 2 (refs §7.3), mm. */
function gradeCells(bare: number): number[] {
  return [mm(insulatedDiameter(bare, 'grade1')), mm(insulatedDiameter(bare, 'grade2'))];
}

function wireAwg(): StockCatalogue {
  const sizes: StockSize[] = [];
  for (let gauge = AWG_RANGE.smallest; gauge >= AWG_RANGE.largest; gauge--) {
    const bare = awgDiameter(gauge);
    sizes.push({
      label: `AWG ${awgText(gauge)}`,
      value: { awg: gauge },
      diameter: bare,
      cells: [Math.round((bare / INCH) * 1e4) / 1e4, mm(bare), ...gradeCells(bare)],
    });
  }
  return {
    name: 'wire_awg',
    kind: 'wire',
    title: 'magnet wire, AWG sizes 44 to 4/0',
    source: 'ASTM B258, the geometric rule of the AWG series (core/wire/awg.ts, refs §7.1 [astmB258])',
    note: 'bare diameters by the rule (exact); overall diameters: the midpoint of each IEC 60317-0-1 grade window as the evaluation takes it (refs §7.3), not the standard maxima',
    columns: ['bare in', 'bare mm', 'grade 1 mm', 'grade 2 mm'],
    sizes,
  };
}

function wireMetric(): StockCatalogue {
  return {
    name: 'wire_metric',
    kind: 'wire',
    title: 'magnet wire, metric nominal conductor diameters (R 20 preferred, R 40 intermediate)',
    source: 'IEC 60317-0-1, table of nominal conductor diameters (refs §12.5 [iec60317sizes])',
    note: 'diameters typed from memory of the standard; overall diameters: the midpoint of each grade window as the evaluation takes it (refs §7.3), not the standard maxima',
    columns: ['bare mm', 'series', 'grade 1 mm', 'grade 2 mm'],
    sizes: IEC_60317_NOMINAL_DIAMETERS_MM.map(([d, series]) => ({
      label: `${d} mm`,
      value: { bareDiameter: d * MM },
      diameter: d * MM,
      cells: [d, series, ...gradeCells(d * MM)],
    })),
  };
}

/** Every catalogue, by name, in the order `coilfront stock` lists them. */
export const STOCK_CATALOGUES: ReadonlyMap<string, StockCatalogue> = new Map(
  [pipeMetric(), pipeInch(40), pipeInch(80), tubeInch(), tubeMetric(), wireAwg(), wireMetric()].map((c) => [c.name, c]),
);

/** The catalogue names. */
export function stockNames(): string[] {
  return [...STOCK_CATALOGUES.keys()];
}

/**
 * The sizes of a catalogue whose diameter lies in [low, high] (inclusive, to one part in 10⁹ so that
 * a bound written as the size itself is inside).
 */
export function stockBetween(catalogue: StockCatalogue, low: number, high: number): StockSize[] {
  const slack = 1e-9;
  return catalogue.sizes.filter((size) => size.diameter >= low * (1 - slack) && size.diameter <= high * (1 + slack));
}
