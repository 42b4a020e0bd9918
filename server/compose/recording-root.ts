import type { Server } from 'node:http';
import { join } from 'node:path';
import type { AppContext } from '../app-context.js';
import { createArchiveWriter } from '../archive/archive-service.js';
import { archiveSink } from '../archive/run-archive.js';
import { ReadingJournal } from '../journal/reading-journal.js';
import { replayJournal } from '../journal/replay-journal.js';
import { LiveHub } from '../live/live-hub.js';
import { openLiveEndpoint } from '../live/live-endpoint.js';
import { batteryLookup } from '../runs/battery-facts.js';
import { RunRecorder, type FrameFeed } from '../runs/run-recorder.js';
import { RunsRepo } from '../runs/runs-repo.js';
import '../benches/bench-services.js';
import '../runs/runs-services.js';
import { liveSnapshotSource } from './live-snapshot-source.js';
import { createLogger } from '../log/logger.js';

/** How long a shutdown waits for the database to take pending readings before spilling them. */
export const SHUTDOWN_FLUSH_MS = 5000;

export interface RecordingOptions {
  /** Frames to record from; default the ingest area's bench manager. */
  feed?: FrameFeed;
  /** Where batches go when the database is away; default <dataDir>/spill. */
  spillDir?: string;
  memoryLimitBytes?: number;
  /** Where the readings journal lives; default <dataDir>/journal. */
  journalDir?: string;
}

/**
 * The composition root of recording: the one place that wires a reading's way through the
 * server. Frames flow one way: the feed (the bench manager's sources, framers and parsers)
 * into the run recorder (the run pipeline), and from there to independent sinks: the live
 * hub, the readings journal and the archive, none of which knows the others or is built by
 * the recorder. Bench frames and source status go to the hub as they come. Resumes the
 * runs that were recording when the server stopped before any meter is heard. Runs after
 * the bench manager's attachment so its frames are there to subscribe to.
 */
export function recordingAttachment(options: RecordingOptions = {}) {
  return async function attachRecording(httpServer: Server, ctx: AppContext): Promise<() => Promise<void>> {
    const repo = new RunsRepo(ctx.sequelize);
    const journal = new ReadingJournal({ dir: options.journalDir ?? join(ctx.config.dataDir, 'journal'), log: createLogger('journal', ctx.log) });
    const writer = createArchiveWriter(ctx.sequelize, {
      spillDir: options.spillDir ?? join(ctx.config.dataDir, 'spill'),
      memoryLimitBytes: options.memoryLimitBytes,
      log: createLogger('archive', ctx.log),
      onArchived: (batch) => journal.archived(batch.runId, batch.patch.readingsCount ?? 0, batch.patch.endedAt !== undefined),
    });
    const recorder = new RunRecorder({
      repo, archive: archiveSink(writer), getBattery: batteryLookup(ctx), benchExists: (id) => repo.benchExists(id),
      benchSourceFacts: (id) => repo.benchSourceFacts(id), log: createLogger('runs', ctx.log),
      // Arming a run on a simulated bench starts a fresh simulated pack, so a demo always starts from full.
      prepareBench: async (id) => ctx.services.benchManager?.freshSimulation(id),
    });
    const hub = new LiveHub({ source: liveSnapshotSource(ctx, recorder, repo) });
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
    const closeEndpoint = openLiveEndpoint(httpServer, ctx, hub);
    return async () => {
      await closeEndpoint();
      // Gateways' feeds stop before the recorder lets go: what the broker has not handed over stays queued for the next start.
      await ctx.services.gatewayLink?.stop();
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
export const attachRecording = recordingAttachment();
