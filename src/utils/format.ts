const dateTime = new Intl.DateTimeFormat(undefined, { dateStyle: "medium", timeStyle: "short" });
const dateOnly = new Intl.DateTimeFormat(undefined, { dateStyle: "medium" });

/** "3 Dec 2026, 14:05" in the reader's locale; the raw text if it is not a date. */
export function formatDateTime(iso: string): string {
  const date = new Date(iso);
  return Number.isNaN(date.getTime()) ? iso : dateTime.format(date);
}

/** "3 Dec 2026" in the reader's locale. */
export function formatDate(iso: string): string {
  const date = new Date(iso);
  return Number.isNaN(date.getTime()) ? iso : dateOnly.format(date);
}

/** True when the ISO time lies before `now`. */
export function isPast(iso: string, now: number = Date.now()): boolean {
  const time = new Date(iso).getTime();
  return !Number.isNaN(time) && time < now;
}
