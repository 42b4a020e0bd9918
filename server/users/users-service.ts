import type { CoreModels } from '../db/models/index.js';
import { toPublicUser } from '../db/models/user.js';
import type { CreateUserRequest, PublicUser, UpdateUserRequest } from '../../shared/schemas/user.js';
import { hashPassword } from '../auth/password.js';
import { ConflictError, notFound } from '../domain/domain-errors.js';

/** All users, by e-mail. */
export async function listUsers(models: CoreModels): Promise<PublicUser[]> {
  const rows = await models.User.findAll({ order: [['email', 'ASC']] });
  return rows.map(toPublicUser);
}

/** Creates a user; a taken e-mail is a ConflictError. */
export async function createUser(models: CoreModels, input: CreateUserRequest): Promise<PublicUser> {
  if (await models.User.findOne({ where: { email: input.email } })) {
    throw new ConflictError('A user with this e-mail already exists', { email: ['already in use'] });
  }
  const row = await models.User.create({
    email: input.email,
    name: input.name,
    role: input.role,
    passwordHash: await hashPassword(input.password),
  });
  return toPublicUser(row);
}

/**
 * Renames, sets the role of, or disables/enables a user. An admin cannot demote or disable
 * themselves, so the lab can never lock out its last admin by accident.
 */
export async function updateUser(models: CoreModels, actorId: number, id: number, change: UpdateUserRequest): Promise<PublicUser> {
  const row = await models.User.findByPk(id);
  if (!row) throw notFound('User');
  if (id === actorId && ((change.role && change.role !== 'admin') || change.disabled)) {
    throw new ConflictError('You cannot demote or disable your own account; ask another admin');
  }
  await row.update(change);
  return toPublicUser(row);
}
