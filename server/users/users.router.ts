import { area, currentUser, parse } from '../http/route.js';
import { ctx } from '../context.js';
import { audit, actor } from '../audit/audit.service.js';
import { IdParamSchema } from '../../shared/sites.js';
import { UserCreateSchema, UserUpdateSchema } from '../../shared/auth/user.js';
import { issueToken } from '../auth/tokens.js';
import { appUrl } from '../http/app-url.js';
import { AppError } from '../http/errors.js';
import { createUser, getUser, listUsers, updateUser } from './users.service.js';

const a = area('/api/users');
const ADMIN = ['admin'] as const;

a.get('/', ADMIN, async (req) => ({ items: await listUsers(ctx(req).ds) }));

a.get('/:id', ADMIN, async (req) => getUser(ctx(req).ds, parse(IdParamSchema, req.params, 'address').id));

/** Invites a user by e-mail: the account has no password until the invitation is accepted. */
a.post('/', ADMIN, async (req, res) => {
  const input = parse(UserCreateSchema, req.body, 'user form');
  const { ds, mailer } = ctx(req);
  const id = await createUser(ds, input);
  const token = await issueToken(ds, id, 'invite', 72);
  await audit(ds, { action: 'user-invited', ...actor(req), entity: 'user', entityId: id, newValue: { email: input.email, roles: input.roles, siteIds: input.siteIds } });
  await mailer.send({
    to: input.email,
    subject: 'You are invited to Alveolog',
    text: `${currentUser(req).displayName} invited you to Alveolog, the post-operative pulmonary complication registry, as ${input.roles.join(', ')}.\n\nChoose your password within 72 hours (the link works once):\n${appUrl(req)}/accept-invitation?token=${token}\n`,
  });
  res.status(201);
  return getUser(ds, id);
});

a.patch('/:id', ADMIN, async (req) => {
  const { id } = parse(IdParamSchema, req.params, 'address');
  const input = parse(UserUpdateSchema, req.body, 'user form');
  const me = currentUser(req);
  if (id === me.id && (input.active === false || (input.roles && !input.roles.includes('admin')))) {
    throw new AppError(400, 'self_lockout', 'you cannot deactivate yourself or remove your own administrator role', { hint: 'ask another administrator to do it' });
  }
  const { ds } = ctx(req);
  const { before, after } = await updateUser(ds, id, input);
  const changes = (['displayName', 'roles', 'isChair', 'siteIds', 'active'] as const)
    .filter((f) => JSON.stringify(before[f]) !== JSON.stringify(after[f]))
    .map((f) => ({ action: 'user-changed', ...actor(req), entity: 'user', entityId: id, field: f, oldValue: before[f], newValue: after[f] }));
  await audit(ds, changes);
  return after;
});

/** Sends a password-reset e-mail on the user's behalf. */
a.post('/:id/password-reset', ADMIN, async (req, res) => {
  const { id } = parse(IdParamSchema, req.params, 'address');
  const { ds, mailer } = ctx(req);
  const user = await getUser(ds, id);
  const token = await issueToken(ds, id, user.invitePending ? 'invite' : 'reset', user.invitePending ? 72 : 1);
  await audit(ds, { action: 'password-reset-sent', ...actor(req), entity: 'user', entityId: id });
  await mailer.send({
    to: user.email,
    subject: user.invitePending ? 'You are invited to Alveolog' : 'Alveolog: reset your password',
    text: user.invitePending
      ? `Choose your Alveolog password within 72 hours (the link works once):\n${appUrl(req)}/accept-invitation?token=${token}\n`
      : `An administrator started a password reset for your Alveolog account.\n\nOpen this link within 1 hour (it works once):\n${appUrl(req)}/reset-password?token=${token}\n`,
  });
  res.status(202);
  return { sent: true };
});

export const usersRouter = a;
