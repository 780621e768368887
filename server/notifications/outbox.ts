import type { DataSource, EntityManager } from 'typeorm';
import type { Transporter } from 'nodemailer';
import { appendBufferOf, newRowId } from '../db/appends';
import { currentRequestId, logger } from '../lib/logger';
import { OutboxMessage } from './entities';
import { emailTemplates, type EmailData, type EmailTemplate } from './templates';

/** Writes an e-mail to the outbox inside the caller's transaction. */
export async function enqueueEmail<T extends EmailTemplate>(
  manager: EntityManager,
  to: string,
  template: T,
  data: EmailData<T>,
): Promise<string> {
  const rendered = (emailTemplates[template] as (d: EmailData<T>) => { subject: string; text: string; html: string })(data);
  const buffer = appendBufferOf(manager);
  if (buffer) {
    const id = newRowId();
    buffer.outbox.push({ id, template, recipient: to, subject: rendered.subject, textBody: rendered.text, htmlBody: rendered.html, requestId: currentRequestId() ?? null });
    return id;
  }
  const result = await manager.insert(OutboxMessage, {
    template,
    recipient: to,
    subject: rendered.subject,
    textBody: rendered.text,
    htmlBody: rendered.html,
    requestId: currentRequestId() ?? null,
  });
  return result.identifiers[0]!.id as string;
}

const MAX_ATTEMPTS = 12;
// 5 s, 10 s, 20 s … capped at 15 min: a mail server that is down for a while delays mail only.
const backoffMs = (attempt: number) => Math.min(5000 * 2 ** (attempt - 1), 15 * 60_000);

export interface DispatchOptions {
  from: string;
  batchSize?: number;
}

/**
 * Sends due messages. Rows are claimed with SKIP LOCKED so several workers can run; the
 * Message-ID is the outbox row's id, so a receiver can tell a resend of the same message.
 */
export async function dispatchOutbox(db: DataSource, transport: Transporter, { from, batchSize = 25 }: DispatchOptions): Promise<number> {
  return db.transaction(async (manager) => {
    const due: OutboxMessage[] = await manager
      .createQueryBuilder(OutboxMessage, 'm')
      .where(`m.status = 'pending' AND m.next_attempt_at <= now()`)
      // Links people are waiting for (a password reset, an invitation) go before any backlog.
      .orderBy(`CASE WHEN m.template IN ('password_reset', 'staff_invitation') THEN 0 ELSE 1 END`, 'ASC')
      .addOrderBy('m.created_at', 'ASC')
      .limit(batchSize)
      .setLock('pessimistic_write')
      .setOnLocked('skip_locked')
      .getMany();
    let sent = 0;
    for (const message of due) {
      try {
        await transport.sendMail({
          from,
          to: message.recipient,
          subject: message.subject,
          text: message.textBody,
          html: message.htmlBody,
          messageId: `<${message.id}@platterpost.example>`,
        });
        await manager.update(OutboxMessage, message.id, { status: 'sent', sentAt: new Date(), attempts: message.attempts + 1, lastError: null });
        sent++;
      } catch (err) {
        const attempts = message.attempts + 1;
        await manager.update(OutboxMessage, message.id, {
          attempts,
          lastError: String((err as Error).message ?? err).slice(0, 500),
          status: attempts >= MAX_ATTEMPTS ? 'failed' : 'pending',
          nextAttemptAt: new Date(Date.now() + backoffMs(attempts)),
        });
        logger.warn({ outboxId: message.id, attempts, err: (err as Error).message }, 'e-mail not sent; will retry');
      }
    }
    return sent;
  });
}
