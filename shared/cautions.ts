/**
 * The cautions shown wherever a result is shown (docs/ARCHITECTURE.md, Principles). One source for the app, the PDFs
 * and the API.
 */
export const CAUTIONS = [
  'Results come from a published empirical model (IEEE 1584-2018) and the data entered; they are estimates, not measurements.',
  'A number is not final until a qualified, licensed engineer has reviewed and approved the study.',
  "The facility's electrical safety program and local codes govern over anything shown here.",
  'De-energize wherever possible: put the equipment in an electrically safe work condition before work.',
] as const;

/** Above this incident energy, no arc-rated PPE is considered adequate (common practice, no source). */
export const NO_ADEQUATE_PPE_CAL_PER_CM2 = 40;

export const NO_ADEQUATE_PPE_CAUTION =
  'Above 40 cal/cm² no arc-rated PPE is adequate: do not perform energized work; de-energize the equipment.';

export const UNREVIEWED_CAUTION = 'Preliminary — not reviewed or approved. Do not use for labels or work planning.';
