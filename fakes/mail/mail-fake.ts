import type { AddressInfo } from 'node:net';
import type { Server as HttpServer } from 'node:http';
import express, { type Request, type Response } from 'express';
import { simpleParser, type AddressObject, type ParsedMail } from 'mailparser';
import { SMTPServer } from 'smtp-server';
import { renderInbox, renderMessage, renderNotFound } from './pages';

export interface StoredMessage {
  id: string;
  messageId: string | null;
  /** The From header as written ("Name <addr>"), or the envelope sender when the header is missing. */
  from: string;
  /** Envelope recipients: every address the message was delivered to, Bcc included. */
  to: string[];
  subject: string;
  text: string;
  html: string | null;
  /** ISO 8601; when the fake received the message (the Date header can be missing or wrong). */
  date: string;
  /** Raw header values by lower-case name; a repeated header keeps every value, one per line. */
  headers: Record<string, string>;
}

export interface MailFakeOptions {
  /** 0 picks a free port; read `smtpPort` after `start()`. */
  smtpPort: number;
  /** 0 picks a free port; read `httpPort` after `start()`. */
  httpPort: number;
  host?: string;
}

export interface MailFake {
  start(): Promise<void>;
  stop(): Promise<void>;
  /** Closes only the SMTP listener, so senders see a refused connection (for fault tests). */
  stopSmtp(): Promise<void>;
  /** Opens the SMTP listener again on the same port. */
  startSmtp(): Promise<void>;
  /** Newest first. */
  messages(): StoredMessage[];
  clear(): void;
  /** Resolves with the first stored message (already there or arriving later) that matches. */
  waitForMessage(match: (message: StoredMessage) => boolean, timeoutMs?: number): Promise<StoredMessage>;
  readonly smtpPort: number;
  readonly httpPort: number;
  readonly host: string;
}

function addressText(value: AddressObject | AddressObject[] | undefined): string {
  if (!value) return '';
  return (Array.isArray(value) ? value : [value]).map((a) => a.text).join(', ');
}

function headerRecord(parsed: ParsedMail): Record<string, string> {
  const headers: Record<string, string> = {};
  for (const { key, line } of parsed.headerLines) {
    // Unfold continuation lines (RFC 5322 §2.2.3) and drop the "Name:" prefix.
    const value = line.slice(line.indexOf(':') + 1).replace(/\r?\n[ \t]+/g, ' ').trim();
    headers[key] = key in headers ? `${headers[key]}\n${value}` : value;
  }
  return headers;
}

