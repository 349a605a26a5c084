import { PNG } from 'pngjs';
import type { Harness } from '../harness';
import { clearLocalStorage, DEMO_PASSWORD, DESKTOP, PHONE } from '../harness';

type Spec = { name: string; run: (h: Harness) => Promise<void> };

function assert(cond: unknown, message: string): asserts cond {
  if (!cond) throw new Error(message);
}

async function electricianAuth(h: Harness): Promise<Record<string, string>> {
  const signIn = await fetch(`${h.baseUrl}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'Content-Type': 'application/json' },
    body: JSON.stringify({ email: 'electrician@larkspur.example', password: DEMO_PASSWORD }),
  });
  const { token } = (await signIn.json()) as { token: string };
  return { Authorization: `Bearer ${token}` };
}

/** The id of the demo's main site (the facility), read through the API. */
async function facilityId(h: Harness): Promise<string> {
  const auth = await electricianAuth(h);
  const sites = (await (await fetch(`${h.baseUrl}/api/sites`, { headers: auth })).json()) as {
    sites: { id: string; name: string }[];
  };
  const site = sites.sites.find((s) => s.name === 'Larkspur Valley Water Reclamation Facility');
  assert(site, 'the demo facility site');
  return site.id;
}

/** A current label code of the demo facility, read through the API as the electrician would see it. */
async function demoLabelCode(h: Harness, tag: string): Promise<string> {
  const auth = await electricianAuth(h);
  const labels = (await (
    await fetch(`${h.baseUrl}/api/sites/${await facilityId(h)}/labels?current=1`, { headers: auth })
  ).json()) as { labels: { code: string; equipmentTag: string }[] };
  const label = labels.labels.find((l) => l.equipmentTag === tag);
  assert(label, `a current label for ${tag}`);
  return label.code;
}

function photo(): Buffer {
  const png = new PNG({ width: 64, height: 48 });
  for (let i = 0; i < png.data.length; i += 4) {
    png.data[i] = 200;
    png.data[i + 1] = 120;
    png.data[i + 2] = 40;
    png.data[i + 3] = 255;
  }
  return PNG.sync.write(png);
}

export const specs: Spec[] = [
  ...(
    [
      ['phone', PHONE],
      ['desktop', DESKTOP],
    ] as const
  ).map(([label, viewport]) => ({
    name: `electrician previews labels and makes a PDF of them with progress (${label})`,
    run: async (h: Harness) => {
      const page = await h.newPage(viewport);
      await h.signIn(page, 'electrician@larkspur.example');
      await page.getByTestId('home-electrician').waitFor();
      await page.goto(`${h.baseUrl}/labels?site=${await facilityId(h)}`);
      await page.getByTestId('label-row-USS-1').waitFor();
      await page.getByTestId('label-row-USS-1').getByRole('button').first().click();
      await page.getByTestId('select-all').click();
      await page.getByTestId('label-size-letter').click();
      await page.getByTestId('make-pdf').click();
      await page.getByTestId('download-pdf').waitFor({ timeout: 60_000 });
      await h.shot(page, `labels-${label}`);
      await page.close();
    },
  })),
  {
    name: 'electrician types a code, sees the label and marks it installed with a photo (phone)',
    run: async (h) => {
      const code = await demoLabelCode(h, 'MCC-2');
      const page = await h.newPage(PHONE);
      await h.signIn(page, 'electrician@larkspur.example');
      await page.getByTestId('home-electrician').waitFor();
      await page.goto(`${h.baseUrl}/scan`);
      await page.getByTestId('label-code').fill(code.toLowerCase().replace(/(.{4})(?!$)/g, '$1-'));
      await h.shot(page, 'scan-phone');
      await page.getByTestId('open-label').click();
      await page.getByTestId('label-status').getByText('CURRENT', { exact: true }).waitFor();
      await page.getByTestId('label-view').waitFor();
      await h.shot(page, 'label-before-install-phone');
      await page.getByTestId('mark-installed').click();
      await page.getByText('Add a photo of the installed label').waitFor();
      await page
        .locator('[data-testid="install-photo"]')
        .setInputFiles({ name: 'mcc2.png', mimeType: 'image/png', buffer: photo() });
      await page.getByTestId('mark-installed').click();
      await page
        .getByTestId('label-status')
        .getByText(/^Installed \d{4}-\d{2}-\d{2} by /)
        .waitFor();
      await h.shot(page, 'label-installed-phone');
      await page.close();
    },
  },
  {
    name: 'the public check page needs no sign-in and says the label is current (phone)',
    run: async (h) => {
      const code = await demoLabelCode(h, 'USS-1');
      const page = await h.newPage(PHONE);
      await page.goto(`${h.baseUrl}/sign-in`);
      await clearLocalStorage(page);
      await page.goto(`${h.baseUrl}/l/${code}`);
      await page.getByTestId('label-status').getByText('CURRENT', { exact: true }).waitFor();
      const word = await page.getByTestId('label-signal-word').first().innerText();
      assert(word === 'DANGER', `USS-1 carries DANGER (${word})`);
      await h.shot(page, 'public-check-phone');
      await page.goto(`${h.baseUrl}/l/0000000000000000`);
      await page.getByTestId('label-not-found').waitFor();
      await h.shot(page, 'public-check-unknown-phone');
      await page.close();
    },
  },
  {
    name: 'electrician reports a mismatch (desktop)',
    run: async (h) => {
      const code = await demoLabelCode(h, 'PP-1');
      const page = await h.newPage(DESKTOP);
      await h.signIn(page, 'electrician@larkspur.example');
      await page.getByTestId('home-electrician').waitFor();
      await page.goto(`${h.baseUrl}/labels/${code}`);
      await page.getByTestId('report-kind-setting').click();
      await page.getByTestId('report-text').fill('Feeder breaker instantaneous dial is at LO, the label assumes 10 ×');
      await page.getByTestId('send-report').click();
      await page.getByText('Report sent').waitFor();
      await h.shot(page, 'label-report-desktop');
      await page.close();
    },
  },
];
