import path from 'node:path';
import type { Page } from 'playwright-core';
import { larkspurModel } from '../../../server/seed/larkspurModel';
import { axePage, checkA11y } from '../axe';
import type { Harness, Spec } from '../harness';
import {
  api,
  assert,
  clearLocalStorage,
  DEMO_PASSWORD,
  DESKTOP,
  draftStudyWithModel,
  PHONE,
  pollUntil,
  runToDone,
  SHOTS,
} from '../harness';

/**
 * "Bring this down" (issue 22): from the worst bus's clearing trace an engineer asks for options under a target, reads
 * the maintenance-switch option with its selectivity sentence and applies it, landing on the new draft revision.
 */

interface Approved {
  token: string;
  siteId: string;
  studyId: string;
  worstBusId: string;
}

let approved: Approved | undefined;

/**
 * A site of its own with the demo facility's model, run and approved, and no open revision (so applying an option is
 * allowed and no demo site gets a draft another spec would trip over). Its worst bus is read from the results.
 */
async function approvedDemoCopy(h: Harness): Promise<Approved> {
  if (approved) return approved;
  const study = await draftStudyWithModel(h, {
    siteName: 'Mitigation test copy of the reclamation facility (invented)',
    title: 'Demo model, approved for mitigation',
    model: larkspurModel(),
  });
  const { token } = study;
  await runToDone(h, study.id, token, 60_000);
  await api(h, `/studies/${study.id}/submit`, { method: 'POST', token });
  await api(h, `/studies/${study.id}/approve`, {
    method: 'POST',
    token,
    body: { approverName: 'Test Engineer', licenceNumber: 'PE-0000', jurisdiction: 'Test State', confirm: true },
  });
  const page = await api<{ rows: { busId: string; incidentEnergyCalPerCm2?: number }[] }>(
    h,
    `/studies/${study.id}/results?sort=energy&order=desc`,
    { token },
  );
  const worst = page.rows[0];
  assert(worst?.incidentEnergyCalPerCm2 !== undefined, 'the demo model has a bus with an energy');
  approved = { token, siteId: study.siteId, studyId: study.id, worstBusId: worst.busId };
  return approved;
}

/** The app shell is there once the sign-in went through (side navigation on a desktop, tabs on a phone). */
async function signedIn(page: Page): Promise<void> {
  await page.getByTestId('side-nav').or(page.getByTestId('bottom-tabs')).first().waitFor();
}

/**
 * A picture of the whole page: the app scrolls inside its main region, so the viewport is grown to that region's
 * content for the shot (at most 12 000 px), then put back.
 */
async function wholeShot(page: Page, name: string): Promise<void> {
  const viewport = page.viewportSize() ?? DESKTOP;
  const main = page.getByRole('main').first();
  // Grown until nothing is left to scroll (the plots below may still be laying out after the first growth).
  for (let i = 0; i < 4; i++) {
    const hidden = await main.evaluate((el) => el.scrollHeight - el.clientHeight);
    const now = page.viewportSize() ?? viewport;
    if (hidden <= 0 || now.height >= 12_000) break;
    await page.setViewportSize({ width: now.width, height: Math.min(12_000, now.height + hidden) });
    await page.waitForTimeout(400);
  }
  // h.shot grows the page to at most 6000 px; the options of a phone page run longer, so the picture is taken here.
  await page.screenshot({ path: path.join(SHOTS, `${name}.png`) });
  await page.setViewportSize(viewport);
}

/** Opens the worst bus's trace, "Bring this down", and finds the options for 8 cal/cm² (the default target). */
async function findOptions(h: Harness, page: Page, a: Approved): Promise<void> {
  await page.goto(`${h.baseUrl}/studies/${a.studyId}/bus/${encodeURIComponent(a.worstBusId)}`);
  await page.getByTestId('trace-energy').waitFor();
  await page.getByTestId('bring-down').click();
  await page.getByTestId('mitigation-target').waitFor();
  assert((await page.getByTestId('mitigation-target').inputValue()) === '8', 'the target starts at 8 cal/cm²');
  await pollUntil(async () => (await page.title()).startsWith('Bring this down'), 'the page title');
  await page.getByTestId('mitigation-find').click();
  // Progress while the engine computes, then the options (the progress may already be gone on a quick answer).
  await pollUntil(
    async () =>
      (await page.getByTestId('mitigation-progress').count()) > 0 ||
      (await page.getByTestId('mitigation-options').count()) > 0,
    'the progress or the options',
  );
  await page.getByTestId('mitigation-options').waitFor({ timeout: 120_000 });
}

