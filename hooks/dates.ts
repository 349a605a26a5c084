/** Dates as the app shows them: ISO days, and times in UTC (the same clock as the server, the CSV and the mail). */
export function fmtDate(iso: string | null | undefined): string {
  if (!iso) return '—';
  return iso.slice(0, 10);
}

export function fmtDateTime(iso: string | null | undefined): string {
  if (!iso) return '—';
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return iso;
  return `${d.toISOString().slice(0, 16).replace('T', ' ')} UTC`;
}

/** "today", "1 day ago", "12 days ago". */
export function fmtAgeDays(days: number): string {
  if (days <= 0) return 'today';
  return days === 1 ? '1 day ago' : `${days} days ago`;
}

/** "06:00 UTC" */
export function fmtHourUtc(hour: number): string {
  return `${String(hour).padStart(2, '0')}:00 UTC`;
}
