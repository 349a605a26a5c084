/**
 * Labels of a study with operating scenarios: each label is the worst scenario at its bus and says which one it is,
 * the same words on the label record, its printed fields and the public check. The choice of the scenario is checked in
 * tests/engine/study-scenarios.test.ts (hand-worked: at 15 MVA the substation mains' short-time pickup is not reached).
 */
import request from 'supertest';
import { solidsBuildingModel } from '../../server/seed/solidsBuildingModel';
import { approveStudy } from '../helpers/flows';
import { bearer, makeTestApp, type TestApp } from '../helpers/testApp';

let t: TestApp;
beforeAll(async () => {
  t = await makeTestApp();
});
afterAll(async () => t.close());

describe('labels from operating scenarios', () => {
  it('take the governing scenario and name it on the label, the results and the public check alike', async () => {
    const eng = bearer(t.orgA.users.engineer.token);
    const site = await request(t.app)
      .post('/api/sites')
      .set(...eng)
      .send({ name: 'Scenario label site' });
    const studyId = await approveStudy(t, site.body.id, solidsBuildingModel());
    const labels = (
      await request(t.app)
        .get(`/api/studies/${studyId}/labels`)
        .set(...eng)
    ).body.labels as {
      equipmentTag: string;
      code: string;
      content: { incidentEnergyCalPerCm2: number; governingCase: string };
      display: { clearedBy: { secondary?: string } };
    }[];
    const shA = labels.find((l) => l.equipmentTag === 'SH-A')!;
    const bus = (
      await request(t.app)
        .get(`/api/studies/${studyId}/results/buses/SH-A`)
        .set(...eng)
    ).body.bus as {
      scenarioId: string;
      incidentEnergyCalPerCm2: number;
      scenarios: { incidentEnergyCalPerCm2?: number }[];
    };
    expect(bus.scenarioId).toBe('util-min');
    // The label's energy is the highest of the four states.
    expect(shA.content.incidentEnergyCalPerCm2).toBe(bus.incidentEnergyCalPerCm2);
    expect(shA.content.incidentEnergyCalPerCm2).toBe(
      Math.max(...bus.scenarios.map((s) => s.incidentEnergyCalPerCm2 ?? 0)),
    );
    expect(shA.content.governingCase).toMatch(/scenario “Utility at minimum”$/);
    expect(shA.display.clearedBy.secondary).toContain('scenario “Utility at minimum”');
    const check = await request(t.app).get(`/api/labels/${shA.code}`);
    expect(check.status).toBe(200);
    expect(check.body.display.clearedBy).toEqual(shA.display.clearedBy);
  });
});
