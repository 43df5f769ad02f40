/**
 * The normal tree: a design as the file names it, every quantity already an SI number, every wire a
 * gauge or a bare diameter. A sweep's design space is a normal tree with *slots* where its dimensions
 * go; filling the slots from a sample point gives one design's tree. Plain data throughout (no class
 * instances), so a space travels to worker threads, into checkpoints and into summary.json as it is.
 */

/** A wire as written: a gauge or a bare diameter (SI). */
export type WireValue = { awg: number } | { bareDiameter: number };

export type LeafValue = number | string | boolean | WireValue;

/** Marks where a sweep dimension's value goes: `{ slot: 3 }` is dimension 3. */
export interface DimensionSlot {
  slot: number;
}

/**
 * A section of the normal tree: field name → value (or a slot in a sweep). A section nested in it
 * (`tank: { bank: { part: … } }`) has its fields here under dotted keys ('bank.part.capacitance').
 */
export type NormalSection = Record<string, LeafValue | DimensionSlot>;

/** The normal tree: section name → section (or a slot when a sweep chooses whole sections). */
export type NormalTree = Record<string, NormalSection | DimensionSlot>;

/** One dimension of a design space. */
export type Dimension =
  | {
      kind: 'range';
      /** Path in the file: ['secondary', 'turns']. */
      path: string[];
      /** Kind of quantity (for display units), e.g. 'length', 'dimensionless'. */
      quantity: string;
      from: number;
      to: number;
      scale: 'linear' | 'log';
      integer: boolean;
      /** Spacing of allowed values from `from`, or null for a continuum. */
      step: number | null;
    }
  | {
      kind: 'choose';
      path: string[];
      /** Normal values (leaf values, or whole normal sections). */
      values: Array<LeafValue | NormalSection>;
      /** Short labels for CSV columns, as the user wrote each choice. */
      labels: string[];
      /** Kind of quantity when the choices are quantities (their CSV column is then a number). */
      quantity?: string;
      /** The choices are wires: the CSV adds the bare diameter as a number column. */
      wire?: boolean;
      /**
       * The choices are whole sections: each numeric field any of them has, as its own CSV number
       * column after the label (SI values per choice, null where a choice lacks the field).
       */
      sectionFields?: { name: string; quantity: string | null; values: Array<number | null> }[];
      /**
       * The choices are whole sub-sections (`tank.bank.part`): the slot sits at the sub-section's key
       * ('bank.part') and filling it spreads the chosen fields under dotted keys ('bank.part.capacitance').
       */
      subsection?: boolean;
    };

export function isSlot(value: unknown): value is DimensionSlot {
  return typeof value === 'object' && value !== null && 'slot' in value && Object.keys(value).length === 1;
}

/**
 * Fills the slots of a space's tree with dimension values: ranges put their number, sets put the
 * chosen value (a whole section for section sets). Pure; the space's tree is not changed.
 */
export function fillSlots(tree: NormalTree, dimensions: readonly Dimension[], values: ArrayLike<number>): NormalTree {
  const filled: NormalTree = {};
  const slotValue = (slot: DimensionSlot): LeafValue | NormalSection => {
    const dimension = dimensions[slot.slot];
    const value = values[slot.slot];
    return dimension.kind === 'range' ? value : dimension.values[value];
  };
  for (const [name, section] of Object.entries(tree)) {
    if (isSlot(section)) {
      const chosen = slotValue(section) as NormalSection;
      // A chosen section may itself hold slots (a tolerance study perturbs a field inside a set of sections).
      let nested: NormalSection | null = null;
      for (const [key, leaf] of Object.entries(chosen)) {
        if (!isSlot(leaf)) continue;
        nested ??= { ...chosen };
        nested[key] = slotValue(leaf) as LeafValue;
      }
      filled[name] = nested ?? chosen;
      continue;
    }
    const out: NormalSection = {};
    for (const [key, leaf] of Object.entries(section)) {
      if (!isSlot(leaf)) out[key] = leaf;
      else if (isSubsectionSlot(dimensions, leaf)) {
        for (const [field, value] of Object.entries(slotValue(leaf) as NormalSection)) out[`${key}.${field}`] = value;
      } else out[key] = slotValue(leaf) as LeafValue;
    }
    filled[name] = out;
  }
  return filled;
}

/** Whether a slot inside a section holds a set of whole sub-sections (their fields go under dotted keys). */
function isSubsectionSlot(dimensions: readonly Dimension[], slot: DimensionSlot): boolean {
  const dimension = dimensions[slot.slot];
  return dimension?.kind === 'choose' && dimension.subsection === true;
}

/**
 * A normal section with its dotted keys ('bank.part.capacitance') nested again as the file writes
 * them (`bank: { part: { capacitance } }`), for output; key order kept.
 */
export function nestSection(section: Readonly<Record<string, unknown>>): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const [key, value] of Object.entries(section)) {
    const names = key.split('.');
    let at = out;
    for (const name of names.slice(0, -1)) {
      const inner = at[name];
      if (typeof inner === 'object' && inner !== null && !Array.isArray(inner)) at = inner as Record<string, unknown>;
      else {
        const created: Record<string, unknown> = {};
        at[name] = created;
        at = created;
      }
    }
    at[names[names.length - 1]] = value;
  }
  return out;
}
