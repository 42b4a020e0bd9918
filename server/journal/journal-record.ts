import { crc32 } from 'node:zlib';
import { z } from 'zod';
import { FrameSchema, type Frame } from '../../shared/schemas/frame.js';

/**
 * One accepted reading as the journal keeps it: its index in the run (0 for the run's first
 * reading, the archive's sequence number), the frame on the run's time line (enough to
 * push it through the measurement core again and get the same reading back) and when the
 * server took it (Unix seconds, for the source clock guard after a replay).
 */
export const JournalRecordSchema = z.object({
  i: z.number().int().nonnegative(),
  a: z.number().finite(),
  f: FrameSchema,
});
export type JournalRecord = z.infer<typeof JournalRecordSchema>;

const HEX = 16;
const CRC_CHARS = 8;
const NEWLINE = '\n';

/** One record as a line: a CRC-32 of the JSON (8 hex digits), a space, the JSON, a newline. */
export function encodeRecord(index: number, arrivalSeconds: number, frame: Frame): string {
  const json = JSON.stringify({ i: index, a: arrivalSeconds, f: frame });
  return `${crc32(json).toString(HEX).padStart(CRC_CHARS, '0')} ${json}${NEWLINE}`;
}

/** A line back into a record, or null when it is torn, corrupt or not a record. */
export function decodeRecord(line: string): JournalRecord | null {
  if (line.length < CRC_CHARS + 2 || line[CRC_CHARS] !== ' ') return null;
  const json = line.slice(CRC_CHARS + 1);
  if (Number.parseInt(line.slice(0, CRC_CHARS), HEX) !== crc32(json)) return null;
  try {
    const parsed = JournalRecordSchema.safeParse(JSON.parse(json));
    return parsed.success ? parsed.data : null;
  } catch {
    return null;
  }
}

/** What reading a journal file found: its good records in order, and where the good part ends. */
export interface DecodedJournal {
  records: JournalRecord[];
  /** Byte length of the leading run of good, newline-ended records. */
  goodBytes: number;
  /** Why reading stopped early (a torn or corrupt record), or null when the whole file was good. */
  problem: string | null;
}

/**
 * Reads a journal file's bytes up to the first record that is torn (no newline: the server
 * died mid-write) or corrupt. Everything before it is kept; nothing after it is trusted,
 * since records are only ever appended.
 */
export function decodeJournal(bytes: Buffer): DecodedJournal {
  const records: JournalRecord[] = [];
  let offset = 0;
  while (offset < bytes.length) {
    const end = bytes.indexOf(NEWLINE, offset);
    if (end < 0) return { records, goodBytes: offset, problem: `torn record at byte ${offset} (${bytes.length - offset} bytes without an end)` };
    const record = decodeRecord(bytes.toString('utf8', offset, end));
    if (!record) return { records, goodBytes: offset, problem: `corrupt record at byte ${offset}` };
    records.push(record);
    offset = end + 1;
  }
  return { records, goodBytes: offset, problem: null };
}
