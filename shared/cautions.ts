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

/**
 * When the governing arc is cleared by a device that acts only for arcs at the bus (a placed device's `onlyAt`): the
 * energy holds only while that device is in service. Added to the bus's label-value cautions by the engine and
 * printed first in the label's caution (the PDF, the label screen and the public check page show that one string).
 * Kept short, without the device's name (the label names the clearing device), so the label's two caution lines hold
 * it whole.
 */
export const ONLY_AT_CAUTIONS = {
  'maintenance-switch': 'Energy holds only with the maintenance switch ON.',
  'arc-flash-relay': 'Energy holds only with the arc-flash relay in service.',
} as const;
