/**
 * A large model in the editor: a generated plant of 2 001 buses (20 unit substations, 99 panels each) is drawn a
 * window of 100 rows at a time, on a phone (cards) and a wide screen (table); "Show more" adds the next 100, the find
 * box reaches any bus at once, and the system tree is drawn a window at a time too.
 */
import type { Page } from 'playwright-core';
import { generatedPlant } from '../../../server/seed/generatedPlant';
import { assert, DESKTOP, draftStudyWithModel, PHONE, pollUntil, type Spec } from '../harness';

/** Rows (wide) or cards (phone) drawn in the buses section. */
async function drawnBuses(page: Page, wide: boolean): Promise<number> {
  const body = page.getByTestId('model-section-body-buses');
  return body.locator(`[data-testid^="${wide ? 'row-buses-' : 'card-buses-'}"]`).count();
}

export const specs: Spec[] = [
  {
    name: 'engineer opens a 2 001-bus model: a window of rows at a time, show more, find by name (phone and desktop)',
    run: async (h) => {
      const model = generatedPlant(20, 99);
      const buses = model.buses!.length;
      const { id } = await draftStudyWithModel(h, {
        siteName: 'Generated large plant (invented)',
        title: 'Large plant',
        model,
      });
      for (const [label, viewport, wide] of [
        ['phone', PHONE, false],
        ['desktop', DESKTOP, true],
      ] as const) {
        const page = await h.newPage(viewport);
        await h.signIn(page, 'engineer@larkspur.example');
        await page.getByTestId('home-engineer').waitFor();
        await page.goto(`${h.baseUrl}/studies/${id}?tab=model`);
        await page.getByTestId('model-state').getByText('Saved · model version').waitFor({ timeout: 60_000 });
        await page.getByTestId('model-section-buses').click();
        const more = page.getByTestId('model-more-buses');
        await more.waitFor();
        const note = await more.innerText();
        assert(note.includes(`Showing 100 of ${buses.toLocaleString('en-US')} buses`), note);
        assert((await drawnBuses(page, wide)) === 100, `${label}: 100 buses drawn (${await drawnBuses(page, wide)})`);
        await more.scrollIntoViewIfNeeded();
        await h.shot(page, `model-large-${label}`);

        await page.getByTestId('model-more-buses-button').click();
        await page.getByTestId('model-more-buses').getByText('Showing 200 of').waitFor();
        assert((await drawnBuses(page, wide)) === 200, `${label}: 200 buses after "Show more"`);

        // The find box reaches a bus far past the window; the window starts again with a new search.
        await page.getByTestId('model-filter').first().fill('MCC-17-42');
        await pollUntil(async () => (await drawnBuses(page, wide)) === 1, `${label}: one bus found`);
        const found = page
          .getByTestId('model-section-body-buses')
          .locator(`[data-testid^="${wide ? 'row-buses-' : 'card-buses-'}"]`);
        const base = ((await found.getAttribute('data-testid')) ?? '').replace(/^(row|card)-/, '');
        // The id is an input in a table row, the title of a collapsed card.
        const foundId = wide ? await page.getByTestId(`${base}-id`).inputValue() : await found.innerText();
        assert(foundId.includes('MCC-17-42'), `${label}: the bus found is MCC-17-42 (${foundId})`);
        assert((await page.getByTestId('model-more-buses').count()) === 0, 'no "show more" for one bus');
        await page.getByTestId('model-filter').first().fill('');
        await page.getByTestId('model-more-buses').getByText('Showing 100 of').waitFor();
        await page.close();
      }

      // The system tree (the model overview) is drawn a window at a time as well.
      const page = await h.newPage(DESKTOP);
      await h.signIn(page, 'engineer@larkspur.example');
      await page.getByTestId('home-engineer').waitFor();
      await page.goto(`${h.baseUrl}/studies/${id}?tab=model`);
      await page.getByTestId('model-state').getByText('Saved · model version').waitFor({ timeout: 60_000 });
      const treeMore = page.getByTestId('system-tree-more');
      await treeMore.waitFor();
      assert((await treeMore.innerText()).includes('Showing 100 of'), 'the tree shows 100 rows first');
      await page.getByTestId('system-tree-more-button').click();
      await treeMore.getByText('Showing 200 of').waitFor();
      await treeMore.scrollIntoViewIfNeeded();
      await h.shot(page, 'model-large-tree-desktop');
      await page.close();
    },
  },
];
