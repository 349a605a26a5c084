import fs from 'node:fs';
import { PNG } from 'pngjs';
import type { Harness, Spec } from '../harness';
import { clearLocalStorage, DEMO_PASSWORD, DESKTOP, PHONE, pollUntil, assert } from '../harness';

async function apiAs(h: Harness, email: string): Promise<(path: string, init?: RequestInit) => Promise<Response>> {
  const res = await fetch(`${h.baseUrl}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'Content-Type': 'application/json' },
    body: JSON.stringify({ email, password: DEMO_PASSWORD }),
  });
  assert(res.ok, `sign-in of ${email} answered ${res.status}`);
  const { token } = (await res.json()) as { token: string };
  return (path, init = {}) =>
    fetch(`${h.baseUrl}/api${path}`, {
      ...init,
      headers: { ...(init.headers ?? {}), Authorization: `Bearer ${token}` },
    });
}

function photo(): Buffer {
  const png = new PNG({ width: 48, height: 32 });
  for (let i = 0; i < png.data.length; i += 4) {
    png.data[i] = 40;
    png.data[i + 1] = 110;
    png.data[i + 2] = 160;
    png.data[i + 3] = 255;
  }
  return PNG.sync.write(png);
}

/** The electrician reports a mismatch (with a photo) on a current label of the demo site, through the API. */
async function reportMismatch(h: Harness, text: string): Promise<{ id: string; tag: string }> {
  const api = await apiAs(h, 'electrician@larkspur.example');
  const sites = (await (await api('/sites')).json()) as { sites: { id: string; name: string }[] };
  const site = sites.sites.find((s) => s.name === 'Larkspur Valley Water Reclamation Facility');
  assert(site, 'the demo facility');
  const labels = (await (await api(`/sites/${site.id}/labels?current=1`)).json()) as {
    labels: { code: string; equipmentTag: string }[];
  };
  const label = labels.labels.find((l) => l.equipmentTag === 'MCC-1') ?? labels.labels[0];
  assert(label, 'a current label');
  const form = new FormData();
  form.append('kind', 'setting');
  form.append('text', text);
  form.append('photo', new Blob([new Uint8Array(photo())], { type: 'image/png' }), 'field.png');
  const res = await api(`/labels/${label.code}/reports`, { method: 'POST', body: form });
  assert(res.ok, `report answered ${res.status}`);
  const { id } = (await res.json()) as { id: string };
  return { id, tag: label.equipmentTag };
}

export const specs: Spec[] = [
  ...(
    [
      ['phone', PHONE],
      ['desktop', DESKTOP],
    ] as const
  ).map(([label, viewport]) => ({
    name: `safety officer opens the dashboard and a list (${label})`,
    run: async (h: Harness) => {
      const page = await h.newPage(viewport);
      await h.signIn(page, 'safety@larkspur.example');
      // The safety officer's home leads with the dashboard's counts.
      await page.getByTestId('home-attention').getByTestId('attention-count-open-reports').waitFor();
      await page.goto(`${h.baseUrl}/attention`);
      await page.getByTestId('attention-caution').waitFor();
      const count = Number(
        await page.getByTestId('attention-cards').getByTestId('attention-count-open-reports').innerText(),
      );
      assert(count >= 1, `the demo has open field reports (${count})`);
      await page.getByTestId('attention-sites').waitFor();
      await h.shot(page, `attention-${label}`);
      await page.getByTestId('attention-card-open-reports').click();
      await page.waitForURL(/\/attention\/open-reports/);
      await page.getByTestId(label === 'phone' ? 'attention-cards-list' : 'attention-table').waitFor();
      // The list holds as many rows as its card counted.
      const rows = page.locator('[data-testid^="attention-row-"]');
      assert((await rows.count()) === count, `list rows ${await rows.count()} = card count ${count}`);
      await h.shot(page, `attention-open-reports-${label}`);
      // A row opens its field report.
      await rows.first().click();
      await page.waitForURL(/\/reports\/[^/]+$/);
      await page.getByTestId('report-detail').waitFor();
      await page.close();
    },
  })),
  {
    name: 'the dashboard list downloads as CSV with the same rows (desktop)',
    run: async (h) => {
      const page = await h.newPage(DESKTOP);
      await h.signIn(page, 'safety@larkspur.example');
      await page.getByTestId('home-safety').waitFor();
      await page.goto(`${h.baseUrl}/attention/open-reports`);
      await page.getByTestId('attention-table').waitFor();
      const rows = await page.locator('[data-testid^="attention-row-"]').count();
      const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId('download-csv').click()]);
      assert(/^open-reports.*\.csv$/.test(download.suggestedFilename()), `file name ${download.suggestedFilename()}`);
      const file = await download.path();
      assert(file, 'the download was saved');
      const lines = fs
        .readFileSync(file, 'utf8')
        .replace(/^\uFEFF/, '')
        .trim()
        .split(/\r?\n/);
      assert(lines[0].startsWith('Site,'), `CSV header starts with Site (${lines[0]})`);
      assert(lines[0].includes('Equipment'), `CSV header names the list columns (${lines[0]})`);
      // Report texts have no line breaks here, so one line per row.
      assert(lines.length === rows + 1, `CSV lines ${lines.length} = rows ${rows} + header`);
      await page.close();
    },
  },
  {
    name: 'engineer acknowledges then resolves a field report; the electrician sees the status (desktop + phone)',
    run: async (h) => {
      const report = await reportMismatch(h, 'Breaker long-time pickup dial at 0.9, the label assumes 1.0');
      const page = await h.newPage(DESKTOP);
      await h.signIn(page, 'engineer@larkspur.example');
      await page.getByTestId('home-engineer').waitFor();
      await page.goto(`${h.baseUrl}/reports`);
      await page.getByTestId(`report-${report.id}`).click();
      await page.getByTestId('report-status').getByText('Open', { exact: true }).waitFor();
      // The photo is fetched with the session and shown.
      await page.getByTestId('report-photo-image').waitFor();
      await page.getByTestId('triage-acknowledge').click();
      await page.getByTestId('report-status').getByText('Acknowledged', { exact: true }).waitFor();
      assert(
        (await page.getByTestId('report-acknowledged').innerText()).includes('Sam Ardent'),
        'who acknowledged is shown',
      );
      // Resolving needs a note.
      await page.getByTestId('triage-resolve').click();
      await page.getByText('Say what was done').waitFor();
      await page.getByTestId('triage-note').fill('Dial set to 1.0 as in the study; label checked on site');
      await page.getByTestId('triage-resolve').click();
      await page.getByTestId('report-status').getByText('Resolved', { exact: true }).waitFor();
      await page.getByTestId('report-resolution-note').waitFor();
      await h.shot(page, 'report-resolved-desktop');
      await page.close();

      const phone = await h.newPage(PHONE);
      await h.signIn(phone, 'electrician@larkspur.example');
      await phone.getByTestId('home-electrician').waitFor();
      await phone.goto(`${h.baseUrl}/reports`);
      await phone.getByRole('heading', { name: 'My reports' }).waitFor();
      await phone.getByTestId(`report-${report.id}`).getByText('Resolved', { exact: true }).waitFor();
      await phone.getByTestId(`report-${report.id}`).click();
      await phone.getByText('Dial set to 1.0 as in the study; label checked on site').waitFor();
      assert((await phone.getByTestId('triage-panel').count()) === 0, 'electricians do not triage');
      await h.shot(phone, 'my-reports-phone');
      await phone.close();
    },
  },
  {
    name: 'safety officer filters the audit log, loads every page and exports the same events (desktop)',
    run: async (h) => {
      // More site changes than one page holds (50), made through the API as the engineer.
      const api = await apiAs(h, 'engineer@larkspur.example');
      const sites = (await (await api('/sites')).json()) as {
        sites: { id: string; name: string; address: string | null }[];
      };
      const site = sites.sites[0];
      for (let i = 1; i <= 55; i++) {
        const res = await api(`/sites/${site.id}`, {
          method: 'PUT',
          headers: { 'Content-Type': 'application/json' },
          body: JSON.stringify({ name: site.name, address: site.address ?? '', description: `Walk-down note ${i}` }),
        });
        assert(res.ok, `site update ${i} answered ${res.status}`);
      }
      const page = await h.newPage(DESKTOP);
      await h.signIn(page, 'safety@larkspur.example');
      await page.getByTestId('home-safety').waitFor();
      await page.goto(`${h.baseUrl}/audit-log`);
      await page.getByTestId('audit-count').waitFor();
      await page.getByTestId('audit-action-site.').click();
      const events = page.locator('[data-testid^="audit-event-"]');
      await page.getByTestId('audit-load-more').waitFor();
      assert((await events.count()) === 50, `one page of 50 (${await events.count()})`);
      while (await page.getByTestId('audit-load-more').isVisible()) {
        const before = await events.count();
        await page.getByTestId('audit-load-more').click();
        await pollUntil(async () => (await events.count()) > before, 'the next page of audit events');
      }
      const shown = await events.count();
      assert(shown >= 55, `every site change is listed (${shown})`);
      assert((await page.getByTestId('audit-events').innerText()).includes('site.updated'), 'the action is shown');
      const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId('audit-export').click()]);
      const file = await download.path();
      assert(file, 'the export was saved');
      // Descriptions here have no line breaks: one line per event after the header.
      const lines = fs
        .readFileSync(file, 'utf8')
        .replace(/^\uFEFF/, '')
        .trim()
        .split(/\r?\n/);
      assert(lines.length === shown + 1, `CSV lines ${lines.length} = events shown ${shown} + header`);
      // A search narrows the list.
      await page.getByTestId('audit-search').fill('Walk-down note 55');
      await page
        .getByTestId('audit-count')
        .getByText(/^1 event shown/)
        .waitFor();
      await h.shot(page, 'audit-log-desktop');
      await page.close();
    },
  },
  {
    name: 'safety officer creates a reminder rule and sends it now; the admin reads it in the Outbox (desktop)',
    run: async (h) => {
      const page = await h.newPage(DESKTOP);
      await h.signIn(page, 'safety@larkspur.example');
      await page.getByTestId('home-safety').waitFor();
      await page.goto(`${h.baseUrl}/reminders`);
      await page.getByTestId('reminder-hour').getByText('06:00 UTC').waitFor();
      await page.getByTestId('rule-new').click();
      await page.getByTestId('rule-lists-open-reports').click(); // off: the form starts with it on
      await page.getByTestId('rule-lists-open-reports').click(); // on again
      await page.getByTestId('rule-save').click();
      await page.getByText('Name the rule').waitFor();
      await page.getByTestId('rule-name').fill('Morning round-up');
      await page.getByTestId('rule-emails').fill('not-an-address');
      await page.getByTestId('rule-save').click();
      await page.getByText('Enter a valid e-mail address').waitFor();
      await page.getByTestId('rule-emails').fill('');
      await page.getByTestId('rule-save').click();
      await page.getByTestId('rule-Morning round-up').waitFor();
      await page.getByTestId('rule-send-Morning round-up').click();
      const result = page.getByTestId('send-result');
      await result.getByText(/Morning round-up: sent/).waitFor();
      await page.getByTestId('deliveries').getByText('Morning round-up').first().waitFor();
      await h.shot(page, 'reminders-desktop');
      await page.close();

      const admin = await h.newPage(DESKTOP);
      await h.signIn(admin, 'admin@larkspur.example');
      await admin.getByTestId('home-admin').waitFor();
      await admin.goto(`${h.baseUrl}/outbox`);
      await admin.getByTestId('outbox-local-sink').waitFor();
      await admin.getByTestId('outbox-message').waitFor();
      const text = await admin.getByTestId('outbox-text').innerText();
      assert(/open field report/i.test(text), 'the newest message is the reminder listing the open field reports');
      await admin.close();
    },
  },
  {
    name: 'admin invites someone, sees the invitation pending and the mail in the Outbox; the welcome link sets a password',
    run: async (h) => {
      const email = 'new.hire@larkspur.example';
      const page = await h.newPage(DESKTOP);
      await h.signIn(page, 'admin@larkspur.example');
      await page.getByTestId('home-admin').waitFor();
      await page.goto(`${h.baseUrl}/team`);
      await page.getByTestId('invite-user').click();
      await page.getByTestId('invite-name').fill('Ari Newhire');
      await page.getByTestId('invite-email').fill(email);
      await page.getByTestId('invite-role-electrician').click();
      await page.getByTestId('invite-send').click();
      await page.getByTestId('invite-sent').waitFor();
      await page.getByTestId(`invitation-status-${email}`).getByText('Pending', { exact: true }).waitFor();
      await h.shot(page, 'team-invitations-desktop');

      await page.goto(`${h.baseUrl}/outbox`);
      await page.getByTestId('outbox-local-sink').waitFor();
      await page.getByTestId('outbox-message').waitFor();
      const text = await page.getByTestId('outbox-text').innerText();
      const token = /\/welcome\/([A-Za-z0-9_-]+)/.exec(text)?.[1];
      assert(token, 'the newest message carries the welcome link');
      assert(
        (await page.getByTestId('outbox-message').innerText()).includes(email),
        'the message goes to the invited address',
      );
      await h.shot(page, 'outbox-desktop');
      await page.close();

      const phone = await h.newPage(PHONE);
      await phone.goto(`${h.baseUrl}/sign-in`);
      await clearLocalStorage(phone);
      await phone.goto(`${h.baseUrl}/welcome/${token}`);
      await phone.getByTestId('link-info').getByText(email, { exact: false }).waitFor();
      await phone.getByTestId('link-password').fill('a-new-long-password');
      await phone.getByTestId('link-confirm').fill('a-different-password');
      await phone.getByTestId('link-submit').click();
      await phone.getByText('The two passwords differ').waitFor();
      await phone.getByTestId('link-confirm').fill('a-new-long-password');
      await h.shot(phone, 'welcome-phone');
      await phone.getByTestId('link-submit').click();
      await phone.getByTestId('home-electrician').waitFor();
      // The link is single use.
      await clearLocalStorage(phone);
      await phone.goto(`${h.baseUrl}/welcome/${token}`);
      await phone.getByTestId('link-gone').waitFor();
      await h.shot(phone, 'welcome-used-phone');
      // The new person signs in with the password they chose.
      await phone.goto(`${h.baseUrl}/sign-in`);
      await phone.getByTestId('email').fill(email);
      await phone.getByTestId('password').fill('a-new-long-password');
      await phone.getByTestId('sign-in-submit').click();
      await phone.getByTestId('home-electrician').waitFor();
      await phone.close();
    },
  },
];
