import { modelSchema } from '../../../shared/schemas/model';
import { exportModelWorkbook } from '../../../server/io';
import { generatedPlant } from '../../../server/bench/study';
import { larkspurModel } from '../../../server/seed/larkspurModel';
import type { Harness, Spec } from '../harness';
import { DEMO_PASSWORD, DESKTOP, PHONE, pollUntil, SHOTS, assert } from '../harness';

async function openDemoSite(h: Harness, page: import('playwright-core').Page): Promise<void> {
  await page.goto(`${h.baseUrl}/sites`);
  await page.getByText('Larkspur Valley Water Reclamation Facility').first().click();
  await page.getByRole('heading', { name: 'Larkspur Valley Water Reclamation Facility' }).waitFor();
}

/** A draft of a generated plant (2 substations, 80 MCC buses: 82 labelled buses) run through the API; its id. */
async function generatedStudy(h: Harness): Promise<string> {
  const api = async <T = unknown>(
    path: string,
    init: { method?: string; body?: unknown; token?: string } = {},
  ): Promise<T> => {
    const res = await fetch(`${h.baseUrl}/api${path}`, {
      method: init.method ?? 'GET',
      headers: {
        ...(init.token ? { Authorization: `Bearer ${init.token}` } : {}),
        ...(init.body ? { 'Content-Type': 'application/json' } : {}),
      },
      body: init.body ? JSON.stringify(init.body) : undefined,
    });
    if (!res.ok) throw new Error(`${path}: ${res.status} ${await res.text()}`);
    return (await res.json()) as T;
  };
  const { token } = await api<{ token: string }>('/auth/sign-in', {
    method: 'POST',
    body: { email: 'engineer@larkspur.example', password: DEMO_PASSWORD },
  });
  // A site of its own, so no demo site gets a draft revision that another spec would trip over.
  const site = await api<{ id: string }>('/sites', {
    method: 'POST',
    token,
    body: { name: 'Generated test plant (invented)' },
  });
  const study = await api<{ id: string }>(`/sites/${site.id}/studies`, {
    method: 'POST',
    token,
    body: { title: 'Generated plant, paged results' },
  });
  const env = await api<{ version: number }>(`/studies/${study.id}/model`, { token });
  await api(`/studies/${study.id}/model`, {
    method: 'PUT',
    token,
    body: { model: generatedPlant(2, 40), version: env.version },
  });
  await api(`/studies/${study.id}/run`, { method: 'POST', token });
  await pollUntil(
    async () => (await api<{ status: string }>(`/studies/${study.id}/run`, { token })).status === 'done',
    'the generated plant run',
    60_000,
  );
  return study.id;
}

