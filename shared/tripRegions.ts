import type { TripRegion } from './schemas/device';

/** Plain names of the regions of a trip band (used in sentences, tables and the plot). */
export const REGION_LABELS: Record<TripRegion, string> = {
  'long-time': 'long-time band',
  'short-time': 'short-time band',
  instantaneous: 'instantaneous region',
  'curve-segment': 'published curve segment',
  'definite-time': 'definite-time element',
  'inverse-time': 'inverse-time curve',
  'no-trip': 'below pickup: does not clear',
};
