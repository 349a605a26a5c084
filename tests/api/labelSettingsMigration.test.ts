/** Migration 008: stored settings get the label unit order and the default PPE level descriptions. */
import { Organization } from '../../server/db/models';
import { up } from '../../server/db/migrations/008-label-settings';
import { parseSettings } from '../../server/services/organization';
import { makeTestApp, type TestApp } from '../helpers/testApp';

let t: TestApp;
beforeAll(async () => {
  t = await makeTestApp();
});
afterAll(async () => t.close());

it('fills the unit order and the descriptions of default levels, and leaves the organization’s own levels', async () => {
  const org = await Organization.findByPk(t.orgA.id);
  await org!.update({
    settings: JSON.stringify({
      reviewIntervalMonths: 36,
      ppeLevels: [
        { name: 'PPE level 1', maxCalPerCm2: 4 },
        { name: 'Our suit', maxCalPerCm2: 12 },
        { name: 'PPE level 3', maxCalPerCm2: 25, description: 'Our own words' },
      ],
    }),
  });
  await up({ context: t.ctx.db.sequelize.getQueryInterface() });
  await org!.reload();
  const s = parseSettings(org!.settings);
  expect(s.labelUnitOrder).toBe('si-first');
  expect(s.reviewIntervalMonths).toBe(36);
  expect(s.ppeLevels.map((l) => l.description)).toEqual([
    'Arc-rated clothing and face protection, at least 4 cal/cm²',
    undefined,
    'Our own words',
  ]);
});
