/**
 * How numbers read on labels and in the report. The label formats (hazard values rounded UP at the shown precision)
 * live in shared/labelDisplay.ts, the one place for what a label prints; re-exported here for the PDFs.
 */
import { groupLabelCode, parseLabelCode } from '../../shared/labelCode';

export {
  ceilTo,
  feetInchesUp,
  formatBoundary,
  formatCalPerCm2,
  formatJPerCm2,
  formatMetresUp,
  formatVoltage,
  formatWorkingDistance,
} from '../../shared/labelDisplay';

/** A number with `sig` significant figures, without exponent for ordinary magnitudes ("20.9", "0.786", "1500"). */
export function formatSig(value: number, sig = 3): string {
  if (!Number.isFinite(value)) return '—';
  if (value === 0) return '0';
  const abs = Math.abs(value);
  if (abs >= 10 ** sig) return Math.round(value).toString();
  return Number(value.toPrecision(sig)).toString();
}

/** Seconds: "0.35 s", "0.025 s", "2 s". */
export function formatSeconds(s: number | null): string {
  return s === null || !Number.isFinite(s) ? '—' : `${formatSig(s, 3)} s`;
}

/** The label code in groups of four for reading aloud or typing: "7K3M 9QXW 2R4T BH6N". */
export const groupCode = groupLabelCode;

/** The code at the end of a check address `/l/<code>` (or the whole text when it has no well-formed code). */
export function codeFromCheckUrl(url: string): string {
  return parseLabelCode(url) ?? url;
}
