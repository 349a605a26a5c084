/**
 * The one-line diagram of the demo facility (issue 21): drawn from the model on the study's "One-line" tab, the
 * hazard written at each bus; tapping a bus opens its clearing trace; the search box centres an element. Looked at on
 * a desktop and on a phone (screenshots in tests/screenshots/).
 */
import { axePage, checkA11y } from '../axe';
import type { Harness, Spec } from '../harness';
import { DEMO_PASSWORD, DESKTOP, PHONE, clearLocalStorage, pollUntil } from '../harness';

async function api<T>(h: Harness, path: string, token?: string, body?: unknown): Promise<T> {
  const res = await fetch(`${h.baseUrl}/api${path}`, {
    method: body ? 'POST' : 'GET',
    headers: {
      ...(token ? { Authorization: `Bearer ${token}` } : {}),
      ...(body ? { 'Content-Type': 'application/json' } : {}),
    },
    body: body ? JSON.stringify(body) : undefined,
  });
  if (!res.ok) throw new Error(`${path}: ${res.status} ${await res.text()}`);
  return (await res.json()) as T;
}

/** The latest study of a demo site (`status`: the approved one). */
async function demoStudyId(
  h: Harness,
  siteName = 'Larkspur Valley Water Reclamation Facility',
  status = 'approved',
): Promise<string> {
  const { token } = await api<{ token: string }>(h, '/auth/sign-in', undefined, {
    email: 'engineer@larkspur.example',
    password: DEMO_PASSWORD,
  });
  const { sites } = await api<{ sites: { id: string; name: string }[] }>(h, '/sites', token);
  const site = sites.find((s) => s.name === siteName);
  if (!site) throw new Error(`${siteName} not found`);
  const { studies } = await api<{ studies: { id: string; status: string }[] }>(h, `/sites/${site.id}/studies`, token);
  const found = studies.find((s) => s.status === status);
  if (!found) throw new Error(`no ${status} study at ${siteName}`);
  return found.id;
}