export const specs: Spec[] = [
  {
    name: 'engineer pages through the results of a generated plant, sorts and filters them (phone and desktop)',
    run: async (h) => {
      const studyId = await generatedStudy(h);
      for (const [label, viewport] of [
        ['phone', PHONE],
        ['desktop', DESKTOP],
      ] as const) {
        const page = await h.newPage(viewport);
        await h.signIn(page, 'engineer@larkspur.example');
        await page.getByTestId('home-engineer').waitFor();
        await page.goto(`${h.baseUrl}/studies/${studyId}?tab=results`);
        // 82 buses by bus id, 50 a page: MCC-0-*, MCC-1-* (80), then SUB-0 and SUB-1 on page 2.
        await page.getByTestId('result-MCC-0-0').waitFor();
        assert((await page.getByTestId('results-page').innerText()).includes('Page 1 of 2'), 'two pages');
        assert((await page.getByTestId('result-SUB-0').count()) === 0, 'SUB-0 is not on page 1');
        assert(
          (await page.getByTestId('results-count').innerText()).includes('82 of 82 buses · showing 1–50'),
          'count of the whole study',
        );
        await h.shot(page, `study-results-paged-${label}`);
        await page.getByTestId('results-pager').scrollIntoViewIfNeeded();
        await page.screenshot({ path: `${SHOTS}/study-results-pager-${label}.png` });
        await page.getByTestId('results-next').click();
        await page.getByTestId('result-SUB-0').waitFor();
        assert((await page.getByTestId('results-page').innerText()).includes('Page 2 of 2'), 'on page 2');
        // The substations' switchgear: no device clears before the 2 s cap, in the label's words.
        assert(
          (await page.getByTestId('result-SUB-0').innerText()).includes(
            'No device clears within 2 s — arc duration limited to 2 s',
          ),
          'SUB-0: no device clears within the cap',
        );
        assert((await page.getByTestId('result-MCC-0-0').count()) === 0, 'MCC-0-0 is not on page 2');
        // Energy, highest first: the substations' switchgear (its arc capped at 2 s) comes first, on page 1.
        // On a phone the controls are folded away until asked for.
        if (label === 'phone') {
          assert((await page.getByTestId('sort').count()) === 0, 'phone: controls folded');
          await page.getByTestId('results-filters-toggle').click();
        }
        await page.getByTestId('sort').getByText('Energy', { exact: true }).click();
        await page.getByTestId('result-SUB-0').waitFor();
        await pollUntil(
          async () => (await page.getByTestId('results-page').innerText()).includes('Page 1 of 2'),
          'back to page 1 after a new sort',
        );
        // A band with no bus in it: the empty notice, no rows.
        await page.getByTestId('band').getByText('8–40', { exact: true }).click();
        await page.getByText('No bus matches these filters.').waitFor();
        await h.shot(page, `study-results-paged-empty-${label}`);
        await page.close();
      }
    },
  },
  ...(
    [
      ['phone', PHONE],
      ['desktop', DESKTOP],
    ] as const
  ).map(([label, viewport]) => ({
    name: `safety officer reads the approved study, its results and a clearing trace (${label})`,
    run: async (h: Harness) => {
      const page = await h.newPage(viewport);
      await h.signIn(page, 'safety@larkspur.example');
      await page.getByTestId('home-safety').waitFor();
      await openDemoSite(h, page);
      await page.getByTestId('equipment-USS-1').waitFor();
      await h.shot(page, `site-${label}`);
      await page.getByTestId('study-1').click();
      await page.getByTestId('approval-block').waitFor();
      await h.shot(page, `study-overview-${label}`);
      await page.getByTestId('study-tab-results').click();
      await page.getByTestId('result-USS-1').waitFor();
      await h.shot(page, `study-results-${label}`);
      await page.getByTestId('result-USS-1').click();
      const sentence = page.getByTestId('trace-sentence');
      await sentence.waitFor();
      const text = await sentence.innerText();
      assert(
        text.includes('line side of the main') && text.includes('R-TX1'),
        `governing line-side case cleared by R-TX1 (${text})`,
      );
      await page.getByTestId('caution-no-ppe').waitFor();
      // The label preview says what ends the governing arc in the label's words: at USS-1 no device clears it
      // before the study's 2 s cap (the trace's arc duration is capped), so "Arc clearing", not "Cleared by".
      const cleared = await page.getByTestId('bus-label-values').innerText();
      assert(
        cleared.includes('Arc clearing') &&
          cleared.includes('No device clears within 2 s — arc duration limited to 2 s — reduced arcing current') &&
          !/cleared by|before the cap/i.test(cleared),
        `label preview: no device clears within the cap ${JSON.stringify(cleared)}`,
      );
      await page.waitForTimeout(800);
      await h.shot(page, `trace-USS-1-${label}`);
      await page.close();
    },
  })),
  {
    name: 'engineer starts a new revision, imports the workbook, runs with progress and opens a clearing trace (desktop)',
    run: async (h) => {
      const page = await h.newPage(DESKTOP);
      await h.signIn(page, 'engineer@larkspur.example');
      await page.getByTestId('home-engineer').waitFor();
      await openDemoSite(h, page);
      await page.getByTestId('study-1').click();
      await page.getByTestId('revise').click();
      await page.getByText('rev 2').first().waitFor();
      await page.getByTestId('study-tab-model').click();
      const workbook = await exportModelWorkbook(
        modelSchema.parse({ ...larkspurModel(), name: 'Larkspur, revision 2' }),
      );
      await page.getByTestId('model-file-input').setInputFiles({
        name: 'larkspur.xlsx',
        mimeType: 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet',
        buffer: workbook,
      });
      await page.getByText('Imported larkspur.xlsx').waitFor();
      await h.shot(page, 'study-model-desktop');
      await page.getByTestId('study-tab-overview').click();
      await page.getByTestId('run-study').click();
      await page.getByTestId('run-status').getByText('Finished').waitFor({ timeout: 60_000 });
      // The changes from the approved revision: only the model's name differs, so no bus changed.
      const summary = page.getByTestId('compare-summary');
      await summary.getByText('1 model change').waitFor();
      assert(
        (await summary.innerText()).includes('0 buses higher, 0 lower'),
        `compare summary: ${await summary.innerText()}`,
      );
      await page.getByTestId('compare-element-model-model').getByText('name: Larkspur Valley').waitFor();
      await page.getByTestId('compare-panel').scrollIntoViewIfNeeded();
      await h.shot(page, 'study-compare-desktop');
      await page.getByTestId('study-tab-results').click();
      await page.getByTestId('result-MCC-1').click();
      await page.getByTestId('trace-sentence').waitFor();
      assert((await page.getByTestId('trace-sentence').innerText()).includes('CB-MCC1'), 'MCC-1 cleared by its feeder');
      await page.waitForTimeout(800);
      await h.shot(page, 'trace-MCC-1-desktop');
      await page.close();
    },
  },
  {
    name: 'engineer submits revision 2 and approves it; revision 1 is superseded (phone)',
    run: async (h) => {
      const page = await h.newPage(PHONE);
      await h.signIn(page, 'engineer@larkspur.example');
      await page.getByTestId('home-engineer').waitFor();
      await openDemoSite(h, page);
      await page.getByTestId('study-2').click();
      await page.getByTestId('submit-review').click();
      await page.getByTestId('approve-form').waitFor();
      await page.getByTestId('approve').click();
      await page.getByText('Confirm that you reviewed the results').waitFor();
      await page.getByTestId('licence-number').fill('PE-DEMO-0417');
      await page.getByTestId('jurisdiction').fill('Larkspur Valley (fictional)');
      await page.getByTestId('confirm-review').click();
      await h.shot(page, 'approve-phone');
      await page.getByTestId('approve').click();
      await page.getByTestId('approval-block').waitFor();
      await openDemoSite(h, page);
      await page.getByTestId('study-1').getByText('Superseded').waitFor();
      await page.close();
    },
  },
  {
    name: 'engineer edits the model, switches study tabs and back: the edit and "Unsaved changes" stay; leaving asks first',
    run: async (h) => {
      const page = await h.newPage(DESKTOP);
      await h.signIn(page, 'engineer@larkspur.example');
      await page.getByTestId('home-engineer').waitFor();
      // The pump station's approved study: a new revision is a draft the engineer may edit.
      await page.goto(`${h.baseUrl}/sites`);
      await page.getByText('Larkspur Valley Raw Water Pump Station').first().click();
      await page.getByRole('heading', { name: 'Larkspur Valley Raw Water Pump Station' }).waitFor();
      await page.getByTestId('study-1').click();
      await page.getByTestId('revise').click();
      await page.getByText('rev 2').first().waitFor();
      const studyUrl = page.url().split('?')[0];
      await page.getByTestId('study-tab-model').click();
      const state = page.getByTestId('model-state');
      await state.getByText('Saved · model version').waitFor();
      const edited = 'Pump station, edited before a tab switch';
      await page.getByTestId('model-section-general').click();
      await page.getByTestId('model-name').fill(edited);
      await state.getByText('Unsaved changes').waitFor();

      // Another tab unmounts the model panel; coming back finds the edit from the draft store.
      await page.getByTestId('study-tab-overview').click();
      await page.getByTestId('run-panel').waitFor();
      assert((await page.getByTestId('model-name').count()) === 0, 'the model panel is gone on the overview tab');
      await page.getByTestId('study-tab-model').click();
      await state.getByText('Unsaved changes').waitFor();
      await page.getByTestId('model-section-general').click();
      const value = await page.getByTestId('model-name').inputValue();
      assert(value === edited, `the edit survives the tab switch (${value})`);
      await state.scrollIntoViewIfNeeded();
      await h.shot(page, 'model-unsaved-after-tab-switch-desktop');
      await page.setViewportSize(PHONE);
      await page.getByTestId('study-tab-results').click();
      await page.getByTestId('study-tab-model').click();
      await state.getByText('Unsaved changes').waitFor();
      await page.getByTestId('model-section-general').click();
      assert((await page.getByTestId('model-name').inputValue()) === edited, 'the edit survives on the phone layout');
      await state.scrollIntoViewIfNeeded();
      await h.shot(page, 'model-unsaved-after-tab-switch-phone');
      await page.setViewportSize(DESKTOP);

      const answers: string[] = [];
      let accept = false;
      const onDialog = (d: import('playwright-core').Dialog) => {
        answers.push(`${d.type()}: ${d.message()}`);
        void (accept ? d.accept() : d.dismiss());
      };
      page.on('dialog', onDialog);
      // An export (a download through the API client) leaves nothing: no question, the edit stays.
      const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId('export-json').click()]);
      assert(download.suggestedFilename().endsWith('.json'), `exported JSON (${download.suggestedFilename()})`);
      assert(answers.length === 0, `no question for a download (${answers.join('; ')})`);
      await state.getByText('Unsaved changes').waitFor();

      // A link out of the study asks; staying keeps the page and the edit.
      await page.getByTestId('side-nav').getByRole('link', { name: 'Sites' }).click();
      await pollUntil(async () => answers.length === 1, 'the confirm before leaving the study');
      assert(answers[0].startsWith('confirm: ') && answers[0].includes('unsaved changes'), `asked (${answers[0]})`);
      await page.waitForTimeout(300);
      assert(page.url().startsWith(studyUrl), `stayed on the study (${page.url()})`);
      await state.getByText('Unsaved changes').waitFor();

      // Closing the page while the draft is dirty: the browser's own leave prompt.
      accept = true;
      const closed = page.close({ runBeforeUnload: true });
      await pollUntil(async () => answers.length === 2, 'the prompt before closing the page');
      assert(answers[1].startsWith('beforeunload'), `beforeunload prompt (${answers[1]})`);
      await closed;
      page.off('dialog', onDialog);

      // Leaving after agreeing discards the draft: the study shows the saved model again.
      const again = await h.newPage(DESKTOP);
      await again.goto(`${studyUrl}?tab=model`);
      await again.getByTestId('model-section-general').click();
      await again.getByTestId('model-name').fill(edited);
      await again.getByTestId('model-state').getByText('Unsaved changes').waitFor();
      again.on('dialog', (d) => void d.accept());
      await again.getByTestId('side-nav').getByRole('link', { name: 'Sites' }).click();
      await again.getByRole('heading', { name: 'Sites' }).first().waitFor();
      // Back in the browser's history (no page load: the draft store would keep an edit that was not discarded).
      await again.goBack();
      await again.getByTestId('model-state').getByText('Saved · model version').waitFor();
      await again.getByTestId('model-section-general').click();
      assert((await again.getByTestId('model-name').inputValue()) !== edited, 'the discarded edit is gone');
      await again.close();
    },
  },
];
