import type { AppContext } from '../app-context.js';
import { UnavailableError } from '../domain/domain-errors.js';
import type { VapidKeys } from './vapid-keys.js';

/** What the push routes need from the running push attachment. */
export interface PushRuntime {
  vapid: VapidKeys;
  ackSecret: string;
}

declare module '../app-context.js' {
  interface AppServices {
    /** Web Push keys and the acknowledge-token secret; set by attachPush. */
    push: PushRuntime;
  }
}

/** The push runtime, or an UnavailableError when this server runs without Web Push. */
export function pushOf(ctx: AppContext): PushRuntime {
  const push = ctx.services.push;
  if (!push) throw new UnavailableError('Web Push is not running on this server');
  return push;
}
