import { addMonths as addCalendarMonths } from 'date-fns';

/**
 * Calendar months later, in UTC (review intervals), with date-fns `addMonths`: when the day does not exist in the
 * target month it is clamped to that month's last day (2024-02-29 + 60 months = 2029-02-28, 2024-01-31 + 1 month =
 * 2024-02-29), never carried into the next month. The time of day (UTC) is kept.
 *
 * date-fns works on the local calendar; the UTC day is moved at local noon (no daylight-saving gap is at noon) and the
 * UTC time of day put back, so the result does not depend on the server's time zone.
 */
export function addMonths(d: Date, months: number): Date {
  const day = addCalendarMonths(new Date(d.getUTCFullYear(), d.getUTCMonth(), d.getUTCDate(), 12), months);
  return new Date(
    Date.UTC(
      day.getFullYear(),
      day.getMonth(),
      day.getDate(),
      d.getUTCHours(),
      d.getUTCMinutes(),
      d.getUTCSeconds(),
      d.getUTCMilliseconds(),
    ),
  );
}
