import type { Sequelize } from 'sequelize';
import { LIVE_RUN_STATES, type Run } from '../../shared/schemas/run.js';
import type { RunSnapshot, SignoffBlock } from '../../shared/schemas/signoff.js';
import { RunsRepo } from '../runs/runs-repo.js';
import { canonicalJson, contentHash } from './canonical-json.js';
import { reviewState, type ReviewState } from './review-state.js';
import { runSnapshot, snapshotInLegacyKeys } from './run-snapshot.js';
import { SignoffRepo, type SignoffAuthor } from './signoff-repo.js';

/** Why a review step was refused. */
export class SignoffError extends Error {
  constructor(
    readonly reason: 'no-run' | 'live' | 'not-ready' | 'changed' | 'already',
    message: string,
  ) {
    super(message);
    this.name = 'SignoffError';
  }
}

/** A run's review state with the hash of its content now. */
export interface RunReview extends ReviewState {
  currentHash: string;
}

/** Ready marks and sign-offs of runs: the history is append-only, the state is judged on read. */
export class SignoffService {
  private readonly runs: RunsRepo;
  private readonly repo: SignoffRepo;

  constructor(private readonly sequelize: Sequelize) {
    this.runs = new RunsRepo(sequelize);
    this.repo = new SignoffRepo(sequelize);
  }

  private async current(runId: number): Promise<{ run: Run; snapshot: RunSnapshot; hash: string; legacyHash: string }> {
    const run = await this.runs.get(runId);
    if (!run) throw new SignoffError('no-run', `Run ${runId} not found`);
    const snapshot = await runSnapshot(this.sequelize, run);
    return { run, snapshot, hash: contentHash(snapshot), legacyHash: contentHash(snapshotInLegacyKeys(snapshot)) };
  }

  /** Where the run stands and its whole history. */
  async review(runId: number): Promise<RunReview> {
    const { hash, legacyHash } = await this.current(runId);
    return { ...reviewState(await this.repo.list(runId), hash, legacyHash), currentHash: hash };
  }

  /** The sign-off block of a report (shared page): where the run stands, the signature that holds and the earlier ones. */
  async block(runId: number): Promise<SignoffBlock> {
    const { status, signed, entries } = await this.review(runId);
    return { status, signed, earlier: entries.filter((e) => e.action === 'signed' && e.id !== signed?.id) };
  }

  /** One entry with the snapshot it froze, or null. */
  async entry(runId: number, signoffId: number) {
    const found = await this.repo.get(runId, signoffId);
    if (!found) return null;
    const { entries } = await this.review(runId);
    return { entry: entries.find((e) => e.id === signoffId)!, snapshot: found.snapshot, verified: found.verified };
  }

  /** A technician (or admin) says the run is ready for an admin to sign. */
  async markReady(runId: number, comment: string, by: SignoffAuthor): Promise<RunReview> {
    const { run, snapshot, hash, legacyHash } = await this.current(runId);
    this.refuseLive(run);
    const state = reviewState(await this.repo.list(runId), hash, legacyHash);
    if (state.status === 'ready' || state.status === 'signed') throw new SignoffError('already', `Run ${runId} is already ${state.status} and unchanged since`);
    await this.repo.insert(runId, 'ready', comment, canonicalJson(snapshot), hash, by);
    return this.review(runId);
  }

  /** An admin signs the run as it is now; it must be marked ready and (when given) unchanged since `expectedHash`. */
  async sign(runId: number, comment: string, expectedHash: string | undefined, by: SignoffAuthor): Promise<RunReview> {
    const { run, snapshot, hash, legacyHash } = await this.current(runId);
    this.refuseLive(run);
    if (expectedHash !== undefined && expectedHash !== hash) {
      throw new SignoffError('changed', 'The run changed since you opened it; look at it again before signing');
    }
    const state = reviewState(await this.repo.list(runId), hash, legacyHash);
    if (state.status === 'signed') throw new SignoffError('already', `Run ${runId} is already signed and unchanged since`);
    if (state.status !== 'ready') throw new SignoffError('not-ready', `Run ${runId} is not marked ready for review`);
    await this.repo.insert(runId, 'signed', comment, canonicalJson(snapshot), hash, by);
    return this.review(runId);
  }

  private refuseLive(run: Run): void {
    if (LIVE_RUN_STATES.includes(run.state)) throw new SignoffError('live', `Run ${run.id} is still ${run.state}; review it once it has ended`);
  }
}
