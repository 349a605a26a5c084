import { CAUTIONS } from '../../shared/cautions';
import { ROLE_LABELS, type Role } from '../../shared/schemas/common';

/** Plain text (always) and simple HTML of a message. */
export interface MailContent {
  subject: string;
  text: string;
  html: string;
}

/** An absolute link into the web app: `<publicBaseUrl>/<path>`. */
export function appLink(publicBaseUrl: string, path: string): string {
  return `${publicBaseUrl.replace(/\/+$/, '')}/${path.replace(/^\/+/, '')}`;
}

export function escapeHtml(s: string): string {
  return s.replace(
    /[&<>"']/g,
    (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c] as string,
  );
}

/** The standing caution under every reminder: the lists rest on engineering models and their approval. */
export const REMINDER_CAUTION = `Caution: these lists come from the study models recorded in Emberline. ${CAUTIONS[1]}`;

const utc = (d: Date): string => `${d.toISOString().slice(0, 16).replace('T', ' ')} UTC`;

function page(paragraphs: string[]): string {
  return `<!doctype html><html><body style="font-family: sans-serif; line-height: 1.4">${paragraphs.join('')}</body></html>`;
}

export function invitationMail(input: {
  organizationName: string;
  inviterName: string;
  name: string;
  role: Role;
  link: string;
  expiresAt: Date;
}): MailContent {
  const role = ROLE_LABELS[input.role];
  const subject = `You are invited to ${input.organizationName} on Emberline`;
  const text = [
    `Hello ${input.name},`,
    '',
    `${input.inviterName} invites you to join ${input.organizationName} on Emberline as ${role}.`,
    'Open this link to choose your password and sign in:',
    '',
    input.link,
    '',
    `The link works once and expires on ${utc(input.expiresAt)}. If you did not expect this invitation, ignore this message.`,
  ].join('\n');
  const html = page([
    `<p>Hello ${escapeHtml(input.name)},</p>`,
    `<p>${escapeHtml(input.inviterName)} invites you to join ${escapeHtml(input.organizationName)} on Emberline as ${escapeHtml(role)}.</p>`,
    `<p><a href="${escapeHtml(input.link)}">Choose your password and sign in</a></p>`,
    `<p>The link works once and expires on ${escapeHtml(utc(input.expiresAt))}. If you did not expect this invitation, ignore this message.</p>`,
  ]);
  return { subject, text, html };
}

export function passwordResetMail(input: { name: string; link: string; expiresAt: Date }): MailContent {
  const subject = 'Reset your Emberline password';
  const text = [
    `Hello ${input.name},`,
    '',
    'Someone (we hope you) asked to reset the password of your Emberline account. Open this link to choose a new one:',
    '',
    input.link,
    '',
    `The link works once and expires on ${utc(input.expiresAt)}. Setting a new password signs you out everywhere else.`,
    'If you did not ask for this, ignore this message: your password stays as it is.',
  ].join('\n');
  const html = page([
    `<p>Hello ${escapeHtml(input.name)},</p>`,
    '<p>Someone (we hope you) asked to reset the password of your Emberline account.</p>',
    `<p><a href="${escapeHtml(input.link)}">Choose a new password</a></p>`,
    `<p>The link works once and expires on ${escapeHtml(utc(input.expiresAt))}. Setting a new password signs you out everywhere else.</p>`,
    '<p>If you did not ask for this, ignore this message: your password stays as it is.</p>',
  ]);
  return { subject, text, html };
}

export interface DigestSection {
  title: string;
  count: number;
  /** Up to DIGEST_ROWS rows: the site and the row's key cells. */
  rows: { siteName: string; cells: { label: string; value: string }[] }[];
  link: string;
}

/** Rows shown per list in a reminder; the link opens the whole list. */
export const DIGEST_ROWS = 10;

export function reminderDigestMail(input: {
  organizationName: string;
  ruleName: string;
  day: string;
  itemCount: number;
  sections: DigestSection[];
}): MailContent {
  const subject =
    input.itemCount === 0
      ? `Emberline reminder: nothing needs attention (${input.ruleName})`
      : `Emberline reminder: ${input.itemCount} ${input.itemCount === 1 ? 'item needs' : 'items need'} attention (${input.ruleName})`;
  const lines: string[] = [`${input.organizationName}: ${input.ruleName}, ${input.day}`, ''];
  const html: string[] = [
    `<p><strong>${escapeHtml(input.organizationName)}</strong>: ${escapeHtml(input.ruleName)}, ${escapeHtml(input.day)}</p>`,
  ];
  for (const s of input.sections) {
    lines.push(`${s.title}: ${s.count}`);
    html.push(`<h3 style="margin-bottom: 4px">${escapeHtml(s.title)}: ${s.count}</h3>`);
    if (s.rows.length) {
      const items: string[] = [];
      for (const r of s.rows) {
        const cells = r.cells.map((c) => `${c.label}: ${c.value}`);
        lines.push(`  - ${[r.siteName, ...cells].join(' · ')}`);
        items.push(`<li>${escapeHtml([r.siteName, ...cells].join(' · '))}</li>`);
      }
      if (s.count > s.rows.length) {
        lines.push(`  … and ${s.count - s.rows.length} more`);
        items.push(`<li>… and ${s.count - s.rows.length} more</li>`);
      }
      html.push(`<ul style="margin-top: 0">${items.join('')}</ul>`);
    }
    lines.push(`  Open the list: ${s.link}`, '');
    html.push(`<p style="margin-top: 0"><a href="${escapeHtml(s.link)}">Open the list</a></p>`);
  }
  lines.push(
    REMINDER_CAUTION,
    '',
    'You receive this because of a reminder rule in Emberline; an administrator or safety officer can change it.',
  );
  html.push(`<p><em>${escapeHtml(REMINDER_CAUTION)}</em></p>`);
  html.push(
    '<p style="color: #555">You receive this because of a reminder rule in Emberline; an administrator or safety officer can change it.</p>',
  );
  return { subject, text: lines.join('\n'), html: page(html) };
}
