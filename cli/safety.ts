/**
 * The safety cautions that close every human-readable report and open the README. Written once.
 */

export const SAFETY_CAUTIONS: readonly string[] = [
  'DANGER: the tank capacitor and the supply transformer store and deliver lethal energy at lethal voltage;',
  '  capacitors recharge by themselves (dielectric absorption): fit bleed resistors, ground them with a',
  '  grounding stick and leave a visible short on them before touching anything.',
  'RF arcs cause deep burns that may not hurt at first; streamers start fires; spark gaps emit intense UV',
  '  (eye protection) and noise (hearing); sparks make ozone and nitrogen oxides (ventilate closed rooms).',
  'Keep people with pacemakers or other implanted medical devices away; the fields and arcs interfere with',
  '  medical implants, electronics and radio services. Operate only where permitted, with a dedicated RF',
  '  ground, a mains filter, interlocks and an emergency stop.',
  'These figures are estimates from models. They do not make a design safe. Follow your local electrical',
  '  codes and licensed practice, and let a qualified person check any high-voltage installation.',
];

/** The cautions as one block of text. */
export function safetyBlock(): string {
  return ['SAFETY', ...SAFETY_CAUTIONS].join('\n');
}

/** One line for short outputs (design files from `show`, `check`, summary.json): the essentials. */
export const SAFETY_LINE =
  'DANGER: lethal tank-capacitor and supply voltages, RF burns, fire, UV, ozone, interference with medical implants and radio services; these are model estimates, not a safety assessment: follow local electrical codes and licensed practice (see the README).';
