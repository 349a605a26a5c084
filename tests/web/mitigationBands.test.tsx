/**
 * The mitigation view's band plot (components/mitigation/OptionPlot.tsx) draws, for an option, the device concerned as
 * it is now, the proposed or added device over it and the nearest downstream device of its selectivity check — each
 * named on the legend in words, and each at the voltage of the bus its branch end sits on (a device at a
 * transformer's "from" end sees the primary current: docs/MODEL-FORMAT.md, Devices), so the plot can refer every
 * current to the faulted bus's voltage. The option comes from the engine's search on the invented demo model.
 */
import { optionBands, placedDeviceKv } from '../../components/mitigation/OptionPlot';
import { mitigate } from '../../server/engine/mitigation';
import { larkspurModel } from '../../server/seed/larkspurModel';
import { modelSchema, type ModelInput } from '../../shared/schemas/model';

const input: ModelInput = larkspurModel();
const model = modelSchema.parse(input);

describe('mitigation band plot: which bands, named and at which voltage', () => {
  const worst = 'USS-1';
  const r = mitigate(model, worst, 8, {});
  const kvOfBus = (id: string) => model.buses.find((b) => b.id === id)!.nominalKv;

  it('draws a maintenance switch over the breaker it acts with, and the downstream device it is checked against', () => {
    const option = r.options.find((o) => o.kind === 'maintenance-mode');
    expect(option).toBeDefined();
    const bands = optionBands(input, option!);
    const added = option!.modelPatch.flatMap((op) => (op.op === 'add-device' ? [op.placed] : []));
    expect(added).toHaveLength(1);
    const check = option!.selectivity.checks[0];
    expect(bands.map((b) => b.label)).toEqual([
      `${option!.deviceId} present`,
      `${added[0].id} added (${added[0].name})`,
      ...(check ? [`${check.downstreamDeviceId} downstream`] : []),
    ]);
    // The added element sits at the same branch end as the breaker it acts with: the same voltage.
    expect(bands[1].kv).toBe(bands[0].kv);
  });

  it('takes each device at the voltage of its branch end', () => {
    for (const placed of input.devices ?? []) {
      if (!placed.branch) continue;
      const branch = [...(input.transformers ?? []), ...(input.cables ?? []), ...(input.ties ?? [])].find(
        (b) => b.id === placed.branch,
      )!;
      const bus = placed.end === 'to' ? branch.toBus : branch.fromBus;
      expect(placedDeviceKv(input, placed)).toBe(kvOfBus(bus));
    }
    // A transformer's primary device (from end) and the secondary main (to end) are at different voltages.
    const tx = (input.transformers ?? [])[0];
    expect(kvOfBus(tx.fromBus)).not.toBe(kvOfBus(tx.toBus));
  });

  it('draws no band for an isolated main (no device moves)', () => {
    // USS-1's governing arc is on the line side of its main, so isolating the main is proposed there.
    expect(r.before.governing.location).toBe('line-side');
    const isolation = r.options.find((o) => o.kind === 'line-side-isolation');
    expect(isolation).toBeDefined();
    expect(isolation!.modelPatch.every((op) => op.op === 'set-main-isolated')).toBe(true);
    expect(optionBands(input, isolation!)).toEqual([]);
  });
});
