import type { EntityManager } from 'typeorm';
import {
  requiredEmailTemplates,
  updateNotificationPreferencesInput,
  userEmailMessages,
  type NotificationPreferencesDto,
} from '@shared/schemas/notification-preferences';
import type { FieldError } from '@shared/schemas/api-error';
import type { Role } from '@shared/vocabulary';
import { AppError } from '../lib/errors';
import type { Actor, ServiceContext } from '../lib/context';
import { logger } from '../lib/logger';
import { parseInput } from '../lib/validate';
import { enqueueEmail } from './outbox';
import type { EmailData, EmailTemplate } from './templates';

// Each person chooses which e-mails they receive (users.notification_preferences: template → on/off,
// on unless turned off). Messages security needs (password resets, invitations) are always sent.
// The choice is applied in one place: every message to a user goes through enqueueEmailToUser.

type Preferences = Record<string, boolean>;

/** Whether a person with these preferences gets this template. */
export function wantsEmail(preferences: Preferences | null | undefined, template: string): boolean {
  if (requiredEmailTemplates.includes(template)) return true;
  return preferences?.[template] !== false;
}

/**
 * A user by id, or by their e-mail address (unique across the network, stored lower-case), or as the
 * caller has just read them (`known`), which saves reading them again.
 */
export type UserRecipient = string | { id: string } | { email: string } | { known: RecipientRow };

export interface RecipientRow {
  id: string;
  email: string;
  status: 'active' | 'invited' | 'disabled';
  notification_preferences: Preferences | null;
}

/**
 * Writes a message for a user to the outbox, in the caller's transaction, unless the user has turned
 * that message off (or the account is disabled); security messages always go. Answers the outbox id,
 * or null when nothing was written.
 */
export async function enqueueEmailToUser<T extends EmailTemplate>(
  manager: EntityManager,
  recipient: UserRecipient,
  template: T,
  data: EmailData<T>,
): Promise<string | null> {
  let user: RecipientRow | undefined;
  const byId = typeof recipient === 'string' || 'id' in recipient;
  let key = '';
  if (typeof recipient === 'object' && 'known' in recipient) {
    user = recipient.known;
  } else {
    key = typeof recipient === 'string' ? recipient : 'id' in recipient ? recipient.id : recipient.email.trim().toLowerCase();
    const rows: RecipientRow[] = await manager.query(
      `SELECT id, email, status, notification_preferences FROM users WHERE ${byId ? 'id = $1::uuid' : 'email = $1'}`,
      [key],
    );
    user = rows[0];
  }
  if (!user) {
    logger.warn({ template, recipient: byId ? key : 'by e-mail' }, 'e-mail not queued: no such user');
    return null;
  }
  const required = requiredEmailTemplates.includes(template);
  if (!required && (user.status === 'disabled' || !wantsEmail(user.notification_preferences, template))) return null;
  return enqueueEmail(manager, user.email, template, data);
}

function messagesFor(role: Role) {
  return userEmailMessages.filter((m) => m.roles.includes(role));
}

async function load(manager: EntityManager, userId: string): Promise<{ role: Role; preferences: Preferences }> {
  const rows: { role: Role; notification_preferences: Preferences | null }[] = await manager.query(
    `SELECT role, notification_preferences FROM users WHERE id = $1`,
    [userId],
  );
  if (!rows[0]) throw AppError.notFound('That user');
  return { role: rows[0].role, preferences: rows[0].notification_preferences ?? {} };
}

function toDto(role: Role, preferences: Preferences): NotificationPreferencesDto {
  return {
    messages: messagesFor(role).map((m) => ({
      template: m.template,
      group: m.group,
      label: m.label,
      description: m.description,
      enabled: wantsEmail(preferences, m.template),
      required: m.required === true,
    })),
  };
}

export async function getNotificationPreferences(ctx: ServiceContext, actor: Actor): Promise<NotificationPreferencesDto> {
  const { role, preferences } = await load(ctx.db.manager, actor.userId);
  return toDto(role, preferences);
}

/** Changes the named messages only; the others keep their current choice. */
export async function updateNotificationPreferences(ctx: ServiceContext, actor: Actor, rawInput: unknown): Promise<NotificationPreferencesDto> {
  const input = parseInput(updateNotificationPreferencesInput, rawInput);
  return ctx.db.transaction(async (manager) => {
    const { role } = await load(manager, actor.userId);
    const known = new Map(messagesFor(role).map((m) => [m.template, m]));
    const refusals: FieldError[] = [];
    for (const [template, enabled] of Object.entries(input.preferences)) {
      const message = known.get(template);
      if (!message) refusals.push({ path: `preferences.${template}`, message: 'Not a message sent to you; choose from the list on your profile' });
      else if (message.required && !enabled) refusals.push({ path: `preferences.${template}`, message: `${message.label} keep your account safe and cannot be turned off` });
    }
    if (refusals.length) throw AppError.validation(refusals);
    const changes = Object.fromEntries(Object.entries(input.preferences).filter(([template]) => !known.get(template)!.required));
    const [updated]: [{ role: Role; notification_preferences: Preferences }[], number] = await manager.query(
      `UPDATE users SET notification_preferences = coalesce(notification_preferences, '{}'::jsonb) || $2::jsonb, updated_at = now()
        WHERE id = $1 RETURNING role, notification_preferences`,
      [actor.userId, JSON.stringify(changes)],
    );
    return toDto(updated[0]!.role, updated[0]!.notification_preferences);
  });
}
