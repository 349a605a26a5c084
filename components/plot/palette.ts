/**
 * Styles of the devices overlaid on one time-current plot: hues that stay apart for the common colour-vision
 * deficiencies (blue / bluish green / reddish purple / sky / slate, each also differing in lightness), plus a dash
 * pattern per device so that two bands can be told apart in grey print too. No red, orange or yellow: those hues
 * belong to the hazard labels. Common practice, no source.
 */
export interface SeriesStyle {
  /** Stroke colour of the curves and the marks. */
  color: string;
  /** Fill of the band (the same hue, light). */
  fill: string;
  fillOpacity: number;
  /** Dash pattern of the maximum (total clearing) curve; '' is solid. */
  maxDash: string;
}

const HUES = ['#1D5FA6', '#0B8570', '#A2397E', '#3E8FCB', '#46525E', '#6A55A8'] as const;
const DASHES = ['', '10 4', '14 4 3 4', '6 3', '18 4 4 4 4 4', '24 6'] as const;

/** Style of the device at `index` (0-based) on the plot; cycles after six devices with a shifted dash. */
export function seriesStyle(index: number): SeriesStyle {
  const i = ((index % HUES.length) + HUES.length) % HUES.length;
  const lap = Math.floor(Math.max(0, index) / HUES.length);
  return {
    color: HUES[i],
    fill: HUES[i],
    fillOpacity: 0.13,
    maxDash: DASHES[(i + lap) % DASHES.length],
  };
}

/** Thin dotted stroke of every minimum curve (shared by all devices; the colour tells them apart). */
export const MIN_CURVE_DASH = '1.5 3.5';
export const MAX_CURVE_WIDTH = 2.4;
export const MIN_CURVE_WIDTH = 1.4;
