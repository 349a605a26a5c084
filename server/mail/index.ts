export { createMailer, describeSmtpUrl } from './mailer';
export { startMailSink, type CapturedMessage, type MailSink, type MailSinkOptions } from './sink';
export {
  appLink,
  DIGEST_ROWS,
  escapeHtml,
  invitationMail,
  passwordResetMail,
  REMINDER_CAUTION,
  reminderDigestMail,
  type DigestSection,
  type MailContent,
} from './templates';
export {
  MAIL_HEADERS,
  type MailKind,
  type MailMessage,
  type Mailer,
  type MailResult,
  type MailTransportKind,
} from './types';
