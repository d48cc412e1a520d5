/**
 * The safety cautions every lesson screen shows (BRIEF.md, "Safety"), in Trayplan's own words.
 * They defer to the school's own policies and local regulations, which always come first.
 */
export const SAFETY_CAUTIONS: readonly { title: string; text: string }[] = [
  {
    title: 'Small parts',
    text: 'Small parts are a choking hazard: keep them away from young children and count them back in at pack-away.',
  },
  {
    title: 'Batteries and charging',
    text: 'Charge controllers on a hard surface that does not burn, and not unattended overnight unless your school allows it. Take a swollen or hot battery out of use.',
  },
  {
    title: 'Overheating',
    text: 'A device that gets hot under long use is switched off and left to cool (about a quarter of an hour is common practice) before it is used again.',
  },
  {
    title: 'Chargers and power boards',
    text: "Use only chargers and power boards that meet your school's electrical testing and tagging rules.",
  },
  {
    title: 'Walkways',
    text: 'Keep cables and tubs clear of walkways and doors.',
  },
];

/** Said once under the list. */
export const CAUTIONS_DEFER =
  "Your school's own policies and local regulations come first; these notes do not replace them.";
