/**
 * A Date as MariaDB DATETIME text in UTC ("2026-07-15 10:00:00.000"). Raw queries must pass
 * dates this way: given a Date, the driver writes the server process's local wall time, so a
 * server not running in UTC would store every time shifted by its offset.
 */
export function utcDateTime(date: Date): string;
export function utcDateTime(date: Date | null): string | null;
export function utcDateTime(date: Date | null): string | null {
  return date === null ? null : date.toISOString().replace('T', ' ').replace('Z', '');
}
