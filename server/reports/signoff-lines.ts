import type { ReviewStatus, SignoffEntry } from '../../shared/schemas/signoff.js';
import { labTime } from './pdf-layout.js';

/** What a report needs of a run's review: where it stands and every entry, newest first. */
export interface ReportReview {
  status: ReviewStatus;
  entries: readonly SignoffEntry[];
}

/** The sign-off block as a report prints it. */
export interface SignoffLines {
  /** The frozen figures' state in one sentence. */
  state: string;
  /** Who signed, when (lab's zone), the comment and the hash, when a sign-off holds. */
  signed: string[];
  /** Every earlier sign-off, newest first, one line each. */
  earlier: string[];
}

const STATE_TEXT: Record<ReviewStatus, string> = {
  signed: 'Signed: the figures below are the ones signed off.',
  superseded: 'Changed since sign-off, needs a new sign-off: the run changed after it was signed.',
  ready: 'Not signed off: marked ready for review, waiting for the lab manager.',
  none: 'Not signed off.',
};

const signer = (e: SignoffEntry, timeZone: string) => `${e.byName} (${e.byRole}), ${labTime(new Date(e.at), timeZone)}`;

/**
 * The report's sign-off block from a run's review history: the state of the frozen figures,
 * the sign-off that holds (if any), and every earlier sign-off (they are kept, never changed).
 */
export function signoffLines(review: ReportReview, timeZone: string): SignoffLines {
  const signoffs = review.entries.filter((e) => e.action === 'signed');
  const holding = review.status === 'signed' ? (signoffs.find((e) => e.state === 'current') ?? null) : null;
  return {
    state: STATE_TEXT[review.status],
    signed: holding
      ? [`Signed by ${signer(holding, timeZone)}`, `Comment: ${holding.comment}`, `Frozen figures: SHA-256 ${holding.contentHash}`]
      : [],
    earlier: signoffs.filter((e) => e !== holding).map((e) => `Signed by ${signer(e, timeZone)}, no longer holds. Comment: ${e.comment}`),
  };
}
