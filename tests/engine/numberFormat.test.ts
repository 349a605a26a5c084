/**
 * The one number formatter outside labels (shared/numberFormat.ts). Significant figures are arithmetic, not a
 * published rule; the choices (plain notation, grouped thousands on screen, one mark for missing) are the product's
 * own: common practice, no source.
 */
import { formatReading, formatSig, MISSING } from '../../shared/numberFormat';
import { formatSig as pdfFormatSig } from '../../server/pdf/format';
import { formatSig as plotFormatSig } from '../../shared/logPlot';
import { fmt } from '../../hooks/units';
import { num } from '../../components/model/summaries';

describe('numbers outside labels', () => {
  it('the PDF, the plot, the screens and the model editor use the one formatter', () => {
    expect(pdfFormatSig).toBe(formatSig);
    expect(plotFormatSig).toBe(formatSig);
    expect(fmt).toBe(formatReading);
  });

  it('significant figures in plain notation, integer digits kept, trailing zeros trimmed unless asked', () => {
    expect(formatSig(0.08312)).toBe('0.0831');
    expect(formatSig(12.34)).toBe('12.3');
    expect(formatSig(12345)).toBe('12345');
    expect(formatSig(0.3, 3, false)).toBe('0.300');
    expect(formatSig(9.996, 3, false)).toBe('10.0');
    expect(formatSig(1e-7)).toBe('0.0000001');
    expect(formatSig(-0.0004, 1)).toBe('-0.0004');
  });

  it('screen readings keep their figures and group thousands; missing values show one mark', () => {
    expect(formatReading(0.3)).toBe('0.300');
    expect(formatReading(21.44)).toBe('21.4');
    expect(formatReading(12345.6)).toBe('12,346');
    expect(formatReading(null)).toBe(MISSING);
    expect(formatReading(Number.NaN)).toBe(MISSING);
    expect(formatSig(Number.POSITIVE_INFINITY)).toBe(MISSING);
    expect(num(undefined)).toBe(MISSING);
    expect(num(480.0000001)).toBe('480');
    expect(num(0.000123456789)).toBe('0.000123457');
  });
});
