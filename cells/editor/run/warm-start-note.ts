/**
 * The note shown under a transport the editor warm-started while tuning (and put
 * among its cautions in a report written from the page): its iteration count is
 * not what a cold run (the command line) would report.
 */
export const WARM_START_NOTE =
  "Started from this cell's previous potentials (warm start while tuning): the iteration count runs from there, and values agree with a cold run within the tolerance.";
