/**
 * RoleGuard (components/auth/RoleGuard) rendered for each role with the real session (react-dom/server through
 * react-native-web): it shows its page to the roles that hold the capability in shared/permissions.ts and a "not
 * available for your role" page to the others; each guarded section's layout and its navigation item agree.
 */
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import React from 'react';
import { renderToStaticMarkup } from 'react-dom/server';
import AttentionLayout from '../../app/(app)/attention/_layout';
import AuditLogLayout from '../../app/(app)/audit-log/_layout';
import OutboxLayout from '../../app/(app)/outbox/_layout';
import RemindersLayout from '../../app/(app)/reminders/_layout';
import SettingsLayout from '../../app/(app)/settings/_layout';
import TeamLayout from '../../app/(app)/team/_layout';
import { RoleGuard, rolesInWords } from '../../components/auth/RoleGuard';
import { navFor } from '../../components/nav';
import { TOKEN_KEY } from '../../hooks/api';
import { SessionProvider } from '../../hooks/session';
import { storage } from '../../hooks/storage';
import { CAPABILITIES, can, rolesThatCan } from '../../shared/permissions';
import { ROLE_LABELS, ROLES, type Role } from '../../shared/schemas/common';

/** Signs a user of the role in, as a reload finds them: token and user in storage. */
function signInAs(role: Role) {
  storage.set(TOKEN_KEY, 'test-token');
  storage.set(
    'emberline.user',
    JSON.stringify({ id: `u-${role}`, email: `${role}@org.example`, name: `Test ${role}`, role, organizationId: 'o1' }),
  );
}

function render(role: Role, node: React.ReactNode): string {
  signInAs(role);
  return renderToStaticMarkup(
    <QueryClientProvider client={new QueryClient()}>
      <SessionProvider>{node}</SessionProvider>
    </QueryClientProvider>,
  );
}

const text = (html: string) =>
  html
    .replace(/<[^>]*>/g, ' ')
    .replace(/&#x27;|&#39;/g, "'")
    .replace(/\s+/g, ' ');

afterAll(() => {
  storage.remove(TOKEN_KEY);
  storage.remove('emberline.user');
});

describe('RoleGuard', () => {
  it.each(ROLES)('as %s: the page for every capability the role holds, the refusal for the others', (role) => {
    for (const capability of CAPABILITIES) {
      const html = render(
        role,
        <RoleGuard capability={capability} what="This page">
          <>{'secret page'}</>
        </RoleGuard>,
      );
      if (can(role, capability)) {
        expect([capability, html]).toEqual([capability, 'secret page']);
      } else {
        const t = text(html);
        expect(t).not.toContain('secret page');
        expect(html).toContain('data-testid="role-guard-denied"');
        expect(t).toContain('Not available for your role');
        expect(t).toContain(`This page is for ${rolesInWords(rolesThatCan(capability))}.`);
        expect(t).toContain(`You are signed in as ${ROLE_LABELS[role].toLowerCase()}.`);
        expect(t).toContain('Go to your home screen');
      }
    }
  });

  it('names the roles in words', () => {
    expect(rolesInWords(['admin', 'engineer', 'safety'])).toBe('administrators, engineers and safety officers');
    expect(rolesInWords(['admin', 'safety'])).toBe('administrators and safety officers');
    expect(rolesInWords(['engineer'])).toBe('engineers');
  });
});

describe('guarded sections', () => {
  const sections: [string, () => React.ReactElement][] = [
    ['/attention', AttentionLayout],
    ['/audit-log', AuditLogLayout],
    ['/outbox', OutboxLayout],
    ['/reminders', RemindersLayout],
    ['/settings', SettingsLayout],
    ['/team', TeamLayout],
  ];

  it.each(ROLES)('as %s: a section opens exactly when its navigation item is shown', (role) => {
    const nav = navFor(role).map((i) => i.href as string);
    for (const [href, Layout] of sections) {
      const html = render(role, <Layout />);
      const opens = html.includes('[page]');
      expect({ href, opens, denied: html.includes('role-guard-denied') }).toEqual({
        href,
        opens: nav.includes(href),
        denied: !nav.includes(href),
      });
    }
  });

  it('each section keeps the roles of the guard it replaced', () => {
    // The six role checks the layouts made before the permission map (behaviour unchanged), e.g. the audit log
    // refused only electricians and reminders let in administrators and safety officers.
    const who = (href: string) => ROLES.filter((r) => navFor(r).some((i) => i.href === href));
    expect(who('/team')).toEqual(['admin']);
    expect(who('/settings')).toEqual(['admin']);
    expect(who('/outbox')).toEqual(['admin']);
    expect(who('/reminders')).toEqual(['admin', 'safety']);
    expect(who('/audit-log')).toEqual(['admin', 'engineer', 'safety']);
    expect(who('/attention')).toEqual(['admin', 'engineer', 'safety']);
  });
});
