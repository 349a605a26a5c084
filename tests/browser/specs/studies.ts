import { modelSchema } from '../../../shared/schemas/model';
import { exportModelWorkbook } from '../../../server/io';
import { larkspurModel } from '../../../server/seed/larkspurModel';
import type { Harness } from '../harness';
import { DESKTOP, PHONE } from '../harness';

type Spec = { name: string; run: (h: Harness) => Promise<void> };

function assert(cond: unknown, message: string): asserts cond {
  if (!cond) throw new Error(message);
}

async function openDemoSite(h: Harness, page: import('playwright-core').Page): Promise<void> {
  await page.goto(`${h.baseUrl}/sites`);
  await page.getByText('Larkspur Valley Water Reclamation Facility').first().click();
  await page.getByRole('heading', { name: 'Larkspur Valley Water Reclamation Facility' }).waitFor();
}

export const specs: Spec[] = [
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
      await page
        .getByTestId('model-file-input')
        .setInputFiles({
          name: 'larkspur.xlsx',
          mimeType: 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet',
          buffer: workbook,
        });
      await page.getByText('Imported larkspur.xlsx').waitFor();
      await h.shot(page, 'study-model-desktop');
      await page.getByTestId('study-tab-overview').click();
      await page.getByTestId('run-study').click();
      await page.getByTestId('run-status').getByText('Finished').waitFor({ timeout: 60_000 });
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
];
