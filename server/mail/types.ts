/** What a message is for; travels in the X-Emberline-Kind header and lands in the outbox. */
export type MailKind = 'reminder' | 'invitation' | 'password-reset';

/** local-sink: captured on this machine and shown in the outbox, never delivered; smtp: handed to the configured server. */
export type MailTransportKind = 'local-sink' | 'smtp';

export interface MailMessage {
  /** The organization the message belongs to (outbox scoping and the audit event). */
  organizationId: string;
  kind: MailKind;
  to: string | string[];
  subject: string;
  text: string;
  html?: string;
  /** Who caused the message (audit); null or absent for the server itself. */
  actorId?: string | null;
}

export interface MailResult {
  ok: boolean;
  messageId: string | null;
  accepted: string[];
  rejected: string[];
  /** Why it failed (connection refused, rejected recipient, …). */
  error: string | null;
}

/** Outgoing mail. Every send records `mail.sent` or `mail.failed` in the audit log; it never throws. */
export interface Mailer {
  readonly transport: MailTransportKind;
  /** Connects (local sink: starts it). Idempotent; `send` calls it too. Returns a line for the start-up log. */
  start(): Promise<string>;
  send(message: MailMessage): Promise<MailResult>;
  /** Stops the transport and, for the local sink, the sink. */
  close(): Promise<void>;
}

/** Custom headers set on every message (the local sink reads them to file the message). */
export const MAIL_HEADERS = {
  organization: 'X-Emberline-Organization',
  kind: 'X-Emberline-Kind',
} as const;
