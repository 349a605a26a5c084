/** Section 1, scope: what the report covers, the buses studied and the sources. */
import { formatVoltage } from '../format';
import type { StudyReportInput } from './input';
import { num } from './texts';
import type { ReportWriter } from './writer';

export function renderScope(w: ReportWriter, input: StudyReportInput): void {
  const { study, results, model, site } = input;
  w.newPage();
  w.heading('1. Scope');
  const studied = new Set(results.buses.map((b) => b.busId));
  const notStudied = model.buses.filter((b) => !studied.has(b.id));
  w.paragraph(
    `This report covers the arc-flash study of ${site.name} for ${input.organizationName}: ${results.buses.length} bus${results.buses.length === 1 ? '' : 'es'} of the system model “${model.name}” (model version ${study.modelVersion}), ${model.sources.length} source${model.sources.length === 1 ? '' : 's'}, ${model.transformers.length} transformer${model.transformers.length === 1 ? '' : 's'}, ${model.cables.length} cable${model.cables.length === 1 ? '' : 's'}, ${model.motors.length} motor${model.motors.length === 1 ? '' : 's'} and ${model.devices.length} protective device${model.devices.length === 1 ? '' : 's'}.` +
      (notStudied.length > 0
        ? ` Buses without equipment data are part of the network but not labelled: ${notStudied.map((b) => b.id).join(', ')}.`
        : ''),
  );
  w.heading('Buses studied', 2);
  w.table(
    [
      { header: 'Bus', weight: 1.2, mono: true },
      { header: 'Name', weight: 2.4 },
      { header: 'Nominal voltage', weight: 1, align: 'right', mono: true },
      { header: 'Equipment class', weight: 2 },
      { header: 'Status', weight: 0.8 },
    ],
    results.buses.map((b) => [
      b.busId,
      b.busName,
      formatVoltage(b.nominalKv * 1000),
      b.equipment?.class ?? '—',
      b.status === 'ok' ? 'Studied' : 'Error',
    ]),
  );
  w.heading('Sources', 2);
  w.table(
    [
      { header: 'Source', weight: 1.2, mono: true },
      { header: 'Name', weight: 2 },
      { header: 'Kind', weight: 1 },
      { header: 'Bus', weight: 1.1, mono: true },
      { header: 'Rating', weight: 2.2, mono: true },
      { header: 'X/R', weight: 0.6, align: 'right', mono: true },
    ],
    model.sources.map((s) => [
      s.id,
      s.name ?? '',
      s.kind === 'utility' ? 'Utility' : 'Generator',
      s.bus,
      s.kind === 'utility'
        ? s.shortCircuitMva !== undefined
          ? `${num(s.shortCircuitMva)} MVA short circuit`
          : `${num(s.shortCircuitKa)} kA short circuit`
        : `${num(s.kva)} kVA, ${num(s.kv)} kV, X"d ${num(s.subtransientPct)} %` +
          `, X'd ${s.transientPct !== undefined ? `${num(s.transientPct)} %` : 'typical *'}` +
          (s.sustainedCurrentMultiple !== undefined
            ? `, sustained ${num(s.sustainedCurrentMultiple)} × rated`
            : `, Xd ${s.synchronousPct !== undefined ? `${num(s.synchronousPct)} %` : 'typical *'}`) +
          `, T"d ${s.subtransientTimeConstantS !== undefined ? `${num(s.subtransientTimeConstantS)} s` : 'typical *'}` +
          `, T'd ${s.transientTimeConstantS !== undefined ? `${num(s.transientTimeConstantS)} s` : 'typical *'}`,
      num(s.xr),
    ]),
    model.sources.some((s) => s.kind === 'generator')
      ? {
          note: '* typical generator value, from memory (not entered): the study warnings list each; without Xd or a sustained multiple the higher energy of a low and a supported sustained current is kept.',
        }
      : undefined,
  );
}
