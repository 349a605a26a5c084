/**
 * Review-by dates: calendar months after the approval, clamped to the last day of a shorter month.
 * Source of every expected value: the documented behaviour of date-fns `addMonths` ("If the resulting month has fewer
 * days than the original date's day, the result is the last day of that month") and plain calendar arithmetic
 * (February has 29 days in leap years — 2024, 2028 — and 28 otherwise; August and March have 31 days, February 2029 28).
 */
import { addMonths } from '../../server/services/dates';

const iso = (d: Date) => d.toISOString();

describe('addMonths (review intervals, UTC)', () => {
  it('Jan 31 + 1 month is the last day of February (leap year 2024: Feb 29; 2025: Feb 28)', () => {
    expect(iso(addMonths(new Date('2024-01-31T09:15:00Z'), 1))).toBe('2024-02-29T09:15:00.000Z');
    expect(iso(addMonths(new Date('2025-01-31T09:15:00Z'), 1))).toBe('2025-02-28T09:15:00.000Z');
  });

  it('Feb 29 + 60 months is Feb 28 (2029 is not a leap year), not Mar 1', () => {
    expect(iso(addMonths(new Date('2024-02-29T00:00:00Z'), 60))).toBe('2029-02-28T00:00:00.000Z');
    // 48 months lands on a leap year again: the day exists and is kept.
    expect(iso(addMonths(new Date('2024-02-29T23:59:59.999Z'), 48))).toBe('2028-02-29T23:59:59.999Z');
  });

  it('Aug 31 + 6 months is the end of February, not early March', () => {
    expect(iso(addMonths(new Date('2023-08-31T12:00:00Z'), 6))).toBe('2024-02-29T12:00:00.000Z');
    expect(iso(addMonths(new Date('2024-08-31T12:00:00Z'), 6))).toBe('2025-02-28T12:00:00.000Z');
  });

  it('keeps the day when it exists, crosses years, and goes backwards', () => {
    expect(iso(addMonths(new Date('2021-11-15T06:30:00Z'), 60))).toBe('2026-11-15T06:30:00.000Z');
    expect(iso(addMonths(new Date('2024-03-31T00:00:00Z'), -1))).toBe('2024-02-29T00:00:00.000Z');
    expect(iso(addMonths(new Date('2024-12-31T18:00:00Z'), 2))).toBe('2025-02-28T18:00:00.000Z');
  });

  it('works on the UTC day whatever the time zone of the server (a UTC instant late in the evening)', () => {
    // 23:30 UTC on Jan 31 is already Feb 1 east of UTC and still Jan 31 west of it; the UTC calendar day governs.
    expect(iso(addMonths(new Date('2024-01-31T23:30:00Z'), 1))).toBe('2024-02-29T23:30:00.000Z');
  });
});
