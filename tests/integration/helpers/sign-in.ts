import request from 'supertest';
import type TestAgent from 'supertest/lib/agent.js';
import type { PublicUser, Role } from '../../../shared/schemas/user.js';
import { TEST_PASSWORD, TEST_USERS } from './test-context.js';

/** A supertest agent that keeps the session cookie and sends X-CSRF-Token on every request. */
export type SignedInAgent = TestAgent & { csrfToken: string; user: PublicUser };
/** Where requests go: a TestContext (its url), a base URL, or an Express app. */
export type AgentTarget = { url: string } | string | Parameters<typeof request.agent>[0];

function baseOf(target: AgentTarget) {
  return typeof target === 'object' && target !== null && 'url' in target && typeof target.url === 'string' ? target.url : target;
}

/** An anonymous agent that already holds a session with a CSRF token (for login and CSRF tests). */
export async function csrfAgent(target: AgentTarget): Promise<TestAgent & { csrfToken: string }> {
  const agent = request.agent(baseOf(target) as Parameters<typeof request.agent>[0]);
  const response = await agent.get('/api/auth/csrf').expect(200);
  const csrfToken = response.body.csrfToken as string;
  agent.set('X-CSRF-Token', csrfToken);
  return Object.assign(agent, { csrfToken });
}

/**
 * Signs in as the TEST_USERS account of `role` (or any e-mail/password given) and returns an
 * agent carrying the session cookie and the post-login CSRF token in X-CSRF-Token.
 */
export async function signInAs(
  target: AgentTarget,
  role: Role,
  credentials: { email: string; password: string } = { email: TEST_USERS[role].email, password: TEST_PASSWORD },
): Promise<SignedInAgent> {
  const agent = await csrfAgent(target);
  const response = await agent.post('/api/auth/login').send(credentials);
  if (response.status !== 200) {
    throw new Error(`signInAs(${role}) failed: ${response.status} ${JSON.stringify(response.body)}`);
  }
  // Login regenerates the session, so the token changes: send the new one from now on.
  agent.set('X-CSRF-Token', response.body.csrfToken);
  return Object.assign(agent, { csrfToken: response.body.csrfToken as string, user: response.body.user as PublicUser });
}