export function createMailFake({ smtpPort, httpPort, host = '127.0.0.1' }: MailFakeOptions): MailFake {
  let store: StoredMessage[] = [];
  let nextId = 1;
  let smtp: SMTPServer | null = null;
  let http: HttpServer | null = null;
  let boundSmtpPort = smtpPort;
  let boundHttpPort = httpPort;
  const waiters = new Set<(message: StoredMessage) => void>();

  function newSmtpServer(): SMTPServer {
    return new SMTPServer({
      // Loopback only: no TLS and no login, like a developer's catch-all inbox.
      secure: false,
      disabledCommands: ['STARTTLS', 'AUTH'],
      authOptional: true,
      disableReverseLookup: true,
      logger: false,
      banner: 'Platterpost mail fake',
      size: 25 * 1024 * 1024,
      closeTimeout: 1000,
      onData(stream, session, callback) {
        simpleParser(stream)
          .then((parsed) => {
            const envelopeFrom = session.envelope.mailFrom ? session.envelope.mailFrom.address : '';
            const message: StoredMessage = {
              id: String(nextId++),
              messageId: parsed.messageId ?? null,
              from: addressText(parsed.from) || envelopeFrom,
              to: session.envelope.rcptTo.map((r) => r.address),
              subject: parsed.subject ?? '',
              text: parsed.text ?? '',
              html: parsed.html || null,
              date: new Date().toISOString(),
              headers: headerRecord(parsed),
            };
            store.push(message);
            for (const notify of waiters) notify(message);
            callback(null, `Stored as message ${message.id}`);
          })
          .catch((error: unknown) => {
            const failure = new Error(`Could not parse message: ${(error as Error).message}`) as Error & { responseCode: number };
            failure.responseCode = 554;
            callback(failure);
          });
      },
    });
  }

  function listenSmtp(port: number): Promise<void> {
    const server = newSmtpServer();
    return new Promise((resolve, reject) => {
      const onError = (error: Error) => reject(error);
      server.server.once('error', onError);
      server.listen(port, host, () => {
        server.server.off('error', onError);
        // Errors on single connections (a client hanging up mid-message) must not crash the fake.
        server.on('error', () => {});
        boundSmtpPort = (server.server.address() as AddressInfo).port;
        smtp = server;
        resolve();
      });
    });
  }

  function closeSmtp(): Promise<void> {
    const server = smtp;
    smtp = null;
    if (!server) return Promise.resolve();
    return new Promise((resolve) => server.close(() => resolve()));
  }

  const messages = () => [...store].reverse();

  function matchesRecipient(message: StoredMessage, to: string): boolean {
    const wanted = to.trim().toLowerCase();
    return message.to.some((address) => address.toLowerCase() === wanted);
  }

  const app = express();
  app.disable('x-powered-by');

  app.get('/api/messages', (req: Request, res: Response) => {
    const to = typeof req.query.to === 'string' ? req.query.to : undefined;
    res.json(to ? messages().filter((m) => matchesRecipient(m, to)) : messages());
  });
  app.get('/api/messages/:id', (req: Request, res: Response) => {
    const message = store.find((m) => m.id === req.params.id);
    if (!message) {
      res.status(404).json({ error: { code: 'not_found', message: `No message with id ${req.params.id}` } });
      return;
    }
    res.json(message);
  });
  app.delete('/api/messages', (_req: Request, res: Response) => {
    store = [];
    res.status(204).end();
  });
  app.get('/', (req: Request, res: Response) => {
    const to = typeof req.query.to === 'string' && req.query.to ? req.query.to : undefined;
    res.type('html').send(renderInbox(to ? messages().filter((m) => matchesRecipient(m, to)) : messages(), to));
  });
  app.get('/messages/:id', (req: Request, res: Response) => {
    const message = store.find((m) => m.id === req.params.id);
    if (!message) {
      res.status(404).type('html').send(renderNotFound(String(req.params.id)));
      return;
    }
    res.type('html').send(renderMessage(message));
  });

  return {
    async start() {
      await listenSmtp(boundSmtpPort);
      await new Promise<void>((resolve, reject) => {
        const server = app.listen(boundHttpPort, host, (error?: Error) => (error ? reject(error) : resolve()));
        http = server;
      });
      boundHttpPort = (http!.address() as AddressInfo).port;
    },
    async stop() {
      await closeSmtp();
      const server = http;
      http = null;
      if (server) {
        server.closeAllConnections();
        await new Promise<void>((resolve) => server.close(() => resolve()));
      }
    },
    stopSmtp: closeSmtp,
    async startSmtp() {
      if (smtp) return;
      await listenSmtp(boundSmtpPort);
    },
    messages,
    clear() {
      store = [];
    },
    waitForMessage(match, timeoutMs = 5000) {
      const existing = messages().find(match);
      if (existing) return Promise.resolve(existing);
      return new Promise((resolve, reject) => {
        const timer = setTimeout(() => {
          waiters.delete(notify);
          reject(new Error(`No matching message arrived within ${timeoutMs} ms`));
        }, timeoutMs);
        const notify = (message: StoredMessage) => {
          if (!match(message)) return;
          clearTimeout(timer);
          waiters.delete(notify);
          resolve(message);
        };
        waiters.add(notify);
      });
    },
    get smtpPort() {
      return boundSmtpPort;
    },
    get httpPort() {
      return boundHttpPort;
    },
    host,
  };
}
