/**
 * A device that acts only for arcs at named buses (`onlyAt`: an arc-flash relay, a maintenance switch) and clears the
 * governing arc: the bus's label values carry the condition as a caution, the run warns (ONLY_AT_DEVICE_CLEARS), and
 * the label's caution line holds it whole on the printed label.
 */
import { PDFDocument } from 'pdf-lib';
import { CAUTIONS, ONLY_AT_CAUTIONS } from '../../shared/cautions';
import { parseModel, type Model, type ModelInput } from '../../shared/schemas/model';
import { createScenarioRunner } from '../../server/engine/study';
import { embedFonts } from '../../server/pdf/fonts';
import { fitText } from '../../server/pdf/text';
import { LABEL_CAUTION } from '../../server/services/labels';
import { smallModel } from '../fixtures/smallModel';

function modelWith(purpose: 'arc-flash-relay' | 'maintenance-switch'): Model {
  const input = smallModel() as ModelInput & { devices: unknown[] };
  input.devices.push({
    id: 'AFR',
    name: 'Switchboard arc-flash relay',
    branch: 'TX',
    end: 'from',
    // 2.5 ms relay time is from memory; the numbers here only need the relay to beat the 5-cycle relay's own element.
    device: {
      kind: 'relay',
      curve: 'IEEE-EI',
      pickupA: 200,
      timeDial: 1,
      instantaneousA: 200,
      instantaneousDelayS: 0.0025,
      breakerCycles: 5,
    },
    onlyAt: { busIds: ['SWBD'], purpose },
  });
  const parsed = parseModel(input);
  if (!parsed.success) throw new Error(JSON.stringify(parsed.issues));
  return parsed.model;
}

describe.each([['arc-flash-relay'], ['maintenance-switch']] as const)('onlyAt %s', (purpose) => {
  const runner = createScenarioRunner(modelWith(purpose), {});
  const swbd = runner.runBus('SWBD');
  const mcc = runner.runBus('MCC');

  it('clears the governing arc at its bus: caution and warning there', () => {
    expect(swbd.clearingDeviceId).toBe('AFR');
    expect(swbd.labelValues?.cautions).toEqual([...CAUTIONS, ONLY_AT_CAUTIONS[purpose]]);
    const w = swbd.warnings.find((x) => x.code === 'ONLY_AT_DEVICE_CLEARS');
    expect(w?.message).toContain('AFR (Switchboard arc-flash relay)');
    expect(w?.message).toContain(purpose === 'arc-flash-relay' ? 'in service' : 'ON');
  });

  it('is not in the picture at another bus: no caution, no warning', () => {
    for (const c of mcc.cases) expect(c.devices.map((d) => d.deviceId)).not.toContain('AFR');
    expect(mcc.labelValues?.cautions).toEqual([...CAUTIONS]);
    expect(mcc.warnings.map((x) => x.code)).not.toContain('ONLY_AT_DEVICE_CLEARS');
  });

  it('fits whole in the label caution lines (4×6 and 4×4 labels: 266 and 270 pt wide, 6 pt, two lines)', async () => {
    const f = await embedFonts(await PDFDocument.create());
    const line = `${ONLY_AT_CAUTIONS[purpose]} ${LABEL_CAUTION}`;
    for (const maxWidth of [266, 270]) {
      const r = fitText(f.text, line, { maxWidth, size: 6, minSize: 6, maxLines: 2 });
      expect(r.truncated).toBe(false);
    }
  });
});
