import type { Page } from 'playwright-core';
import { axePage, axeViolations, describeViolations } from '../axe';
import type { Harness, Spec } from '../harness';
import { clearLocalStorage, DEMO_PASSWORD, DESKTOP, PHONE, pollUntil, assert } from '../harness';

/**
 * Every screen, as the role that uses it, at phone and desktop widths: the document title names the page and axe-core
 * finds no serious or critical violation. Runs in the axe browser context (CSP bypassed for axe only, see ../axe.ts).
 */

async function authAs(h: Harness, email: string): Promise<Record<string, string>> {
  const res = await fetch(`${h.baseUrl}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'Content-Type': 'application/json' },
    body: JSON.stringify({ email, password: DEMO_PASSWORD }),
  });
  assert(res.ok, `sign-in of ${email}: ${res.status}`);
  const { token } = (await res.json()) as { token: string };
  return { Authorization: `Bearer ${token}` };
}

async function get<T>(h: Harness, auth: Record<string, string>, path: string): Promise<T> {
  const res = await fetch(`${h.baseUrl}/api${path}`, { headers: auth });
  assert(res.ok, `GET ${path}: ${res.status}`);
  return (await res.json()) as T;
}

interface Ids {
  siteId: string;
  studyId: string;
  labelCode: string;
  reportId: string;
}

let ids: Ids | undefined;

/** The demo facility, its approved study, a current label and a field report (made here through the API). */
async function demoIds(h: Harness): Promise<Ids> {
  if (ids) return ids;
  const eng = await authAs(h, 'engineer@larkspur.example');
  const { sites } = await get<{ sites: { id: string; name: string }[] }>(h, eng, '/sites');
  const site = sites.find((s) => s.name === 'Larkspur Valley Water Reclamation Facility');
  assert(site, 'the demo facility');
  const { studies } = await get<{ studies: { id: string; status: string }[] }>(h, eng, `/sites/${site.id}/studies`);
  const study = studies.find((s) => s.status === 'approved') ?? studies[0];
  assert(study, 'a study of the demo facility');
  const { labels } = await get<{ labels: { code: string; equipmentTag: string }[] }>(
    h,
    eng,
    `/sites/${site.id}/labels?current=1`,
  );
  const label = labels.find((l) => l.equipmentTag === 'MCC-1') ?? labels[0];
  assert(label, 'a current label');
  const form = new FormData();
  form.append('kind', 'setting');
  form.append('text', 'The breaker setting on site reads differently from the label (accessibility check).');
  const res = await fetch(`${h.baseUrl}/api/labels/${label.code}/reports`, {
    method: 'POST',
    headers: await authAs(h, 'electrician@larkspur.example'),
    body: form,
  });
  assert(res.ok, `field report answered ${res.status}`);
  const { id: reportId } = (await res.json()) as { id: string };
  ids = { siteId: site.id, studyId: study.id, labelCode: label.code, reportId };
  return ids;
}

interface Screen {
  name: string;
  path: (ids: Ids) => string;
  /** What the document title must contain. */
  title: string;
  /** A test id that is there once the screen has its data. */
  ready?: string;
  /** Or a text that is. */
  readyText?: string;
}

const ROLES: { email: string | null; role: string; screens: Screen[] }[] = [
  {
    email: null,
    role: 'signed out',
    screens: [
      { name: 'sign-in', path: () => '/sign-in', title: 'Sign in', ready: 'email' },
      { name: 'forgot password', path: () => '/forgot-password', title: 'Forgot your password', ready: 'reset-email' },
      { name: 'public label check', path: (i) => `/l/${i.labelCode}`, title: 'Label', ready: 'label-status' },
    ],
  },
  {
    email: 'engineer@larkspur.example',
    role: 'engineer',
    screens: [
      { name: 'home', path: () => '/', title: 'Home', ready: 'home-engineer' },
      {
        name: 'sites',
        path: () => '/sites',
        title: 'Sites',
        readyText: 'Larkspur Valley Water Reclamation Facility',
      },
      { name: 'site', path: (i) => `/sites/${i.siteId}`, title: 'Larkspur Valley', ready: 'equipment-USS-1' },
      { name: 'study overview', path: (i) => `/studies/${i.studyId}`, title: 'rev ', ready: 'approval-block' },
      { name: 'study model', path: (i) => `/studies/${i.studyId}?tab=model`, title: 'rev ', ready: 'system-tree' },
      {
        name: 'study results',
        path: (i) => `/studies/${i.studyId}?tab=results`,
        title: 'rev ',
        readyText: 'USS-1',
      },
      {
        name: 'bus trace',
        path: (i) => `/studies/${i.studyId}/bus/USS-1`,
        title: 'USS-1',
        ready: 'trace-sentence',
      },
      {
        name: 'bring a bus down',
        path: (i) => `/studies/${i.studyId}/mitigate/USS-1`,
        title: 'Bring this down',
        ready: 'mitigation-form',
      },
      { name: 'spot check', path: () => '/spot-check', title: 'Spot check' },
      { name: 'devices', path: () => '/devices', title: 'Device library', ready: 'device-Feeder relay, very inverse' },
      { name: 'reports', path: () => '/reports', title: 'Field reports' },
      { name: 'report', path: (i) => `/reports/${i.reportId}`, title: 'Field report', ready: 'report-timeline' },
    ],
  },
  {
    email: 'safety@larkspur.example',
    role: 'safety officer',
    screens: [
      { name: 'home', path: () => '/', title: 'Home', ready: 'home-safety' },
      { name: 'attention', path: () => '/attention', title: 'Needs attention', ready: 'attention-cards' },
      {
        name: 'attention list',
        path: () => '/attention/open-reports',
        title: 'reports',
        ready: 'attention-list-count',
      },
      { name: 'audit log', path: () => '/audit-log', title: 'Audit log', ready: 'audit-search' },
      { name: 'labels', path: (i) => `/labels?site=${i.siteId}`, title: 'Labels', ready: 'label-row-MCC-1' },
      { name: 'label', path: (i) => `/labels/${i.labelCode}`, title: 'MCC-1' },
      { name: 'scan', path: () => '/scan', title: 'Check a label', ready: 'label-code' },
      { name: 'reminders', path: () => '/reminders', title: 'Reminders' },
      { name: 'more', path: () => '/more', title: 'Menu' },
    ],
  },
  {
    email: 'electrician@larkspur.example',
    role: 'electrician',
    screens: [
      { name: 'home', path: () => '/', title: 'Home', ready: 'home-electrician' },
      { name: 'my reports', path: () => '/reports', title: 'My reports' },
      // A section of another role: the guard's page (components/auth/RoleGuard).
      { name: 'not available', path: () => '/audit-log', title: 'Not available', ready: 'role-guard-denied' },
      {
        name: 'device type',
        path: () => '/devices',
        title: 'Feeder relay',
        ready: 'device-Feeder relay, very inverse',
      },
    ],
  },
  {
    email: 'admin@larkspur.example',
    role: 'admin',
    screens: [
      { name: 'home', path: () => '/', title: 'Home', ready: 'home-admin' },
      { name: 'team', path: () => '/team', title: 'Team' },
      { name: 'outbox', path: () => '/outbox', title: 'Outbox' },
      { name: 'settings', path: () => '/settings', title: 'Organization settings', ready: 'attention-settings' },
      { name: 'account', path: () => '/account', title: 'Account', ready: 'account-details' },
    ],
  },
];

/** Waits for the screen's marker, then for every loading line to go. */
async function settle(page: Page, ready?: string, readyText?: string): Promise<void> {
  // Generous: the machine running the suite may be busy.
  const timeout = 45_000;
  if (ready) await page.getByTestId(ready).first().waitFor({ timeout });
  else if (readyText) await page.getByText(readyText).first().waitFor({ timeout });
  else await page.getByRole('heading').first().waitFor({ timeout });
  await pollUntil(async () => (await page.getByTestId('loading').count()) === 0, 'loading to finish');
  await page.waitForTimeout(300);
}

/** Starts from a signed-out session (the axe context is shared by the specs), then signs in when there is a user. */
async function signIn(h: Harness, page: Page, email: string | null): Promise<void> {
  await page.goto(`${h.baseUrl}/sign-in`);
  await clearLocalStorage(page);
  await page.goto(`${h.baseUrl}/sign-in`);
  if (!email) return;
  await page.getByTestId('email').fill(email);
  await page.getByTestId('password').fill(DEMO_PASSWORD);
  await page.getByTestId('sign-in-submit').click();
  await page.getByTestId('side-nav').or(page.getByTestId('bottom-tabs')).first().waitFor();
}

export const specs: Spec[] = ROLES.flatMap(({ email, role, screens }) =>
  (
    [
      ['phone', PHONE],
      ['desktop', DESKTOP],
    ] as const
  ).map(([size, viewport]) => ({
    name: `a11y: every ${role} screen has a title and no serious axe violation (${size})`,
    run: async (h: Harness) => {
      const i = await demoIds(h);
      const page = await axePage(viewport);
      const failures: string[] = [];
      try {
        await signIn(h, page, email);
        for (const screen of screens) {
          try {
            await page.goto(`${h.baseUrl}${screen.path(i)}`);
            await settle(page, screen.ready, screen.readyText);
            if (screen.name === 'device type') {
              await page.getByTestId('device-Feeder relay, very inverse').click();
              await settle(page, 'tcc');
            }
          } catch (e) {
            failures.push(`${screen.name}: did not load (${(e as Error).message.split('\n')[0]})`);
            continue;
          }
          if (['study model', 'audit log', 'devices', 'attention list', 'settings'].includes(screen.name)) {
            await h.shot(page, `a11y-${screen.name.replace(/ /g, '-')}-${size}`);
          }
          if (screen.name === 'home' && email) {
            await h.shot(page, `a11y-${role.replace(/ /g, '-')}-home-${size}`);
            // The navigation's links are named by their label alone (the glyph is hidden) and mark the current page.
            const home = page
              .getByRole('navigation', { name: 'Main' })
              .getByRole('link', { name: 'Home', exact: true });
            const current = await home.getAttribute('aria-current');
            if (current !== 'page') failures.push(`home: the Home link's aria-current is ${current}, not "page"`);
          }
          const title = await page.title();
          if (!title.toLowerCase().includes(screen.title.toLowerCase()) || !title.endsWith(' · Emberline')) {
            failures.push(`${screen.name}: document title "${title}" should name "${screen.title}" and Emberline`);
          }
          const violations = await axeViolations(page);
          if (violations.length) failures.push(describeViolations(`${role} ${screen.name} (${size})`, violations));
        }
      } finally {
        await page.close();
      }
      if (failures.length) {
        console.log(failures.join('\n'));
        throw new Error(`${failures.length} screen(s) failed the accessibility checks (listed above)`);
      }
    },
  })),
);
