import type { EntityManager } from 'typeorm';
import { permissionsFor } from '@shared/permissions';
import type { MeResponse, SessionUser } from '@shared/schemas/auth';
import { recordAudit } from '../audit';
import { AppError } from '../lib/errors';
import type { Actor, ServiceContext } from '../lib/context';
import { enqueueEmailToUser } from '../notifications';
import { Organization } from '../organizations/entities';
import { OneTimeToken, RefreshToken, User, type OneTimeTokenPurpose } from './entities';
import { decoyHash, hashPassword, verifyPassword } from './passwords';
import { formatOpaqueToken, newOpaqueSecret, parseOpaqueToken, secretMatches, signAccessToken } from './tokens';

export interface IssuedSession {
  accessToken: string;
  refreshToken: string;
  refreshExpiresAt: Date;
  user: SessionUser;
}

const INVALID_CREDENTIALS = new AppError('invalid_credentials', 401, 'That e-mail and password do not match an account.');

export function toSessionUser(user: User, organization: Organization): SessionUser {
  return {
    id: user.id,
    email: user.email,
    name: user.name,
    role: user.role,
    organization: { id: organization.id, kind: organization.kind, name: organization.name },
  };
}

async function loadUserWithOrganization(manager: EntityManager, userId: string) {
  const user = await manager.findOne(User, { where: { id: userId }, relations: { organization: true } });
  if (!user || !user.organization) return null;
  return { user, organization: user.organization };
}

async function issueSession(ctx: ServiceContext, manager: EntityManager, user: User, organization: Organization, familyId?: string): Promise<IssuedSession> {
  const { secret, hash } = newOpaqueSecret();
  const expiresAt = new Date(Date.now() + ctx.config.refreshTokenTtlDays * 86_400_000);
  const row = manager.create(RefreshToken, { userId: user.id, tokenHash: hash, expiresAt, familyId: familyId ?? crypto.randomUUID() });
  await manager.save(row);
  const accessToken = signAccessToken(
    { sub: user.id, org: organization.id, kind: organization.kind, role: user.role },
    ctx.config.jwtSecret,
    ctx.config.accessTokenTtlSeconds,
  );
  return { accessToken, refreshToken: formatOpaqueToken(row.id, secret), refreshExpiresAt: expiresAt, user: toSessionUser(user, organization) };
}

export async function signIn(ctx: ServiceContext, input: { email: string; password: string; ip?: string | null }): Promise<IssuedSession> {
  const user = await ctx.db.getRepository(User).findOne({ where: { email: input.email }, relations: { organization: true } });
  if (!user || !user.passwordHash || user.status !== 'active' || !user.organization?.active) {
    await verifyPassword(input.password, await decoyHash());
    throw INVALID_CREDENTIALS;
  }
  if (user.lockedUntil && user.lockedUntil > new Date()) {
    const minutes = Math.ceil((user.lockedUntil.getTime() - Date.now()) / 60_000);
    throw new AppError(
      'account_locked',
      429,
      `Too many failed sign-ins. Try again in ${minutes} minute${minutes === 1 ? '' : 's'}, or reset your password.`,
      undefined,
      { headers: { 'Retry-After': String(minutes * 60) } },
    );
  }
  const ok = await verifyPassword(input.password, user.passwordHash);
  if (!ok) {
    await ctx.db.transaction(async (manager) => {
      // Counted in SQL so that parallel attempts cannot undercount.
      const rows: { failed_sign_ins: number }[] = await manager.query(
        `UPDATE users SET failed_sign_ins = failed_sign_ins + 1,
           locked_until = CASE WHEN failed_sign_ins + 1 >= $2 THEN now() + make_interval(mins => $3) ELSE locked_until END
         WHERE id = $1 RETURNING failed_sign_ins`,
        [user.id, ctx.config.signInMaxFailures, ctx.config.signInLockMinutes],
      );
      const failures = (Array.isArray(rows[0]) ? (rows[0] as unknown as typeof rows)[0] : rows[0])?.failed_sign_ins;
      await recordAudit(manager, { action: 'auth.sign_in_failed', actorUserId: user.id, organizationId: user.organizationId, ip: input.ip, details: { failures } });
    });
    throw INVALID_CREDENTIALS;
  }
  return ctx.db.transaction(async (manager) => {
    await manager.update(User, user.id, { failedSignIns: 0, lockedUntil: null, lastSignInAt: new Date() });
    await recordAudit(manager, { action: 'auth.sign_in', actorUserId: user.id, organizationId: user.organizationId, ip: input.ip });
    return issueSession(ctx, manager, user, user.organization!);
  });
}

