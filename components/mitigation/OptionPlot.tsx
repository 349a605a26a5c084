import { useQueries } from '@tanstack/react-query';
import React from 'react';
import { StyleSheet } from 'react-native';
import { callApi } from '../../hooks/api';
import { queryKeys } from '../../hooks/queryKeys';
import { fmt } from '../../hooks/units';
import { contract } from '../../shared/api';
import type { Device } from '../../shared/schemas/device';
import type { MitigationOption } from '../../shared/schemas/mitigation';
import type { ModelInput } from '../../shared/schemas/model';
import { TimeCurrentPlot, type TimeCurrentSeries, type TimeCurrentVertical } from '../plot/TimeCurrentPlot';
import { space } from '../theme';
import { Card, T } from '../ui';

type PlacedInput = NonNullable<ModelInput['devices']>[number];

/** The nominal voltage (kV) of the bus a placed device sits at: its branch end's bus, or its source's bus. */
export function placedDeviceKv(
  model: ModelInput,
  placed: Pick<PlacedInput, 'branch' | 'end' | 'source'>,
): number | null {
  const kvOf = (busId: string | undefined) => model.buses?.find((b) => b.id === busId)?.nominalKv ?? null;
  if (placed.branch) {
    const branch = [...(model.transformers ?? []), ...(model.cables ?? []), ...(model.ties ?? [])].find(
      (b) => b.id === placed.branch,
    );
    return branch ? kvOf(placed.end === 'to' ? branch.toBus : branch.fromBus) : null;
  }
  if (placed.source) {
    const source = [...(model.sources ?? []), ...(model.motors ?? [])].find((s) => s.id === placed.source);
    return source ? kvOf(source.bus) : null;
  }
  return null;
}

interface Band {
  id: string;
  label: string;
  device: Device;
  /** kV of the device's currents (referred to the bus's voltage on the plot). */
  kv: number;
}

/**
 * The bands an option moves: the device concerned as it is now, the proposed setting or the added device drawn over
 * it, and the nearest downstream device of its selectivity check; each in the device's own words on the legend
 * ("present", "proposed", "downstream"), so no band is told apart by colour alone.
 */
export function optionBands(model: ModelInput, option: MitigationOption): Band[] {
  const placedOf = (id: string | null) => (id ? model.devices?.find((d) => d.id === id) : undefined);
  const bands: Band[] = [];
  const present = placedOf(option.deviceId);
  const presentKv = present ? placedDeviceKv(model, present) : null;
  if (present && presentKv !== null)
    bands.push({
      id: `${present.id}:present`,
      label: `${present.id} present`,
      device: present.device as Device,
      kv: presentKv,
    });
  for (const op of option.modelPatch) {
    if (op.op === 'replace-device') {
      const placed = placedOf(op.deviceId);
      const kv = placed ? placedDeviceKv(model, placed) : null;
      if (kv !== null)
        bands.push({ id: `${op.deviceId}:proposed`, label: `${op.deviceId} proposed`, device: op.device, kv });
    } else if (op.op === 'add-device') {
      const kv = placedDeviceKv(model, op.placed);
      if (kv !== null)
        bands.push({
          id: `${op.placed.id}:added`,
          label: `${op.placed.id} added (${op.placed.name})`,
          device: op.placed.device,
          kv,
        });
    }
  }
  const downstream = option.selectivity.checks[0];
  const below = downstream ? placedOf(downstream.downstreamDeviceId) : undefined;
  const belowKv = below ? placedDeviceKv(model, below) : null;
  if (below && belowKv !== null)
    bands.push({
      id: `${below.id}:downstream`,
      label: `${below.id} downstream`,
      device: below.device as Device,
      kv: belowKv,
    });
  return bands;
}

/** An option's bands at the bus's voltage, with the bus's arcing currents as vertical lines. */
export function OptionPlot({
  model,
  option,
  busKv,
  arcingKa,
  testID,
}: {
  model: ModelInput | undefined;
  option: MitigationOption;
  busKv: number;
  arcingKa: { full?: number; reduced?: number };
  testID?: string;
}) {
  const bands = model ? optionBands(model, option) : [];
  const curves = useQueries({
    queries: bands.map((b) => {
      const json = JSON.stringify(b.device);
      return {
        queryKey: queryKeys.bandCurves(json),
        queryFn: () => callApi(contract.calc.bandCurves, { body: { device: b.device } }),
        staleTime: Infinity,
      };
    }),
  });
  if (!bands.length) return null;
  const refer = (a: number, kv: number) => (a * kv) / busKv;
  const series: TimeCurrentSeries[] = bands.flatMap((b, i) => {
    const data = curves[i]?.data;
    return data
      ? [
          {
            id: b.id,
            label: b.label,
            min: data.min.map(([a, t]) => [refer(a, b.kv), t] as const),
            max: data.max.map(([a, t]) => [refer(a, b.kv), t] as const),
          },
        ]
      : [];
  });
  const verticals: TimeCurrentVertical[] = [
    ...(arcingKa.full ? [{ currentA: arcingKa.full * 1000, label: 'Full arcing', tone: 'full' as const }] : []),
    ...(arcingKa.reduced
      ? [{ currentA: arcingKa.reduced * 1000, label: 'Reduced arcing', tone: 'reduced' as const }]
      : []),
  ];
  return (
    <Card style={styles.card} testID={testID}>
      <T variant="label">TRIP BANDS AT {fmt(busKv)} KV: THE PROPOSED SETTING OVER THE PRESENT ONE</T>
      <T variant="small">Device currents referred to the bus voltage. Vertical lines: the bus arcing currents.</T>
      <TimeCurrentPlot
        currentUnit="A"
        series={series}
        verticals={verticals}
        showMarkList={false}
        emptyMessage="Loading the bands…"
        testID={testID ? `${testID}-tcc` : undefined}
      />
    </Card>
  );
}

const styles = StyleSheet.create({
  card: { gap: space.sm, padding: space.md },
});
