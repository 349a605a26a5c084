/**
 * The model editor's Scenarios section (issue 19): an engineer adds an operating scenario, takes the utility out of
 * service, saves, and finds it again after a reload; the section is looked at on a desktop and on a phone.
 */
import { larkspurModel } from '../../../server/seed/larkspurModel';
import type { ModelInput } from '../../../shared/schemas/model';
import type { Harness, Spec } from '../harness';
import { DESKTOP, PHONE, api, assert, draftStudyWithModel } from '../harness';

/** A draft study of its own holding the demo's model with a normally open tie between its two MCCs (a tie to show). */
async function draftStudy(h: Harness): Promise<{ id: string; token: string }> {
  const model: ModelInput = {
    ...larkspurModel(),
    ties: [{ id: 'TIE-1', name: 'MCC tie', fromBus: 'MCC-1', toBus: 'MCC-2', closed: false }],
  };
  return draftStudyWithModel(h, { siteName: 'Scenario test plant (invented)', title: 'Operating scenarios', model });
}

export const specs: Spec[] = [
  {
    name: 'engineer adds an operating scenario with the utility out of service, saves, and finds it after a reload',
    run: async (h) => {
      const { id, token } = await draftStudy(h);
      const page = await h.newPage(DESKTOP);
      await h.signIn(page, 'engineer@larkspur.example');
      await page.getByTestId('home-engineer').waitFor();
      await page.goto(`${h.baseUrl}/studies/${id}?tab=model`);
      const state = page.getByTestId('model-state');
      await state.getByText('Saved · model version').waitFor();

      await page.getByTestId('model-section-scenarios').click();
      await page.getByTestId('model-add-scenarios').click();
      await page.getByTestId('scenario-0-name').fill('Utility out, generator alone');
      // The base values are the placeholders; nothing is written until a field is changed.
      const fault = page.getByTestId('scenario-source-UTIL-fault');
      assert((await fault.getAttribute('placeholder')) === 'base: 250 MVA', 'the base fault level as placeholder');
      assert((await fault.inputValue()) === '', 'no fault-level override until one is typed');
      await page.getByTestId('scenario-source-UTIL-service-out').click();
      await page.getByTestId('scenario-0-changes').getByText('UTIL out of service').waitFor();
      await state.getByText('Unsaved changes').waitFor();
      await page.getByTestId('scenario-tie-TIE-1-state-closed').click();
      await page.getByTestId('scenario-0-changes').getByText('UTIL out of service · TIE-1 closed').waitFor();
      await page.getByTestId('scenario-source-UTIL').scrollIntoViewIfNeeded();
      await h.shot(page, 'model-scenarios-desktop');

      await page.getByTestId('save-model').click();
      await state.getByText('Saved · model version').waitFor();

      // After a reload (no draft left), the saved model has the scenario.
      await page.reload();
      await state.getByText('Saved · model version').waitFor();
      await page.getByTestId('model-section-scenarios').click();
      await page.getByTestId('scenario-row-0').getByText('Utility out, generator alone').waitFor();
      await page.getByTestId('scenario-summary-0').getByText('UTIL out of service · TIE-1 closed').waitFor();
      const out = page.getByTestId('scenario-source-UTIL-service-out');
      assert((await out.getAttribute('aria-checked')) === 'true', 'the utility is out of service after the reload');

      const saved = await api<{ model: ModelInput }>(h, `/studies/${id}/model`, { token });
      const scenarios = saved.model.scenarios ?? [];
      assert(scenarios.length === 1, `one scenario saved (${scenarios.length})`);
      assert(scenarios[0].name === 'Utility out, generator alone', `its name (${scenarios[0].name})`);
      assert(
        JSON.stringify(scenarios[0].sources) === JSON.stringify({ UTIL: { inService: false } }),
        `only the utility's service is overridden (${JSON.stringify(scenarios[0].sources)})`,
      );
      assert(JSON.stringify(scenarios[0].ties) === JSON.stringify({ 'TIE-1': { closed: true } }), 'the tie closed');

      // The phone: one card per scenario, opened to its elements.
      await page.setViewportSize(PHONE);
      await page.getByTestId('scenario-row-0').waitFor();
      if ((await page.getByTestId('scenario-detail-0').count()) === 0) await page.getByTestId('scenario-row-0').click();
      await page.getByTestId('scenario-source-UTIL-xr').waitFor();
      await page.getByTestId('scenario-source-UTIL').scrollIntoViewIfNeeded();
      await h.shot(page, 'model-scenarios-phone');
      await page.close();
    },
  },
];