// A token replaced moments ago may still arrive from a second tab; refuse it without
// treating it as theft.
const ROTATION_GRACE_MS = 10_000;

export async function refreshSession(ctx: ServiceContext, rawToken: string | undefined): Promise<IssuedSession> {
  const ended = () => AppError.unauthenticated('Your session has ended. Sign in again.');
  const parsed = parseOpaqueToken(rawToken);
  if (!parsed) throw ended();
  // The transaction returns its outcome rather than throwing, so that revoking a replayed
  // family commits before the 401 is answered.
  const outcome = await ctx.db.transaction(async (manager): Promise<IssuedSession | 'ended' | 'expired'> => {
    const token = await manager.findOne(RefreshToken, { where: { id: parsed.id }, lock: { mode: 'pessimistic_write' } });
    if (!token || !secretMatches(parsed.secret, token.tokenHash)) return 'ended';
    if (token.revokedAt) {
      const recentlyRotated = token.replacedById && Date.now() - token.revokedAt.getTime() < ROTATION_GRACE_MS;
      if (!recentlyRotated) {
        // Reuse of a rotated token: someone else may hold the family; end all of it.
        await manager.query(`UPDATE refresh_tokens SET revoked_at = now() WHERE family_id = $1 AND revoked_at IS NULL`, [token.familyId]);
        await recordAudit(manager, { action: 'auth.refresh_reuse', actorUserId: token.userId, details: { familyId: token.familyId } });
      }
      return 'ended';
    }
    if (token.expiresAt <= new Date()) return 'expired';
    const loaded = await loadUserWithOrganization(manager, token.userId);
    if (!loaded || loaded.user.status !== 'active' || !loaded.organization.active) return 'ended';
    const session = await issueSession(ctx, manager, loaded.user, loaded.organization, token.familyId);
    const successor = parseOpaqueToken(session.refreshToken)!;
    await manager.update(RefreshToken, token.id, { revokedAt: new Date(), replacedById: successor.id });
    return session;
  });
  if (outcome === 'ended') throw ended();
  if (outcome === 'expired') throw AppError.unauthenticated('Your session has expired. Sign in again.');
  return outcome;
}

export async function signOut(ctx: ServiceContext, rawToken: string | undefined): Promise<void> {
  const parsed = parseOpaqueToken(rawToken);
  if (!parsed) return;
  await ctx.db.transaction(async (manager) => {
    const token = await manager.findOne(RefreshToken, { where: { id: parsed.id } });
    if (!token || !secretMatches(parsed.secret, token.tokenHash)) return;
    await manager.query(`UPDATE refresh_tokens SET revoked_at = now() WHERE family_id = $1 AND revoked_at IS NULL`, [token.familyId]);
    await recordAudit(manager, { action: 'auth.sign_out', actorUserId: token.userId });
  });
}

export async function getMe(ctx: ServiceContext, actor: Actor): Promise<MeResponse> {
  const loaded = await loadUserWithOrganization(ctx.db.manager, actor.userId);
  if (!loaded) throw AppError.unauthenticated();
  return { ...toSessionUser(loaded.user, loaded.organization), permissions: permissionsFor(loaded.user.role) };
}

export async function changePassword(ctx: ServiceContext, actor: Actor, input: { currentPassword: string; newPassword: string }): Promise<void> {
  const user = await ctx.db.getRepository(User).findOneBy({ id: actor.userId });
  if (!user?.passwordHash || !(await verifyPassword(input.currentPassword, user.passwordHash))) {
    throw AppError.validation([{ path: 'currentPassword', message: 'That is not your current password' }]);
  }
  const hash = await hashPassword(input.newPassword);
  await ctx.db.transaction(async (manager) => {
    await manager.update(User, user.id, { passwordHash: hash });
    await recordAudit(manager, { action: 'auth.password_changed', actorUserId: user.id, organizationId: user.organizationId });
  });
}

/** Creates a single-use link token inside the caller's transaction; returns the raw token for the e-mail. */
export async function issueOneTimeToken(
  manager: EntityManager,
  input: { userId: string; purpose: OneTimeTokenPurpose; ttlMs: number; createdById?: string | null },
): Promise<string> {
  const { secret, hash } = newOpaqueSecret();
  const row = manager.create(OneTimeToken, {
    userId: input.userId,
    purpose: input.purpose,
    tokenHash: hash,
    expiresAt: new Date(Date.now() + input.ttlMs),
    createdById: input.createdById ?? null,
  });
  await manager.save(row);
  return formatOpaqueToken(row.id, secret);
}