export const specs: Spec[] = [
  {
    name: 'one-line: the demo facility drawn with its hazards; tap a bus → its trace (desktop and phone)',
    run: async (h) => {
      const id = await demoStudyId(h);
      for (const [label, viewport] of [
        ['desktop', DESKTOP],
        ['phone', PHONE],
      ] as const) {
        const page = await h.newPage(viewport);
        await h.signIn(page, 'engineer@larkspur.example');
        await pollUntil(async () => !page.url().includes('/sign-in'), 'the sign-in to finish');
        await page.goto(`${h.baseUrl}/studies/${id}?tab=one-line`);
        const bus = page.locator('svg text').filter({ hasText: /^USS-1$/ });
        await bus.waitFor().catch(async (e: Error) => {
          await h.shot(page, `one-line-${label}-failed`);
          throw e;
        });
        // The hazard is written, not only coloured: energy in cal/cm² and the signal word.
        await page
          .locator('svg text')
          .filter({ hasText: /cal\/cm² · (DANGER|WARNING)$/ })
          .first()
          .waitFor();
        await page.getByTestId('one-line-canvas').scrollIntoViewIfNeeded();
        await h.shot(page, `one-line-${label}`);

        // The search box centres an element and marks it.
        await page.getByTestId('one-line-search').fill('MCC-2');
        await page.getByTestId('one-line-find').click();
        await page
          .locator('svg text')
          .filter({ hasText: /^MCC-2$/ })
          .waitFor();
        // Without a pointer: the element found offers its trace as a button.
        await page.getByRole('button', { name: 'Open the clearing trace of MCC-2' }).waitFor();
        await h.shot(page, `one-line-${label}-found`);

        // Tap the bus USS-1 (its label) → its clearing trace.
        await page.getByTestId('one-line-search').fill('USS-1');
        await page.getByTestId('one-line-find').click();
        const box = await bus.boundingBox();
        if (!box) throw new Error('USS-1 not drawn');
        await page.mouse.click(box.x + box.width / 2, box.y + box.height / 2);
        await pollUntil(async () => page.url().includes('/bus/USS-1'), 'the trace of USS-1 to open');
        await page.getByText('USS-1').first().waitFor();
        await page.close();
      }
    },
  },
  {
    name: 'one-line: tap a device → its settings and band (desktop and phone)',
    run: async (h) => {
      const id = await demoStudyId(h);
      for (const [label, viewport] of [
        ['desktop', DESKTOP],
        ['phone', PHONE],
      ] as const) {
        const page = await h.newPage(viewport);
        await h.signIn(page, 'engineer@larkspur.example');
        await pollUntil(async () => !page.url().includes('/sign-in'), 'the sign-in to finish');
        await page.goto(`${h.baseUrl}/studies/${id}?tab=one-line`);
        await page
          .locator('svg text')
          .filter({ hasText: /^R-TX2$/ })
          .waitFor();
        // Centre it (on a phone it may lie outside the first view), then tap it.
        await page.getByTestId('one-line-search').fill('R-TX2');
        await page.getByTestId('one-line-find').click();
        // Each device in view is a button named for it (the relay R-TX2 of the demo: a relay with its breaker).
        const device = page.getByRole('button', { name: 'Device R-TX2, relay — open its band' });
        await device.waitFor();
        await device.click();
        await pollUntil(async () => page.url().includes('device=R-TX2'), 'the band of R-TX2 to open');
        await page.getByTestId('device-settings-title').filter({ hasText: 'Settings of R-TX2' }).waitFor();
        await page.getByTestId('device-settings-plot').waitFor();
        await page.getByTestId('device-settings-band').scrollIntoViewIfNeeded();
        await h.shot(page, `one-line-${label}-device-band`);
        await page.close();
      }
    },
  },
  {
    name: 'one-line: a study with operating scenarios — a scenario’s open tie and stopped sources dashed (phone)',
    run: async (h) => {
      const id = await demoStudyId(h, 'Larkspur Valley Solids Handling Building', 'draft');
      const page = await h.newPage(PHONE);
      await h.signIn(page, 'engineer@larkspur.example');
      await pollUntil(async () => !page.url().includes('/sign-in'), 'the sign-in to finish');
      await page.goto(`${h.baseUrl}/studies/${id}?tab=one-line`);
      await page
        .locator('svg text')
        .filter({ hasText: /^SH-TIE$/ })
        .waitFor();
      // As written the tie is open: its state is written beside it, not only dashed.
      await page
        .locator('svg text')
        .filter({ hasText: /^open$/ })
        .first()
        .waitFor();
      const choice = page.getByTestId('one-line-scenario');
      await choice.waitFor();
      // Before: the open tie is the only dashed element (its blade); on the generator alone both utilities are out.
      const dashedUtility = page.locator('svg rect[stroke-dasharray]');
      const before = await dashedUtility.count();
      await choice.getByRole('radio', { name: 'Standby generator alone, tie closed' }).click();
      await page.getByText(/Dashed: out of service or open in scenario "Standby generator alone/).waitFor();
      await pollUntil(async () => (await dashedUtility.count()) >= before + 2, 'both utility sources dashed');
      await page.getByTestId('one-line-canvas').scrollIntoViewIfNeeded();
      await h.shot(page, 'one-line-phone-scenario');
      await page.close();
    },
  },
  {
    name: 'one-line: no serious accessibility violation on the One-line tab (axe)',
    run: async (h) => {
      const id = await demoStudyId(h);
      const ax = await axePage(DESKTOP);
      try {
        await ax.goto(`${h.baseUrl}/sign-in`);
        await clearLocalStorage(ax);
        await ax.goto(`${h.baseUrl}/sign-in`);
        await ax.getByTestId('email').fill('engineer@larkspur.example');
        await ax.getByTestId('password').fill(DEMO_PASSWORD);
        await ax.getByTestId('sign-in-submit').click();
        await ax.getByTestId('side-nav').waitFor();
        await ax.goto(`${h.baseUrl}/studies/${id}?tab=one-line`);
        await ax
          .locator('svg text')
          .filter({ hasText: /^USS-1$/ })
          .waitFor();
        await checkA11y(ax, 'one-line diagram');
      } finally {
        await ax.close();
      }
    },
  },
];
