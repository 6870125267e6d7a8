/**
 * The stress measures a peak and Kt can be taken in. Kept apart from the schema so the command
 * line can offer them as choices without loading the schema library at start-up.
 */
export const STRESS_MEASURES = ['max-principal', 'von-mises', 'tresca', 'sxx', 'syy', 'sxy', 'min-principal'] as const;
export type StressMeasure = (typeof STRESS_MEASURES)[number];
