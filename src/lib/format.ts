/** Display formatting shared by every page: dates, counts with units, voltages. */

const dateTime = new Intl.DateTimeFormat('en-GB', {
  day: 'numeric',
  month: 'short',
  year: 'numeric',
  hour: '2-digit',
  minute: '2-digit',
});

/** An ISO timestamp as "1 Dec 2026, 22:35" in the reader's time zone; the raw string if unparseable. */
export function formatDateTime(iso: string): string {
  const d = new Date(iso);
  return Number.isNaN(d.getTime()) ? iso : dateTime.format(d);
}

/** "1 element" / "3 elements". */
export function plural(n: number, one: string, many = `${one}s`): string {
  return `${n} ${n === 1 ? one : many}`;
}

/** A voltage in volts shown with its unit: below 1 kV in V, otherwise in kV (e.g. 208 V, 12.47 kV). */
export function formatVolts(volts: number): string {
  if (Math.abs(volts) >= 1000) {
    return `${Number((volts / 1000).toPrecision(6))} kV`;
  }
  return `${Number(volts.toPrecision(6))} V`;
}

/** Seconds as plain words for a wait, rounded up: "45 seconds", "1 minute", "15 minutes" (891 s). */
export function formatWait(seconds: number): string {
  const s = Math.max(1, Math.ceil(seconds));
  if (s < 60) return plural(s, 'second');
  return plural(Math.ceil(s / 60), 'minute');
}
