import passport from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import type { CoreModels } from '../db/models/index.js';
import { toPublicUser } from '../db/models/user.js';
import { verifyAgainstDummy, verifyPassword } from './password.js';
import './session-user.js';

/** A passport instance of its own per app (no global state shared between test apps). */
export type PassportInstance = InstanceType<typeof passport.Passport>;

/**
 * Local strategy on e-mail + password; the session stores only the user id and the user is
 * reloaded on every request, so a disabled account or a changed role takes effect at once.
 */
export function createPassport(models: CoreModels): PassportInstance {
  const instance = new passport.Passport();
  instance.use(
    new LocalStrategy({ usernameField: 'email', passwordField: 'password' }, (email, password, done) => {
      (async () => {
        const row = await models.User.findOne({ where: { email: email.toLowerCase() } });
        if (!row) return done(null, false, { message: await verifyAgainstDummy(password).then(() => 'unknown') });
        const ok = await verifyPassword(password, row.passwordHash);
        if (!ok || row.disabled) return done(null, false, { message: ok ? 'disabled' : 'wrong' });
        return done(null, toPublicUser(row));
      })().catch(done);
    }),
  );
  instance.serializeUser((user, done) => done(null, user.id));
  instance.deserializeUser((id: unknown, done) => {
    models.User.findByPk(Number(id))
      .then((row) => done(null, row && !row.disabled ? toPublicUser(row) : false))
      .catch(done);
  });
  return instance;
}
