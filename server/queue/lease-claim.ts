import { randomUUID } from 'node:crypto';
import { QueryTypes, type Sequelize } from 'sequelize';
import { utcDateTime } from '../db/utc-datetime.js';

/** Noted on a row taken again after its claim ran out with no result (see claimLeased). */
export const IN_DOUBT_ERROR = 'the previous attempt ended without a result (server stopped while sending?): sent again';
/** Longest error text kept on a row. */
export const MAX_ERROR_CHARS = 1000;
/** The end of every SET that releases a claim, and the WHERE that only its holder passes (replacements: id, token). */
export const RELEASE_CLAIM = 'claimToken = NULL, claimedUntil = NULL WHERE id = ? AND claimToken = ?';

/** A claimed row: its id, the attempts started (this one included) and the token that proves this worker holds it. */
export interface LeasedRow {
  id: number;
  attempts: number;
  claimToken: string;
}

/** Which rows of which table a claim takes, and what it reads back. */
export interface LeaseClaim {
  /** A table with columns status, attempts, lastError, nextAttemptAt, claimToken, claimedUntil. */
  table: string;
  /** The columns read back for each claimed row (id, attempts and claimToken among them). */
  columns: string;
  /** A further condition on the rows, e.g. `channel IN (?)`, with its replacements. */
  where?: { sql: string; replacements: unknown[] };
}

/**
 * Claims up to `limit` due rows for `leaseMs` with one UPDATE that stamps a fresh token and
 * the lease's end: two workers, or a restarted server, never take the same row while the
 * lease runs. The attempt is counted when it is claimed, so a server that dies mid-send has
 * used one. A claim token still set when the lease ran out means its holder never reported
 * back (it stopped between handing the message over and marking it): the outcome is
 * unknown, the row goes out again and says so (IN_DOUBT_ERROR). MariaDB applies SET left to
 * right, so lastError reads the old token.
 */
export async function claimLeased<Row extends LeasedRow>(sequelize: Sequelize, claim: LeaseClaim, now: Date, leaseMs: number, limit: number): Promise<Row[]> {
  const token = randomUUID();
  const at = utcDateTime(now);
  const [result] = await sequelize.query(
    `UPDATE ${claim.table} SET attempts = attempts + 1,
       lastError = CASE WHEN claimToken IS NOT NULL THEN ? ELSE lastError END,
       claimToken = ?, claimedUntil = ?
     WHERE status = 'pending' ${claim.where ? `AND ${claim.where.sql} ` : ''}AND nextAttemptAt <= ? AND (claimedUntil IS NULL OR claimedUntil <= ?)
     ORDER BY id LIMIT ${Math.max(1, Math.floor(limit))}`,
    { replacements: [IN_DOUBT_ERROR, token, utcDateTime(new Date(now.getTime() + leaseMs)), ...(claim.where?.replacements ?? []), at, at] });
  if (((result as { affectedRows?: number }).affectedRows ?? 0) === 0) return [];
  return sequelize.query<Row>(
    `SELECT ${claim.columns} FROM ${claim.table} WHERE claimToken = ? AND status = 'pending' ORDER BY id`,
    { replacements: [token], type: QueryTypes.SELECT });
}
