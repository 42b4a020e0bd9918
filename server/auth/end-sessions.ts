import type { AppContext } from '../app-context.js';

/** Closes a user's open WebSockets, except those of session `keepSid` (set by the live area's attachment). */
export type CloseUserSockets = (userId: number, keepSid?: string) => void;
/** Closes the WebSockets opened with one session (sign-out). */
export type CloseSessionSockets = (sid: string) => void;
declare module '../app-context.js' {
  interface AppServices {
    closeUserSockets: CloseUserSockets;
    closeSessionSockets: CloseSessionSockets;
  }
}

/**
 * Ends every stored session of a user except `keepSid` (the one changing its password) and
 * closes the WebSockets opened with them. Passport keeps only the user id in the session,
 * serialised by express-session as `"passport":{"user":<id>}`; the closing brace keeps
 * user 5 from matching user 50, and nothing else in a session is user-controlled text.
 */
export async function endUserSessions(ctx: AppContext, userId: number, keepSid?: string): Promise<void> {
  const pattern = `%"passport":{"user":${Math.trunc(userId)}}%`;
  await ctx.sequelize.query('DELETE FROM sessions WHERE data LIKE :pattern AND sid <> :keep', {
    replacements: { pattern, keep: keepSid ?? '' },
  });
  ctx.services.closeUserSockets?.(userId, keepSid);
}
