import type { Role } from '../../shared/schemas/user.js';

/** What `req.user` holds once signed in (loaded fresh from the database on every request). */
export interface SessionUser {
  id: number;
  email: string;
  name: string;
  role: Role;
  disabled: boolean;
}

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    // eslint-disable-next-line @typescript-eslint/no-empty-object-type
    interface User extends SessionUser {}
  }
}
