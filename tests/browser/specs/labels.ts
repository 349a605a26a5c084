import { PNG } from 'pngjs';
import { displayText, LABEL_STATUS_NOTICES, type LabelDisplay } from '../../../shared/labelDisplay';
import { smallModel } from '../../fixtures/smallModel';
import { readPdf } from '../../helpers/pdfText';
import type { Harness, Spec } from '../harness';
import { clearLocalStorage, DEMO_PASSWORD, DESKTOP, PHONE, pollUntil, assert } from '../harness';

async function authAs(h: Harness, email: string): Promise<Record<string, string>> {
  const signIn = await fetch(`${h.baseUrl}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'Content-Type': 'application/json' },
    body: JSON.stringify({ email, password: DEMO_PASSWORD }),
  });
  const { token } = (await signIn.json()) as { token: string };
  return { Authorization: `Bearer ${token}` };
}

const electricianAuth = (h: Harness) => authAs(h, 'electrician@larkspur.example');

async function api<T>(h: Harness, auth: Record<string, string>, method: string, path: string, body?: unknown) {
  const res = await fetch(`${h.baseUrl}/api${path}`, {
    method,
    headers: { ...auth, ...(body !== undefined ? { 'Content-Type': 'application/json' } : {}) },
    body: body !== undefined ? JSON.stringify(body) : undefined,
  });
  assert(res.status < 300, `${method} ${path}: ${res.status} ${await res.clone().text()}`);
  return (await res.json()) as T;
}

/** Models, runs and approves a study of a new site through the API as the engineer; `reviseFrom` revises one. */
async function approvedStudy(h: Harness, siteId: string, reviseFrom?: string): Promise<string> {
  const eng = await authAs(h, 'engineer@larkspur.example');
  const { id } = reviseFrom
    ? await api<{ id: string }>(h, eng, 'POST', `/studies/${reviseFrom}/revise`)
    : await api<{ id: string }>(h, eng, 'POST', `/sites/${siteId}/studies`, { title: 'Label check study' });
  const env = await api<{ version: number }>(h, eng, 'GET', `/studies/${id}/model`);
  const model = smallModel();
  const utility = model.sources?.[0];
  if (reviseFrom && utility?.kind === 'utility') utility.shortCircuitMva = 400; // a changed utility: new label values
  await api(h, eng, 'PUT', `/studies/${id}/model`, { model, version: env.version });
  await api(h, eng, 'POST', `/studies/${id}/run`);
  await pollUntil(
    async () => (await api<{ status: string }>(h, eng, 'GET', `/studies/${id}/run`)).status === 'done',
    'the study run',
    120_000,
  );
  await api(h, eng, 'POST', `/studies/${id}/submit`);
  await api(h, eng, 'POST', `/studies/${id}/approve`, {
    approverName: 'Rowan Vale',
    licenceNumber: 'PE-55120',
    jurisdiction: 'Oregon',
    confirm: true,
  });
  return id;
}

/**
 * Opens the public check of `code` and waits for its status. The public check is rate-limited per address (120 a
 * minute) and the label specs before this one check many labels: when the page says so, wait out the minute.
 */
async function openCheck(page: import('playwright-core').Page, h: Harness, code: string, status: string) {
  const url = `${h.baseUrl}/l/${code}`;
  await page.goto(url);
  const shown = page.getByTestId('label-status').getByText(status, { exact: true });
  try {
    await shown.waitFor({ timeout: 10_000 });
  } catch {
    assert((await page.getByText(/Too many label checks/).count()) > 0, `the check of ${code} shows ${status}`);
    await page.waitForTimeout(61_000);
    await page.goto(url);
    await shown.waitFor();
  }
}

type LabelWithDisplay = { id: string; code: string; equipmentTag: string; display: LabelDisplay };

/** What the public page shows in the label of `scope` (the first label view, or the current values). */
async function shownOnPage(scope: import('playwright-core').Locator) {
  return {
    energy: await scope.getByTestId('label-energy').innerText(),
    energyUnit: await scope.getByTestId('label-energy-unit').innerText(),
    boundary: await scope.getByTestId('label-boundary').innerText(),
    boundarySecondary: await scope.getByTestId('label-boundary-secondary').innerText(),
    caution: await scope.getByTestId('label-hazard-caution').innerText(),
    arcRating: await scope.getByTestId('label-arc-rating').innerText(),
  };
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
    name: 'the public check page of a label shows the same energy, boundary and caution as its PDF (phone, desktop)',
    run: async (h) => {
      const eng = await authAs(h, 'engineer@larkspur.example');
      const site = await api<{ id: string }>(h, eng, 'POST', '/sites', { name: 'Label check substation' });
      const studyId = await approvedStudy(h, site.id);
      const { labels } = await api<{ labels: LabelWithDisplay[] }>(h, eng, 'GET', `/studies/${studyId}/labels`);
      const label = labels.find((l) => l.equipmentTag === 'SWBD');
      assert(label, 'a label for SWBD');
      const pdfRes = await fetch(`${h.baseUrl}/api/studies/${studyId}/labels.pdf?size=4x6`, { headers: eng });
      const pdf = readPdf(Buffer.from(await pdfRes.arrayBuffer())).text.replace(/\s+/g, '');
      for (const [label_, viewport] of [
        ['phone', PHONE],
        ['desktop', DESKTOP],
      ] as const) {
        const page = await h.newPage(viewport);
        await page.goto(`${h.baseUrl}/sign-in`);
        await clearLocalStorage(page);
        await openCheck(page, h, label.code, 'CURRENT');
        const shown = await shownOnPage(page.getByTestId('label-view').first());
        const d = label.display;
        assert(
          shown.energy === d.incidentEnergy.value,
          `energy on the page ${shown.energy} = ${d.incidentEnergy.value}`,
        );
        assert(shown.energyUnit === d.incidentEnergy.unit, `energy unit ${shown.energyUnit}`);
        assert(shown.boundary === displayText(d.arcFlashBoundary), `boundary on the page ${shown.boundary}`);
        assert(shown.caution === d.hazardCaution.value, `caution on the page: ${shown.caution}`);
        for (const s of [
          `${shown.energy} ${shown.energyUnit}`,
          shown.boundary,
          shown.boundarySecondary,
          shown.caution,
          shown.arcRating,
        ])
          assert(pdf.includes(s.replace(/\s+/g, '')), `the PDF prints "${s}" as the page shows it`);
        assert((await page.getByTestId('caution-unreviewed').count()) === 0, 'no "preliminary" wording');
        await h.shot(page, `public-check-pdf-${label_}`);
        await page.close();
      }
    },
  },
  {
    name: 'a superseded label shows the replacement notice and the current values (phone, desktop)',
    run: async (h) => {
      const eng = await authAs(h, 'engineer@larkspur.example');
      const site = await api<{ id: string }>(h, eng, 'POST', '/sites', { name: 'Superseded label substation' });
      const first = await approvedStudy(h, site.id);
      const old = (await api<{ labels: LabelWithDisplay[] }>(h, eng, 'GET', `/studies/${first}/labels`)).labels.find(
        (l) => l.equipmentTag === 'SWBD',
      );
      assert(old, 'a first label for SWBD');
      const second = await approvedStudy(h, site.id, first);
      const current = (
        await api<{ labels: LabelWithDisplay[] }>(h, eng, 'GET', `/studies/${second}/labels`)
      ).labels.find((l) => l.equipmentTag === 'SWBD');
      assert(current, 'a current label for SWBD');
      for (const [label_, viewport] of [
        ['phone', PHONE],
        ['desktop', DESKTOP],
      ] as const) {
        const page = await h.newPage(viewport);
        await page.goto(`${h.baseUrl}/sign-in`);
        await clearLocalStorage(page);
        await openCheck(page, h, old.code, 'SUPERSEDED');
        const notice = await page.getByTestId('label-status-notice').innerText();
        assert(notice === LABEL_STATUS_NOTICES.superseded, `replacement notice: ${notice}`);
        const shown = await shownOnPage(page.getByTestId('label-current-values'));
        assert(
          shown.energy === current.display.incidentEnergy.value,
          `current energy ${shown.energy} = ${current.display.incidentEnergy.value}`,
        );
        assert(shown.boundary === displayText(current.display.arcFlashBoundary), `current boundary ${shown.boundary}`);
        assert((await page.getByTestId('caution-unreviewed').count()) === 0, 'no "preliminary" wording');
        assert((await page.getByText(/preliminary/i).count()) === 0, 'no "preliminary" anywhere on the page');
        await h.shot(page, `public-check-superseded-${label_}`);
        await page.close();
      }
    },
  },
  {
    name: 'the scan screen accepts a label code typed with spaces as printed (phone)',
    run: async (h) => {
      const code = await demoLabelCode(h, 'USS-1');
      const page = await h.newPage(PHONE);
      await h.signIn(page, 'electrician@larkspur.example');
      await page.getByTestId('home-electrician').waitFor();
      await page.goto(`${h.baseUrl}/scan`);
      // As printed under the QR code, in groups of four, with an O typed for a 0 where there is one.
      await page.getByTestId('label-code').fill(code.replace(/(.{4})(?!$)/g, '$1 ').replace(/0/g, 'O'));
      await page.getByTestId('open-label').click();
      await page.getByTestId('label-status').getByText('CURRENT', { exact: true }).waitFor();
      await page.getByTestId('label-view').waitFor();
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
