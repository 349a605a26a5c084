import nodemailer, { type Transporter } from 'nodemailer';
import type { Config } from '../config';
import { log } from '../log';
import { withRetry } from '../db/retry';
import { recordAudit } from '../services/audit';
import { startMailSink, type MailSink } from './sink';
import { MAIL_HEADERS, type MailMessage, type Mailer, type MailResult, type MailTransportKind } from './types';

/** Tries of one message before it counts as failed (transient failures only; see server/db/retry.ts). */
const MAIL_ATTEMPTS = 4;

/** Timeouts for a real SMTP server, so a request never hangs for minutes (the URL's query string may override them). */
const SMTP_DEFAULTS = { connectionTimeout: 15_000, greetingTimeout: 15_000, socketTimeout: 30_000 };

interface Connected {
  transporter: Transporter;
  describe: string;
  sink?: MailSink;
}

const addressesOf = (list: unknown): string[] =>
  Array.isArray(list)
    ? list.map((a) => (typeof a === 'string' ? a : String((a as { address?: string }).address ?? '')))
    : [];

/** The host and port of an SMTP URL, for logs (never the credentials). */
export function describeSmtpUrl(url: string): string {
  try {
    const u = new URL(url);
    return `${u.protocol}//${u.hostname}${u.port ? `:${u.port}` : ''}`;
  } catch {
    return 'the configured server';
  }
}

/** nodemailer over SMTP, to the configured server or to the local sink. */
class SmtpMailer implements Mailer {
  private connecting?: Promise<Connected>;
  private closed = false;

  constructor(
    readonly transport: MailTransportKind,
    private readonly from: string,
    private readonly connect: () => Promise<Connected>,
    private readonly retryDelayMs = 200,
  ) {}

  async start(): Promise<string> {
    return (await this.connection()).describe;
  }

  private connection(): Promise<Connected> {
    this.connecting ??= this.connect();
    return this.connecting;
  }

  async send(message: MailMessage): Promise<MailResult> {
    const to = (Array.isArray(message.to) ? message.to : [message.to]).map((a) => a.trim()).filter(Boolean);
    let result: MailResult;
    try {
      if (this.closed) throw new Error('Mail is shut down');
      if (!to.length) throw new Error('No recipient');
      const { transporter } = await this.connection();
      // A busy store, a dropped connection or an SMTP 4xx is tried again a few times before the send counts as failed.
      const info = await withRetry(
        () =>
          transporter.sendMail({
            from: this.from,
            to,
            subject: message.subject,
            text: message.text,
            html: message.html,
            headers: { [MAIL_HEADERS.organization]: message.organizationId, [MAIL_HEADERS.kind]: message.kind },
          }),
        { attempts: MAIL_ATTEMPTS, baseDelayMs: this.retryDelayMs },
      );
      const accepted = addressesOf(info.accepted);
      const rejected = addressesOf(info.rejected);
      result = {
        ok: rejected.length === 0 && accepted.length > 0,
        messageId: info.messageId ?? null,
        accepted,
        rejected,
        error: rejected.length ? `Refused by the mail server: ${rejected.join(', ')}` : null,
      };
    } catch (e) {
      result = {
        ok: false,
        messageId: null,
        accepted: [],
        rejected: to,
        error: e instanceof Error ? e.message : String(e),
      };
    }
    try {
      // mail.failed in particular must reach the audit log (the admin's only sign of a lost message): retried too.
      await withRetry(() =>
        recordAudit({
          organizationId: message.organizationId,
          actorId: message.actorId ?? null,
          action: result.ok ? 'mail.sent' : 'mail.failed',
          entityType: 'mail',
          entityId: null,
          summary: {
            to,
            subject: message.subject,
            kind: message.kind,
            transport: this.transport,
            ...(result.messageId ? { messageId: result.messageId } : {}),
            ...(result.error ? { error: result.error } : {}),
          },
        }),
      );
    } catch (e) {
      // The message is gone either way; losing its audit line must not turn a sent mail into a failure.
      log.error({ err: e }, 'could not record the mail audit event');
    }
    return result;
  }

  async close(): Promise<void> {
    this.closed = true;
    if (!this.connecting) return;
    const c = await this.connecting.catch(() => null);
    if (!c) return;
    c.transporter.close();
    await c.sink?.close();
  }
}

/**
 * The mailer the configuration asks for: SMTP_URL set → that server; otherwise (development and tests only) a local
 * SMTP sink on 127.0.0.1 that files every message in the outbox. Production without SMTP_URL never gets here:
 * loadConfig refuses to start.
 */
export function createMailer(config: Pick<Config, 'env' | 'smtpUrl' | 'mailFrom' | 'mailSinkPort'>): Mailer {
  if (config.smtpUrl) {
    const url = config.smtpUrl;
    return new SmtpMailer('smtp', config.mailFrom, async () => ({
      transporter: nodemailer.createTransport({ ...SMTP_DEFAULTS, url } as Parameters<
        typeof nodemailer.createTransport
      >[0]),
      describe: `Mail: SMTP via ${describeSmtpUrl(url)}, from ${config.mailFrom}`,
    }));
  }
  if (config.env === 'production') throw new Error('SMTP_URL is required in production');
  return new SmtpMailer('local-sink', config.mailFrom, async () => {
    const sink = await startMailSink({ host: '127.0.0.1', port: config.mailSinkPort });
    const transporter = nodemailer.createTransport({
      host: sink.host,
      port: sink.port,
      secure: false,
      ignoreTLS: true,
      auth: sink.auth,
      ...SMTP_DEFAULTS,
    });
    return {
      transporter,
      sink,
      describe: `Mail: local sink on ${sink.host}:${sink.port}; messages are captured in the outbox (admin), not delivered. Set SMTP_URL to deliver.`,
    };
  });
}
