import type { Server } from 'node:http';
import { join } from 'node:path';
import type { AppContext } from '../app-context.js';
import { createArchiveWriter } from '../archive/archive-service.js';
import { isSameOrigin, sessionUserFromRequest } from '../auth/upgrade-auth.js';
import { ReadingJournal } from '../journal/reading-journal.js';
import { replayJournal } from '../journal/replay-journal.js';
import { batteryLookup } from '../runs/battery-facts.js';
import { RunRecorder, type FrameFeed } from '../runs/run-recorder.js';
import { RunsRepo } from '../runs/runs-repo.js';
import '../auth/end-sessions.js';
import '../runs/runs-services.js';
import { LiveHub } from './live-hub.js';
import { attachWsServer } from './ws-server.js';
import { createLogger } from '../log/logger.js';

/** How long a shutdown waits for the database to take pending readings before spilling them. */
export const SHUTDOWN_FLUSH_MS = 5000;

export interface LiveOptions {
  /** Frames to record from; default the ingest area's bench manager. */
  feed?: FrameFeed;
  /** Where batches go when the database is away; default <dataDir>/spill. */
  spillDir?: string;
  memoryLimitBytes?: number;
  /** Where the readings journal lives; default <dataDir>/journal. */
  journalDir?: string;
}

/**
 * Server attachment for the live area: the archive writer, the run recorder (resuming
 * runs that were recording when the server stopped), the hub, and the WebSocket at /ws.
 * Runs after the bench manager's attachment so its frames are there to subscribe to.
 */
export function liveAttachment(options: LiveOptions = {}) {
  return async function attachLive(httpServer: Server, ctx: AppContext): Promise<() => Promise<void>> {
    const repo = new RunsRepo(ctx.sequelize);
    const journal = new ReadingJournal({ dir: options.journalDir ?? join(ctx.config.dataDir, 'journal'), log: createLogger('journal', ctx.log) });
    const writer = createArchiveWriter(ctx.sequelize, {
      spillDir: options.spillDir ?? join(ctx.config.dataDir, 'spill'),
      memoryLimitBytes: options.memoryLimitBytes,
      log: createLogger('archive', ctx.log),
      onArchived: (batch) => journal.archived(batch.runId, batch.patch.readingsCount ?? 0, batch.patch.endedAt !== undefined),
    });
    const recorder = new RunRecorder({
      repo, writer, getBattery: batteryLookup(ctx), benchExists: (id) => repo.benchExists(id),
      benchSourceFacts: (id) => repo.benchSourceFacts(id), log: createLogger('runs', ctx.log),
      // Arming a run on a simulated bench starts a fresh simulated pack, so a demo always starts from full.
      prepareBench: async (id) => ctx.services.benchManager?.freshSimulation(id),
    });
    const hub = new LiveHub({
      source: {
        benchStatus: (id) => ctx.services.benchManager?.getStatus(id) ?? null,
        benchRun: (benchId) => {
          const runId = recorder.runOnBench(benchId);
          const s = runId === undefined ? undefined : recorder.session(runId);
          return s ? recorder.liveView(s) : null;
        },
        run: async (id) => {
          const s = recorder.session(id);
          if (s) return { run: recorder.liveView(s), events: s.events };
          const run = await repo.get(id);
          return run ? { run, events: (await repo.events(id)).map((e) => e.event) } : null;
        },
      },
    });
    recorder.readings.add((runId, reading) => hub.publishReading({ kind: 'run', id: runId }, reading));
    recorder.readings.add((runId, reading, index) => journal.append(runId, index, reading));
    recorder.events.add((runId, e) => ('id' in e ? hub.publishStoredEvent(e) : hub.publishEvent(runId, e.event, null)));
    recorder.runChanges.add((run) => hub.publishRun(run));
    recorder.noteChanges.add((change) => hub.publishNoteChange(change));

    // Batches an earlier process spilled hold the newest state of its runs: write them first.
    await writer.start();
    await writer.flush();
    const journalled = await journal.recover();
    await recorder.resume();
    // Readings the journal kept past what the archive holds go back in before any meter is heard.
    await replayJournal(journalled, journal, recorder, repo, ctx.log);
    journal.start();
    const feed = options.feed ?? ctx.services.benchManager;
    const unsubscribe: (() => void)[] = [];
    if (feed) {
      recorder.attach(feed);
      unsubscribe.push(feed.onFrame((benchId, frame) => hub.publishReading({ kind: 'bench', id: benchId }, frame)));
      if (feed.onStatus) unsubscribe.push(feed.onStatus((benchId, status) => hub.publishStatus(benchId, status)));
    } else ctx.log.warn('Live: no frame feed; runs cannot record');
    ctx.services.runRecorder = recorder;
    const ws = attachWsServer(httpServer, {
      hub,
      authenticate: (req) => sessionUserFromRequest(ctx, req),
      checkOrigin: (req) => isSameOrigin(req, ctx.config),
      log: createLogger('live', ctx.log),
    });
    ctx.services.closeUserSockets = ws.closeUser;
    ctx.services.closeSessionSockets = ws.closeSession;
    return async () => {
      delete ctx.services.closeUserSockets;
      delete ctx.services.closeSessionSockets;
      await ws.close();
      for (const off of unsubscribe) off();
      recorder.detach();
      hub.close();
      await writer.shutdown(SHUTDOWN_FLUSH_MS);
      await journal.close();
      // Only now: until the archive holds everything, run requests still see the live totals, not the lagging row.
      delete ctx.services.runRecorder;
    };
  };
}

/** The attachment with defaults, for server.ts's list. */
export const attachLive = liveAttachment();
