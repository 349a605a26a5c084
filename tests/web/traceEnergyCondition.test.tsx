/**
 * The bus trace's label values say a condition of the energy — a device acting only for arcs at that bus (an
 * arc-flash relay, a maintenance switch) ends the arc — in the very words the label prints (shared/cautions.ts
 * ONLY_AT_CAUTIONS, the first sentence of the label's caution line), and only at that bus.
 */
import React from 'react';
import { renderToStaticMarkup } from 'react-dom/server';
import { LabelPreview } from '../../components/screens/BusTraceScreen';
import { ONLY_AT_CAUTIONS } from '../../shared/cautions';
import { parseModel, type ModelInput } from '../../shared/schemas/model';
import { createScenarioRunner } from '../../server/engine/study';
import { smallModel } from '../fixtures/smallModel';

const decode = (s: string) => s.replace(/&#x27;|&#39;/g, "'").replace(/&amp;/g, '&');

function conditions(html: string): string[] {
  const out: string[] = [];
  let at = html.indexOf('data-testid="bus-energy-condition"');
  while (at >= 0) {
    const open = html.indexOf('>', at) + 1;
    out.push(decode(html.slice(open, html.indexOf('</div>', open)).replace(/<[^>]*>/g, '')));
    at = html.indexOf('data-testid="bus-energy-condition"', open);
  }
  return out;
}

describe.each([['arc-flash-relay'], ['maintenance-switch']] as const)('trace label values with a %s', (purpose) => {
  const input = smallModel() as ModelInput & { devices: unknown[] };
  input.devices.push({
    id: 'AFR',
    name: 'Switchboard element',
    branch: 'TX',
    end: 'from',
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
  if (!parsed.success) throw new Error('model invalid');
  const runner = createScenarioRunner(parsed.model, {});

  it('shows the label’s words at the bus the device acts for', () => {
    const html = renderToStaticMarkup(<LabelPreview b={runner.runBus('SWBD')} studyMaxArcDurationMs={2000} />);
    expect(conditions(html)).toEqual([ONLY_AT_CAUTIONS[purpose]]);
  });

  it('shows nothing of the kind at another bus', () => {
    const html = renderToStaticMarkup(<LabelPreview b={runner.runBus('MCC')} studyMaxArcDurationMs={2000} />);
    expect(conditions(html)).toEqual([]);
  });
});
