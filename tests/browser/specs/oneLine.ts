/**
 * The one-line diagram of the demo facility (issue 21): drawn from the model on the study's "One-line" tab, the
 * hazard written at each bus; tapping a bus opens its clearing trace; the search box centres an element. Looked at on
 * a desktop and on a phone (screenshots in tests/screenshots/).
 */
import { axePage, checkA11y } from '../axe';
import type { Harness, Spec } from '../harness';
import type { Page } from 'playwright-core';
import {
  DEMO_PASSWORD,
  DESKTOP,
  PHONE,
  api,
  assert,
  clearLocalStorage,
  draftStudyWithModel,
  engineerToken,
  pollUntil,
  runToDone,
} from '../harness';
import { generatedPlant } from '../../../server/seed/generatedPlant';

/** The latest study of a demo site (`status`: the approved one). */
async function demoStudyId(
  h: Harness,
  siteName = 'Larkspur Valley Water Reclamation Facility',
  status = 'approved',
): Promise<string> {
  const token = await engineerToken(h);
  const { sites } = await api<{ sites: { id: string; name: string }[] }>(h, '/sites', { token });
  const site = sites.find((s) => s.name === siteName);
  if (!site) throw new Error(`${siteName} not found`);
  const { studies } = await api<{ studies: { id: string; status: string }[] }>(h, `/sites/${site.id}/studies`, {
    token,
  });
  const found = studies.find((s) => s.status === status);
  if (!found) throw new Error(`no ${status} study at ${siteName}`);
  return found.id;
}

/** Text on the drawing: exactly an element id, or matching a pattern. */
function svgText(page: Page, text: string | RegExp) {
  const hasText = typeof text === 'string' ? new RegExp(`^${text.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}$`) : text;
  return page.locator('svg text').filter({ hasText });
}

/** A new page signed in as the engineer on the One-line tab of a study, once `first` is drawn. */
async function openOneLine(
  h: Harness,
  viewport: { width: number; height: number },
  studyId: string,
  first: string | RegExp,
): Promise<Page> {
  const page = await h.newPage(viewport);
  await h.signIn(page, 'engineer@larkspur.example');
  await pollUntil(async () => !page.url().includes('/sign-in'), 'the sign-in to finish');
  await page.goto(`${h.baseUrl}/studies/${studyId}?tab=one-line`);
  await svgText(page, first).first().waitFor();
  return page;
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
        const bus = svgText(page, 'USS-1');
        await bus.waitFor().catch(async (e: Error) => {
          await h.shot(page, `one-line-${label}-failed`);
          throw e;
        });
        // The hazard is written, not only coloured: energy in cal/cm² and the signal word.
        await svgText(page, /cal\/cm² · (DANGER|WARNING)$/)
          .first()
          .waitFor();
        await page.getByTestId('one-line-canvas').scrollIntoViewIfNeeded();
        await h.shot(page, `one-line-${label}`);

        // The search box centres an element and marks it.
        await page.getByTestId('one-line-search').fill('MCC-2');
        await page.getByTestId('one-line-find').click();
        await svgText(page, 'MCC-2').waitFor();
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
        const page = await openOneLine(h, viewport, id, 'R-TX2');
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
    name: 'one-line: collapse a subtree → one box naming its highest energy; expand it again (desktop and phone)',
    run: async (h) => {
      const id = await demoStudyId(h);
      for (const [label, viewport] of [
        ['desktop', DESKTOP],
        ['phone', PHONE],
      ] as const) {
        const page = await openOneLine(h, viewport, id, 'USS-1');
        await page.getByTestId('one-line-search').fill('SWBD-1');
        await page.getByTestId('one-line-find').click();
        // SWBD-1 feeds MCC-1 and PP-1, and PP-1 feeds LP-1: three buses under it (the demo model, server/seed).
        await page.getByRole('button', { name: 'Collapse the 3 buses under SWBD-1' }).click();
        await svgText(page, /^3 buses collapsed under SWBD-1$/).waitFor();
        // The box names the highest energy inside, with its signal word and its bus (the approved run's results).
        await svgText(page, /^Highest: [0-9.]+ cal\/cm² · (DANGER|WARNING) at (MCC-1|PP-1|LP-1)$/).waitFor();
        await page.getByTestId('one-line-canvas').scrollIntoViewIfNeeded();
        await h.shot(page, `one-line-${label}-collapsed`);
        // A bus inside is found in the box, which offers to expand.
        await page.getByTestId('one-line-search').fill('LP-1');
        await page.getByTestId('one-line-find').click();
        await page.getByText('LP-1 is inside the collapsed subtree under SWBD-1: expand it to see it.').waitFor();
        assert((await svgText(page, 'LP-1').count()) === 0, 'LP-1 inside the box');
        await page.getByTestId('one-line-expand-found').click();
        await page.getByRole('button', { name: 'Collapse the 3 buses under SWBD-1' }).waitFor();
        await page.getByTestId('one-line-find').click();
        await svgText(page, 'LP-1').waitFor();
        assert((await svgText(page, /collapsed under SWBD-1$/).count()) === 0, 'the box gone once expanded');
        await page.close();
      }
    },
  },
  {
    name: 'one-line: a generated plant of 184 buses opens with its substations collapsed (desktop and phone)',
    run: async (h) => {
      const study = await draftStudyWithModel(h, {
        siteName: 'One-line generated plant (invented)',
        title: 'Generated plant',
        model: generatedPlant(3, 60),
      });
      await runToDone(h, study.id, study.token, 90_000);
      for (const [label, viewport] of [
        ['desktop', DESKTOP],
        ['phone', PHONE],
      ] as const) {
        // Over 150 buses: each substation's 60 feeders are one box, with the highest energy among them.
        const page = await openOneLine(h, viewport, study.id, '60 buses collapsed under SUB-0');
        await svgText(page, /^Highest: [0-9.]+ cal\/cm² · (DANGER|WARNING) at MCC-0-[0-9]+$/)
          .first()
          .waitFor();
        await page.getByTestId('one-line-canvas').scrollIntoViewIfNeeded();
        await h.shot(page, `one-line-${label}-generated`);
        // Expanded: its feeders are drawn, the others stay collapsed.
        await page.getByRole('button', { name: /^60 buses collapsed under SUB-0.* — expand$/ }).click();
        await svgText(page, 'MCC-0-0').waitFor();
        await h.shot(page, `one-line-${label}-generated-expanded`);
        await page.getByTestId('one-line-search').fill('SUB-1');
        await page.getByTestId('one-line-find').click();
        await svgText(page, /^60 buses collapsed under SUB-1$/).waitFor();
        await page.close();
      }
    },
  },
  {
    name: 'one-line: a study with operating scenarios — a scenario’s open tie and stopped sources dashed (phone)',
    run: async (h) => {
      const id = await demoStudyId(h, 'Larkspur Valley Solids Handling Building', 'draft');
      const page = await openOneLine(h, PHONE, id, 'SH-TIE');
      // As written the tie is open: its state is written beside it, not only dashed.
      await svgText(page, 'open').first().waitFor();
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
        await svgText(ax, 'USS-1').waitFor();
        await checkA11y(ax, 'one-line diagram');
      } finally {
        await ax.close();
      }
    },
  },
];
