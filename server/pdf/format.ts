/**
 * How numbers read on labels and in the report. The label formats (hazard values rounded UP at the shown precision)
 * live in shared/labelDisplay.ts, the one place for what a label prints; re-exported here for the PDFs.
 */
import { groupLabelCode, parseLabelCode } from '../../shared/labelCode';
import { formatSig, MISSING } from '../../shared/numberFormat';

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

/** Significant figures in plain notation ("20.9", "0.786", "1500"): the one formatter, in shared/numberFormat.ts. */
export { formatSig };

/** Seconds: "0.35 s", "0.025 s", "2 s". */
export function formatSeconds(s: number | null): string {
  return s === null || !Number.isFinite(s) ? MISSING : `${formatSig(s, 3)} s`;
}

/** The label code in groups of four for reading aloud or typing: "7K3M 9QXW 2R4T BH6N". */
export const groupCode = groupLabelCode;

/** The code at the end of a check address `/l/<code>` (or the whole text when it has no well-formed code). */
export function codeFromCheckUrl(url: string): string {
  return parseLabelCode(url) ?? url;
}
