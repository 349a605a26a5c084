/** What the rows of a section need from the rest of the model, rebuilt only when that part changes. */
import { useMemo } from 'react';
import type { DeviceType } from '../../../shared/schemas/deviceLibrary';
import { DEVICE_KIND_LABELS } from '../../../shared/schemas/deviceLibrary';
import type { ModelInput } from '../../../shared/schemas/model';
import { EMPTY_CONTEXT, type EditorContext } from '../columns';
import { type PickOption } from '../controls';
import { deviceSettingsSummary, num } from '../summaries';
import { type Section } from './types';

export function useSectionContext(model: ModelInput, section: Section, deviceTypes: DeviceType[]): EditorContext {
  const buses = model.buses;
  const busSig = buses.map((b) => `${b.id}\u0001${b.name ?? ''}\u0001${b.nominalKv}`).join('\u0002');
  const bus = useMemo(() => {
    const options: PickOption[] = buses.map((b) => ({
      value: b.id,
      label: b.id,
      detail: [b.name, `${num(b.nominalKv)} kV`].filter(Boolean).join(' · '),
    }));
    const kv = new Map<string, number>();
    for (const b of buses) if (!kv.has(b.id) && Number.isFinite(b.nominalKv)) kv.set(b.id, b.nominalKv);
    return { options, kv };
    // eslint-disable-next-line react-hooks/exhaustive-deps -- rebuilt when the bus ids, names or voltages change
  }, [busSig]);

  const branches = [
    ...(model.transformers ?? []).map((t) => ['transformers', t.id, t.fromBus, t.toBus, `${num(t.kva)} kVA`] as const),
    ...(model.cables ?? []).map((c) => ['cables', c.id, c.fromBus, c.toBus, `${num(c.lengthM)} m`] as const),
    ...(model.ties ?? []).map(
      (t) => ['ties', t.id, t.fromBus, t.toBus, t.closed === false ? 'open' : 'closed'] as const,
    ),
  ];
  const injections = [
    ...(model.sources ?? []).map((s) => ['Sources', s.id, `${s.kind} at ${s.bus}`] as const),
    ...(model.motors ?? []).map(
      (m) => ['Motors', m.id, `${m.hp !== undefined ? `${num(m.hp)} hp` : `${num(m.kva)} kVA`} at ${m.bus}`] as const,
    ),
  ];
  const locSig = section === 'devices' ? JSON.stringify([branches, injections]) : '';
  const location = useMemo(() => {
    const options: PickOption[] = [];
    const ends = new Map<string, { from: string; to: string }>();
    const groupName = { transformers: 'Transformers', cables: 'Cables', ties: 'Ties' } as const;
    for (const [c, id, from, to, what] of branches) {
      options.push({ value: `branch:${id}`, label: id, detail: `${from} → ${to} · ${what}`, group: groupName[c] });
      if (!ends.has(id)) ends.set(id, { from, to });
    }
    for (const [group, id, what] of injections) options.push({ value: `source:${id}`, label: id, detail: what, group });
    return { options, ends };
    // eslint-disable-next-line react-hooks/exhaustive-deps -- rebuilt when branches, sources or motors change
  }, [locSig]);

  const types = useMemo(() => {
    const byKind = [...deviceTypes].sort((a, b) => a.kind.localeCompare(b.kind) || a.name.localeCompare(b.name));
    const options: PickOption[] = byKind.map((t) => ({
      value: t.id,
      label: t.name,
      detail: deviceSettingsSummary(t.device),
      group: DEVICE_KIND_LABELS[t.kind],
    }));
    return { options, byId: new Map(deviceTypes.map((t) => [t.id, t])) };
  }, [deviceTypes]);

  // Devices at each bus's end of a branch: its possible main devices. Which branch feeds a bus depends on the fault,
  // so every branch end at the bus counts here (a superset of the mains the study finds).
  const mainSig =
    section === 'buses'
      ? (model.devices ?? [])
          .filter((d) => d.branch && d.end)
          .map((d) => `${d.id}\u0001${d.branch}\u0001${d.end}`)
          .join('\u0002') + JSON.stringify(branches.map((b) => [b[1], b[2], b[3]]))
      : '';
  const busMains = useMemo(() => {
    const out = new Map<string, string[]>();
    if (!mainSig) return out;
    const ends = new Map(branches.map((b) => [b[1], { from: b[2], to: b[3] }]));
    for (const d of model.devices ?? []) {
      const e = d.branch ? ends.get(d.branch) : undefined;
      const at = e && d.end ? e[d.end] : undefined;
      if (at) out.set(at, [...(out.get(at) ?? []), d.id]);
    }
    return out;
    // eslint-disable-next-line react-hooks/exhaustive-deps -- rebuilt when branch-end devices or branch ends change
  }, [mainSig]);

  const usesBuses = section !== 'general' && section !== 'buses' && section !== 'devices';
  const isDevices = section === 'devices';
  // Each part only where its section uses it, so the other sections' rows do not re-render.
  const busPart = usesBuses ? bus : null;
  const locationPart = isDevices ? location : null;
  const typesPart = isDevices ? types : null;
  const mainsPart = section === 'buses' ? busMains : null;
  return useMemo<EditorContext>(
    () => ({
      ...EMPTY_CONTEXT,
      ...(busPart ? { busOptions: busPart.options, busKv: busPart.kv } : {}),
      ...(mainsPart ? { busMains: mainsPart } : {}),
      ...(locationPart ? { locationOptions: locationPart.options, branchBuses: locationPart.ends } : {}),
      ...(typesPart ? { typeOptions: typesPart.options, typesById: typesPart.byId } : {}),
    }),
    [busPart, locationPart, typesPart, mainsPart],
  );
}
