import { randomBytes, randomUUID } from 'node:crypto';
import type { AddressInfo } from 'node:net';
import { simpleParser } from 'mailparser';
import { SMTPServer } from 'smtp-server';
import { CapturedMail } from '../db/models';
import { log } from '../log';
import { MAIL_HEADERS } from './types';

/** A message as the sink received it. */
export interface CapturedMessage {
  organizationId: string | null;
  messageId: string | null;
  kind: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
}

export interface MailSink {
  host: string;
  port: number;
  /** Credentials the sink requires (random per start), so no other local process can file mail into the outbox. */
  auth: { user: string; pass: string };
  close(): Promise<void>;
}

export interface MailSinkOptions {
  host?: string;
  /** 0: any free port. */
  port?: number;
  /** Where a received message goes; default: a row of captured_mail. */
  store?: (message: CapturedMessage) => Promise<void>;
}

const MAX_MESSAGE_BYTES = 10 * 1024 * 1024;
const clip = (s: string, max: number): string => (s.length > max ? s.slice(0, max) : s);

/** Receipt times never repeat, so "newest first" is a strict order even for messages of the same millisecond. */
let lastReceived = 0;
function receivedNow(): Date {
  lastReceived = Math.max(Date.now(), lastReceived + 1);
  return new Date(lastReceived);
}

async function storeCaptured(m: CapturedMessage): Promise<void> {
  await CapturedMail.create({
    id: randomUUID(),
    organizationId: m.organizationId,
    messageId: m.messageId ? clip(m.messageId, 300) : null,
    kind: clip(m.kind, 40),
    from: clip(m.from, 320),
    to: JSON.stringify(m.to),
    subject: clip(m.subject, 400),
    text: m.text,
    receivedAt: receivedNow(),
  });
}

/** `Name <address>` (or the bare address) without the quoting of the header. */
function senderOf(a: { name?: string; address?: string } | undefined): string {
  if (!a?.address) return '';
  return a.name ? `${a.name} <${a.address}>` : a.address;
}

/**
 * The local SMTP sink (development and tests): a real SMTP server on 127.0.0.1 that accepts every message after
 * authentication, parses it and files it in captured_mail under the organization and kind named in the app's headers.
 * Nothing is delivered anywhere.
 */
export async function startMailSink(opts: MailSinkOptions = {}): Promise<MailSink> {
  const host = opts.host ?? '127.0.0.1';
  const store = opts.store ?? storeCaptured;
  const auth = { user: 'emberline', pass: randomBytes(18).toString('base64url') };
  const server = new SMTPServer({
    name: 'emberline-mail-sink',
    banner: 'Emberline local mail sink: messages are captured, not delivered',
    secure: false,
    disabledCommands: ['STARTTLS'],
    allowInsecureAuth: true,
    authMethods: ['PLAIN', 'LOGIN'],
    size: MAX_MESSAGE_BYTES,
    logger: false,
    closeTimeout: 2000,
    onAuth(a, _session, callback) {
      if (a.username === auth.user && a.password === auth.pass) callback(null, { user: a.username });
      else callback(new Error('Invalid username or password'));
    },
    onData(stream, session, callback) {
      simpleParser(stream)
        .then(async (parsed) => {
          if ((stream as { sizeExceeded?: boolean }).sizeExceeded)
            throw Object.assign(new Error('Message too large'), { responseCode: 552 });
          const header = (name: string): string => {
            const v = parsed.headers.get(name.toLowerCase());
            return typeof v === 'string' ? v.trim() : '';
          };
          await store({
            organizationId: header(MAIL_HEADERS.organization) || null,
            messageId: parsed.messageId ?? null,
            kind: header(MAIL_HEADERS.kind),
            from:
              senderOf(parsed.from?.value[0]) || (session.envelope.mailFrom ? session.envelope.mailFrom.address : ''),
            to: session.envelope.rcptTo.map((r) => r.address.toLowerCase()),
            subject: parsed.subject ?? '',
            text: parsed.text ?? '',
          });
        })
        .then(
          () => callback(),
          (e: unknown) => {
            stream.resume();
            callback(e instanceof Error ? e : new Error(String(e)));
          },
        );
    },
  });
  await new Promise<void>((resolve, reject) => {
    const onError = (e: Error): void => reject(e);
    server.server.once('error', onError);
    server.listen(opts.port ?? 0, host, () => {
      server.server.off('error', onError);
      resolve();
    });
  });
  // A connection that goes wrong after start must not bring the process down.
  server.on('error', (e: Error) => log.warn({ err: e }, `mail sink: ${e.message}`));
  const { port } = server.server.address() as AddressInfo;
  return {
    host,
    port,
    auth,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
