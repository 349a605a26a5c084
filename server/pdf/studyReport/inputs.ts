/** Section 3, inputs: buses and equipment, transformers, cables, motors, ties and protective devices. */
import type { Device } from '../../../shared/schemas/device';
import { DEVICE_KIND_LABELS } from '../../../shared/schemas/deviceLibrary';
import { deviceSettingParts } from '../../../shared/deviceSummary';
import type { Model, PlacedDevice } from '../../../shared/schemas/model';
import type { StudyResults } from '../../../shared/schemas/studyResults';
import { num } from './texts';
import type { ReportWriter } from './writer';

/** Where a placed device sits, in words. */
export function deviceLocation(model: Model, d: PlacedDevice): string {
  if (d.source) return `${d.source} (source)`;
  const branch =
    model.transformers.find((t) => t.id === d.branch) ??
    model.cables.find((c) => c.id === d.branch) ??
    model.ties.find((t) => t.id === d.branch);
  if (!branch) return d.branch ?? '—';
  const bus = d.end === 'from' ? branch.fromBus : branch.toBus;
  return `${d.branch}, ${d.end} end (at ${bus})`;
}

/** The key settings of a device, in one line. */
export function deviceSettings(device: Device): string {
  return deviceSettingParts(device).join(', ');
}

export function renderInputs(w: ReportWriter, results: StudyResults, model: Model): void {
  w.heading('3. Inputs');
  w.heading('Buses and equipment', 2);
  w.table(
    [
      { header: 'Bus', weight: 1.1, mono: true },
      { header: 'kV', weight: 0.6, align: 'right', mono: true },
      { header: 'Class', weight: 1.6 },
      { header: 'Electrode config.', weight: 0.8 },
      { header: 'Gap, mm', weight: 0.7, align: 'right', mono: true },
      { header: 'Working distance, mm', weight: 0.9, align: 'right', mono: true },
      { header: 'Enclosure H × W × D, mm', weight: 1.8, mono: true },
      { header: 'Main isolated', weight: 0.7 },
    ],
    results.buses.map((b) => {
      const e = b.equipment;
      const t = (field: string, text: string) => (e?.typicalValuesUsed.includes(field) ? `${text} *` : text);
      return [
        b.busId,
        num(b.nominalKv, 4),
        e?.class ?? '—',
        e ? t('electrodeConfig', e.electrodeConfig) : '—',
        e ? t('gapMm', num(e.gapMm)) : '—',
        e ? t('workingDistanceMm', num(e.workingDistanceMm, 4)) : '—',
        e?.enclosureMm
          ? t(
              'enclosureMm',
              `${num(e.enclosureMm.height, 4)} × ${num(e.enclosureMm.width, 4)} × ${num(e.enclosureMm.depth, 4)}`,
            )
          : '—',
        e ? t('mainIsolated', e.mainIsolated ? 'Yes' : 'No') : '—',
      ];
    }),
    {
      note: '* typical value of the equipment class (IEEE 1584-2018 typical gaps, enclosure sizes and working distances), not entered for this bus.',
    },
  );
  w.heading('Transformers', 2);
  w.table(
    [
      { header: 'Transformer', weight: 1.2, mono: true },
      { header: 'From → to', weight: 1.8, mono: true },
      { header: 'kVA', weight: 0.8, align: 'right', mono: true },
      { header: 'kV', weight: 1.2, mono: true },
      { header: '%Z', weight: 0.6, align: 'right', mono: true },
      { header: 'X/R', weight: 0.6, align: 'right', mono: true },
    ],
    model.transformers.map((t) => [
      t.id,
      `${t.fromBus} → ${t.toBus}`,
      num(t.kva, 4),
      `${num(t.primaryKv, 4)} / ${num(t.secondaryKv, 4)}`,
      num(t.impedancePct),
      t.xr === undefined ? 'typical' : num(t.xr),
    ]),
  );
  w.heading('Cables', 2);
  w.table(
    [
      { header: 'Cable', weight: 1.2, mono: true },
      { header: 'From → to', weight: 1.8, mono: true },
      { header: 'Length, m', weight: 0.8, align: 'right', mono: true },
      { header: 'Sets', weight: 0.5, align: 'right', mono: true },
      { header: 'Conductor', weight: 2.2 },
    ],
    model.cables.map((c) => [
      c.id,
      `${c.fromBus} → ${c.toBus}`,
      num(c.lengthM, 4),
      String(c.sets),
      c.size !== undefined
        ? `${c.size} ${c.material ?? ''}, ${c.conduit ?? ''} conduit (NEC Chapter 9 Table 9)`
        : `R ${num(c.rOhmPerKm)} Ω/km, X ${num(c.xOhmPerKm)} Ω/km`,
    ]),
  );
  if (model.motors.length > 0) {
    w.heading('Motors', 2);
    w.table(
      [
        { header: 'Motor', weight: 1.2, mono: true },
        { header: 'Name', weight: 2 },
        { header: 'Bus', weight: 1.1, mono: true },
        { header: 'Rating', weight: 1.2, mono: true },
        { header: 'kV', weight: 0.7, align: 'right', mono: true },
      ],
      model.motors.map((m) => [
        m.id,
        m.name ?? '',
        m.bus,
        m.hp !== undefined ? `${num(m.hp, 4)} hp` : `${num(m.kva, 4)} kVA`,
        num(m.kv, 4),
      ]),
    );
  }
  if (model.ties.length > 0) {
    w.heading('Ties', 2);
    w.table(
      [
        { header: 'Tie', weight: 1.2, mono: true },
        { header: 'From → to', weight: 2, mono: true },
        { header: 'State', weight: 1 },
      ],
      model.ties.map((t) => [t.id, `${t.fromBus} → ${t.toBus}`, t.closed ? 'Closed' : 'Open']),
    );
  }
  w.heading('Protective devices', 2);
  w.table(
    [
      { header: 'Device', weight: 1.1, mono: true },
      { header: 'Name', weight: 1.5 },
      { header: 'Location', weight: 1.5 },
      { header: 'Kind', weight: 1.4 },
      { header: 'Key settings', weight: 3.2 },
    ],
    model.devices.map((d) => [
      d.id,
      d.name ?? '',
      deviceLocation(model, d),
      DEVICE_KIND_LABELS[d.device.kind],
      deviceSettings(d.device),
    ]),
  );
}
