import type { AppContext } from '../app-context.js';
import type { BenchManager } from '../ingest/bench-manager.js';

declare module '../app-context.js' {
  interface AppServices {
    /** Runs one source per bench; set by the bench root (server/compose/bench-root.ts) before the server listens. */
    benchManager: BenchManager;
  }
}

/** The bench manager if it is running (tests without attachments have none). */
export function benchManagerOf(ctx: AppContext): BenchManager | undefined {
  return ctx.services.benchManager;
}