export const specs: Spec[] = [
  {
    name: 'mitigation: a bad target is refused under its field, the options for the worst bus (phone)',
    run: async (h) => {
      const a = await approvedDemoCopy(h);
      const page = await h.newPage(PHONE);
      await h.signIn(page, 'engineer@larkspur.example');
      await signedIn(page);
      await page.goto(`${h.baseUrl}/studies/${a.studyId}/mitigate/${encodeURIComponent(a.worstBusId)}`);
      await page.getByTestId('mitigation-target').fill('0');
      await page.getByTestId('mitigation-find').click();
      await page.getByText('The target must be above zero').waitFor();
      assert((await page.getByTestId('mitigation-options').count()) === 0, 'no options for a refused target');

      await findOptions(h, page, a);
      await page.getByTestId('mitigation-before').waitFor();
      await pollUntil(async () => (await page.getByText('Loading the bands…').count()) === 0, 'the band plots to load');
      await page.waitForTimeout(500);
      await h.shot(page, 'mitigation-phone');
      await wholeShot(page, 'mitigation-phone-whole');
      const before = Number(
        await page
          .getByTestId('before-energy')
          .innerText()
          .then((t) => t.split(' ')[0]),
      );
      assert(before > 8, `the worst bus is above the target (${before})`);
      const option = page.getByTestId('option-maintenance-mode');
      await option.waitFor();
      const sentence = (await page.getByTestId('option-maintenance-mode-selectivity-sentence').innerText()).trim();
      assert(sentence.length > 20, `the maintenance option states its selectivity: "${sentence}"`);
      const verdict = await page.getByTestId('option-maintenance-mode-selectivity-verdict').innerText();
      assert(/selectivity|overlap|downstream/i.test(verdict), `the verdict is in words: "${verdict}"`);
      const after = Number((await page.getByTestId('option-maintenance-mode-after').innerText()).split(' ')[0]);
      assert(after < before, `the maintenance switch lowers the energy (${before} → ${after})`);
      await page.getByTestId('mitigation-caution').getByText('qualified', { exact: false }).first().waitFor();
      await page.getByTestId('cautions').waitFor();
      // The band plot of the option draws the proposed setting over the present one (legend names both).
      await page.getByTestId('option-maintenance-mode-plot').getByText('present').first().waitFor();
      await page.getByTestId('option-maintenance-mode-plot').getByText('added', { exact: false }).first().waitFor();
      await page.close();
    },
  },
  {
    name: 'mitigation: engineer applies the maintenance switch to a new revision and lands on the draft (desktop)',
    run: async (h) => {
      const a = await approvedDemoCopy(h);
      const page = await h.newPage(DESKTOP);
      await h.signIn(page, 'engineer@larkspur.example');
      await signedIn(page);
      await findOptions(h, page, a);
      await pollUntil(async () => (await page.getByText('Loading the bands…').count()) === 0, 'the band plots to load');
      await page.waitForTimeout(500);
      await h.shot(page, 'mitigation-desktop');
      await wholeShot(page, 'mitigation-desktop-whole');
      await page.getByTestId('option-maintenance-mode').waitFor();

      await page.getByTestId('option-maintenance-mode-apply').click();
      await pollUntil(async () => /\/studies\/[^/]+$/.test(new URL(page.url()).pathname), 'the new revision', 60_000);
      const newId = new URL(page.url()).pathname.split('/').pop()!;
      assert(newId !== a.studyId, 'a new revision, not the approved one');
      await page.getByText('rev 2').first().waitFor();
      const revised = await api<{ status: string; parentStudyId: string | null; revision: number }>(
        h,
        `/studies/${newId}`,
        { token: a.token },
      );
      assert(revised.status === 'draft', `the new revision is a draft (${revised.status})`);
      assert(revised.parentStudyId === a.studyId, 'started from the approved revision');
      await h.shot(page, 'mitigation-applied-desktop');

      // With that draft open, applying again from the approved revision is refused and names the open revision.
      await findOptions(h, page, a);
      await page.getByTestId('option-maintenance-mode-apply').click();
      const error = page.getByTestId('option-maintenance-mode-apply-error');
      await error.waitFor();
      await page.getByTestId('option-maintenance-mode-open-revision').getByText('Go to revision 2').waitFor();
      await error.scrollIntoViewIfNeeded();
      await h.shot(page, 'mitigation-conflict-desktop');

      // The approved revision's report with the mitigation appendix, from the study overview.
      await page.goto(`${h.baseUrl}/studies/${a.studyId}`);
      await page.getByTestId('report-mitigation-above').fill('8');
      const download = page.waitForEvent('download', { timeout: 120_000 });
      await page.getByTestId('report-mitigation-download').click();
      const file = await download;
      assert((await file.failure()) === null, 'the report with the appendix downloads');
      assert(file.suggestedFilename().endsWith('.pdf'), `a PDF (${file.suggestedFilename()})`);
      await page.close();
    },
  },
  {
    name: 'mitigation: no serious accessibility violation with the options shown (axe, phone)',
    run: async (h) => {
      const a = await approvedDemoCopy(h);
      const ax = await axePage(PHONE);
      try {
        await ax.goto(`${h.baseUrl}/sign-in`);
        await clearLocalStorage(ax);
        await ax.goto(`${h.baseUrl}/sign-in`);
        await ax.getByTestId('email').fill('engineer@larkspur.example');
        await ax.getByTestId('password').fill(DEMO_PASSWORD);
        await ax.getByTestId('sign-in-submit').click();
        await ax.getByTestId('bottom-tabs').waitFor();
        await ax.goto(`${h.baseUrl}/studies/${a.studyId}/mitigate/${encodeURIComponent(a.worstBusId)}`);
        await ax.getByTestId('mitigation-find').click();
        await ax.getByTestId('mitigation-options').waitFor({ timeout: 120_000 });
        await checkA11y(ax, 'mitigation options');
      } finally {
        await ax.close();
      }
    },
  },
  {
    name: 'mitigation: a safety officer reads the trace without "Bring this down" (phone)',
    run: async (h) => {
      const a = await approvedDemoCopy(h);
      const page = await h.newPage(PHONE);
      await h.signIn(page, 'safety@larkspur.example');
      await signedIn(page);
      await page.goto(`${h.baseUrl}/studies/${a.studyId}/bus/${encodeURIComponent(a.worstBusId)}`);
      await page.getByTestId('trace-energy').waitFor();
      assert((await page.getByTestId('bring-down').count()) === 0, 'no "Bring this down" for the safety officer');
      await page.goto(`${h.baseUrl}/studies/${a.studyId}/mitigate/${encodeURIComponent(a.worstBusId)}`);
      await page.getByTestId('role-guard-denied').waitFor();
      await page.close();
    },
  },
];