const INVALID_LINK = (purpose: OneTimeTokenPurpose) =>
  new AppError(
    'invalid_token',
    400,
    purpose === 'invitation'
      ? 'This invitation link has expired or was already used. Ask your administrator for a new one.'
      : 'This reset link has expired or was already used. Ask for a new one.',
    [{ path: 'token', message: 'Expired or already used' }],
  );

async function claimOneTimeToken(manager: EntityManager, raw: string, purpose: OneTimeTokenPurpose, consume: boolean) {
  const parsed = parseOpaqueToken(raw);
  if (!parsed) throw INVALID_LINK(purpose);
  const token = await manager.findOne(OneTimeToken, { where: { id: parsed.id }, lock: consume ? { mode: 'pessimistic_write' } : undefined });
  if (!token || token.purpose !== purpose || token.usedAt || token.expiresAt <= new Date() || !secretMatches(parsed.secret, token.tokenHash)) {
    throw INVALID_LINK(purpose);
  }
  if (consume) await manager.update(OneTimeToken, token.id, { usedAt: new Date() });
  return token;
}

export async function requestPasswordReset(ctx: ServiceContext, email: string): Promise<void> {
  await ctx.db.transaction(async (manager) => {
    const user = await manager.findOneBy(User, { email });
    // Unknown or inactive addresses get the same answer and no mail: no account discovery.
    if (!user || user.status !== 'active') return;
    const token = await issueOneTimeToken(manager, { userId: user.id, purpose: 'password_reset', ttlMs: ctx.config.passwordResetTtlMinutes * 60_000 });
    await enqueueEmailToUser(manager, user.id, 'password_reset', {
      name: user.name,
      url: `${ctx.config.appUrl}/reset-password?token=${encodeURIComponent(token)}`,
      minutes: ctx.config.passwordResetTtlMinutes,
    });
    await recordAudit(manager, { action: 'auth.password_reset_requested', actorUserId: user.id, organizationId: user.organizationId });
  });
}

export async function resetPassword(ctx: ServiceContext, input: { token: string; password: string }): Promise<void> {
  const hash = await hashPassword(input.password);
  await ctx.db.transaction(async (manager) => {
    const token = await claimOneTimeToken(manager, input.token, 'password_reset', true);
    await manager.update(User, token.userId, { passwordHash: hash, failedSignIns: 0, lockedUntil: null });
    // A reset ends every session: whoever knew the old password is signed out.
    await manager.query(`UPDATE refresh_tokens SET revoked_at = now() WHERE user_id = $1 AND revoked_at IS NULL`, [token.userId]);
    await recordAudit(manager, { action: 'auth.password_reset', actorUserId: token.userId });
  });
}

export async function getInvitation(ctx: ServiceContext, raw: string) {
  const token = await claimOneTimeToken(ctx.db.manager, raw, 'invitation', false).catch(() => {
    throw AppError.notFound('This invitation');
  });
  const loaded = await loadUserWithOrganization(ctx.db.manager, token.userId);
  if (!loaded || loaded.user.status !== 'invited') throw AppError.notFound('This invitation');
  return { email: loaded.user.email, name: loaded.user.name, role: loaded.user.role, organizationName: loaded.organization.name };
}

export async function acceptInvitation(ctx: ServiceContext, input: { token: string; name: string; password: string; ip?: string | null }): Promise<IssuedSession> {
  const hash = await hashPassword(input.password);
  return ctx.db.transaction(async (manager) => {
    const token = await claimOneTimeToken(manager, input.token, 'invitation', true);
    const loaded = await loadUserWithOrganization(manager, token.userId);
    if (!loaded || loaded.user.status !== 'invited') throw INVALID_LINK('invitation');
    await manager.update(User, loaded.user.id, { name: input.name, passwordHash: hash, status: 'active', lastSignInAt: new Date() });
    await recordAudit(manager, { action: 'auth.invitation_accepted', actorUserId: loaded.user.id, organizationId: loaded.organization.id, ip: input.ip });
    const user = { ...loaded.user, name: input.name, status: 'active' as const };
    return issueSession(ctx, manager, user as User, loaded.organization);
  });
}

