/**
 * The device settings editor's pure edits (components/model/devices/deviceEdit.ts) and the "Worth checking" group of
 * the editor's summary. The rules checked come from the model format (docs/MODEL-FORMAT.md, Devices; the zod schema
 * in shared/schemas/device.ts): a relay's pickup is `pickupA`, or `ctRatio` (primary over secondary amperes) with
 * `pickupSecondaryA`, so primary = ratio × secondary by the definition of the ratio; a thermal-magnetic
 * instantaneous pickup is `pickupMultiple` ± `tolerancePct` percent, or `lowMultiple`…`highMultiple`; `library`
 * names the type a device was taken from and, for a trip unit, the positions chosen. Every device here is invented.
 */
import React from 'react';
import { renderToStaticMarkup } from 'react-dom/server';
import type { ElectronicDevice, RelayDevice, ThermalMagneticDevice } from '../../shared/schemas/device';
import { parseModel, type ModelInput } from '../../shared/schemas/model';
import { plausibilityWarnings } from '../../shared/modelPlausibility';
import {
  busOfDevice,
  findDevice,
  modifiedFrom,
  provenance,
  relayInstantaneousPrimaryA,
  relayPickupMode,
  relayPickupPrimaryA,
  tmInstantaneousMode,
  withPositions,
  withRelayPickupMode,
  withSettings,
  withTmInstantaneousMode,
} from '../../components/model/devices/deviceEdit';
import { IssueSummary } from '../../components/model/editor/IssueSummary';
import { DeviceSettingsPanel } from '../../components/model/devices/DeviceSettingsPanel';
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { groupIssues, type PlacedDeviceInput } from '../../components/model/summaries';
import { libraryChanged } from '../../components/model/columns/devices';
import { expectClose as approx } from '../helpers/approx';

const relay: RelayDevice = { kind: 'relay', curve: 'IEEE-VI', pickupA: 600, timeDial: 2, breakerCycles: 5 };

const placedFromLibrary: PlacedDeviceInput = {
  id: 'R-1',
  branch: 'TX-1',
  end: 'from',
  device: relay,
  library: { deviceTypeId: 'lib-1', name: 'Feeder relay 600 A' },
};

describe('raw settings and the library provenance (docs/MODEL-FORMAT.md, Devices: library)', () => {
  it('a changed time dial drops `library` and names the device "Modified from <type>"', () => {
    const next = withSettings(placedFromLibrary, { ...relay, timeDial: 6 });
    expect(next.library).toBeUndefined();
    expect((next.device as RelayDevice).timeDial).toBe(6);
    expect(modifiedFrom(next)).toBe('Feeder relay 600 A');
    expect(provenance(next)).toEqual({ kind: 'modified', name: 'Feeder relay 600 A' });
    // The edit leaves its input untouched.
    expect(placedFromLibrary.library?.name).toBe('Feeder relay 600 A');
    expect((placedFromLibrary.device as RelayDevice).timeDial).toBe(2);
  });

  it('the same settings change nothing (no undo step for a no-op)', () => {
    expect(withSettings(placedFromLibrary, { ...relay })).toBe(placedFromLibrary);
  });

  it('a device not from the library keeps its own name', () => {
    const custom: PlacedDeviceInput = { id: 'R-2', source: 'UTIL-1', device: { ...relay, name: 'Incomer' } };
    const next = withSettings(custom, { ...relay, name: 'Incomer', timeDial: 3 });
    expect((next.device as RelayDevice).name).toBe('Incomer');
    expect(provenance(next)).toEqual({ kind: 'custom' });
  });

  it('a modified device edited again stays "Modified from" the same type', () => {
    const once = withSettings(placedFromLibrary, { ...relay, timeDial: 6 });
    const twice = withSettings(once, { ...(once.device as RelayDevice), timeDial: 7 });
    expect(modifiedFrom(twice)).toBe('Feeder relay 600 A');
  });

  it('a placed device with raw settings still passes the model schema', () => {
    const model: ModelInput = {
      format: 'emberline-model',
      version: 1,
      buses: [
        { id: 'B-1', nominalKv: 13.8 },
        { id: 'B-2', nominalKv: 0.48 },
      ],
      sources: [{ id: 'U-1', kind: 'utility', bus: 'B-1', shortCircuitMva: 250, xr: 10 }],
      transformers: [
        {
          id: 'TX-1',
          fromBus: 'B-1',
          toBus: 'B-2',
          kva: 1500,
          primaryKv: 13.8,
          secondaryKv: 0.48,
          impedancePct: 5.75,
          xr: 6,
        },
      ],
      devices: [withSettings(placedFromLibrary, { ...relay, timeDial: 6 })],
    } as unknown as ModelInput;
    const r = parseModel(model);
    if (!r.success) throw new Error(JSON.stringify(r.issues));
    expect(r.model.devices[0].library).toBeUndefined();
  });
});

describe('trip-unit switch positions keep the library type', () => {
  const resolved: ElectronicDevice = {
    kind: 'electronic',
    name: 'LSI 800',
    sensorA: 800,
    longTime: { pickup: 0.9, delayS: 10 },
    pickupTolerancePct: 10,
    clearingS: 0.05,
  };
  const etu: PlacedDeviceInput = {
    id: 'CB-1',
    branch: 'TX-1',
    end: 'to',
    device: { ...resolved, longTime: { pickup: 1, delayS: 10 } },
    library: { deviceTypeId: 'lib-etu', name: 'LSI 800', positions: { longTimePickup: '1.0', longTimeDelay: '10' } },
  };
  it('new positions are stored in library.positions with the device resolved from them', () => {
    const next = withPositions(etu, { longTimePickup: '0.9', longTimeDelay: '10' }, resolved);
    expect(next.library).toEqual({
      deviceTypeId: 'lib-etu',
      name: 'LSI 800',
      positions: { longTimePickup: '0.9', longTimeDelay: '10' },
    });
    expect(next.device).toBe(resolved);
    expect(provenance(next)).toEqual({ kind: 'library', name: 'LSI 800' });
  });
});

describe('relay pickups: primary amperes or CT ratio with secondary amperes (primary = ratio × secondary)', () => {
  it('primary → CT keeps the same primary pickups through the ratio', () => {
    const r: RelayDevice = { ...relay, ctRatio: 120, instantaneousA: 6000 };
    const ct = withRelayPickupMode(r, 'ct');
    expect(relayPickupMode(ct)).toBe('ct');
    expect(ct.pickupA).toBeUndefined();
    expect(ct.instantaneousA).toBeUndefined();
    approx(ct.pickupSecondaryA!, 5, 1e-12); // 600 A / (600/5) = 5 A
    approx(ct.instantaneousSecondaryA!, 50, 1e-12); // 6000 A / 120 = 50 A
    approx(relayPickupPrimaryA(ct)!, 600, 1e-12);
    approx(relayInstantaneousPrimaryA(ct)!, 6000, 1e-12);
  });

  it('CT → primary converts back (a round trip keeps the primary pickups)', () => {
    const ct: RelayDevice = { ...relay, pickupA: undefined, ctRatio: 80, pickupSecondaryA: 4.5 } as RelayDevice;
    delete (ct as Partial<RelayDevice>).pickupA;
    const primary = withRelayPickupMode(ct, 'primary');
    approx(primary.pickupA!, 360, 1e-12); // 80 × 4.5 A
    expect(primary.pickupSecondaryA).toBeUndefined();
    approx(withRelayPickupMode(withRelayPickupMode(primary, 'ct'), 'primary').pickupA!, 360, 1e-12);
  });

  it('without a CT ratio the secondary pickup is left to enter (the model then asks for it)', () => {
    const ct = withRelayPickupMode(relay, 'ct');
    expect(ct.pickupSecondaryA).toBeUndefined();
    expect(ct.pickupA).toBeUndefined();
    expect(relayPickupPrimaryA(ct)).toBeUndefined();
  });
});

describe('thermal-magnetic instantaneous: pickup ± tolerance or a low–high range; the thermal band is kept', () => {
  const tm: ThermalMagneticDevice = {
    kind: 'thermal-magnetic',
    ratingA: 100,
    thermal: {
      min: [
        [1.1, 1000],
        [10, 1],
      ],
      max: [
        [1.3, 3000],
        [10, 5],
      ],
    },
    instantaneous: { pickupMultiple: 10, tolerancePct: 20, setting: 'HI' },
  };
  it('pickup 10 × ± 20 % is the range 8–12 ×, and back', () => {
    const range = withTmInstantaneousMode(tm, 'range');
    expect(tmInstantaneousMode(range)).toBe('range');
    approx(range.instantaneous!.lowMultiple!, 8, 1e-12);
    approx(range.instantaneous!.highMultiple!, 12, 1e-12);
    expect(range.instantaneous!.setting).toBe('HI');
    expect(range.thermal).toBe(tm.thermal);
    const back = withTmInstantaneousMode(range, 'tolerance');
    approx(back.instantaneous!.pickupMultiple!, 10, 1e-12);
    approx(back.instantaneous!.tolerancePct!, 20, 1e-12);
  });
  it('none removes the instantaneous element only', () => {
    const none = withTmInstantaneousMode(tm, 'none');
    expect(none.instantaneous).toBeUndefined();
    expect(none.thermal).toBe(tm.thermal);
    expect(none.ratingA).toBe(100);
  });
});

describe('where the device sits and following it through list changes', () => {
  const model = {
    format: 'emberline-model',
    version: 1,
    buses: [
      { id: 'B-1', nominalKv: 13.8 },
      { id: 'B-2', nominalKv: 0.48 },
    ],
    sources: [{ id: 'U-1', kind: 'utility', bus: 'B-1', shortCircuitMva: 250, xr: 10 }],
    transformers: [{ id: 'TX-1', fromBus: 'B-1', toBus: 'B-2', kva: 1500, impedancePct: 5.75 }],
    devices: [
      { id: 'R-1', branch: 'TX-1', end: 'from', device: relay },
      { id: 'CB-2', branch: 'TX-1', end: 'to', device: relay },
      { id: 'R-U', source: 'U-1', device: relay },
    ],
  } as unknown as ModelInput;
  it('the bus at the branch end, or the bus of the source', () => {
    expect(busOfDevice(model.devices![0], model)).toBe('B-1');
    expect(busOfDevice(model.devices![1], model)).toBe('B-2');
    expect(busOfDevice(model.devices![2], model)).toBe('B-1');
    expect(busOfDevice({ id: 'X', branch: 'NOPE', end: 'to' } as PlacedDeviceInput, model)).toBeUndefined();
  });
  it('finds the edited device by id when its index moved, -1 once deleted', () => {
    expect(findDevice(model, 1, 'CB-2')).toBe(1);
    expect(findDevice(model, 0, 'CB-2')).toBe(1);
    expect(findDevice(model, 1, 'GONE')).toBe(-1);
  });
});

describe('libraryChanged after other trip-unit positions', () => {
  it('positions of the type other than the library’s own are not a change of the type', () => {
    const type = {
      id: 'lib-etu',
      name: 'LSI',
      kind: 'electronic',
      definition: {
        kind: 'electronic',
        tripType: {
          name: 'LSI',
          sensorA: 800,
          settings: {
            longTimePickup: { positions: { '0.9': 0.9, '1.0': 1 } },
            longTimeDelay: { positions: { '10': 10 } },
          },
          pickupTolerancePct: 10,
          clearingS: 0.05,
        },
        positions: { longTimePickup: '1.0', longTimeDelay: '10' },
      },
      device: {
        kind: 'electronic',
        sensorA: 800,
        longTime: { pickup: 1, delayS: 10 },
        pickupTolerancePct: 10,
        clearingS: 0.05,
      },
    } as never;
    const placed = {
      id: 'CB',
      source: 'U-1',
      device: {
        kind: 'electronic',
        sensorA: 800,
        longTime: { pickup: 0.9, delayS: 10 },
        pickupTolerancePct: 10,
        clearingS: 0.05,
      },
      library: { deviceTypeId: 'lib-etu', name: 'LSI', positions: { longTimePickup: '0.9', longTimeDelay: '10' } },
    } as PlacedDeviceInput;
    expect(libraryChanged(placed, type)).toBe(false);
    const gone = {
      ...placed,
      library: { ...placed.library!, positions: { longTimePickup: '0.7', longTimeDelay: '10' } },
    };
    expect(libraryChanged(gone, type)).toBe(true);
  });
});

describe('plausibility warnings in the summary: a separate "Worth checking" group', () => {
  it('shows the warning in the caution group, apart from the problems', () => {
    const model = {
      format: 'emberline-model',
      version: 1,
      buses: [{ id: 'B-1', nominalKv: 13.8, equipment: { class: 'switchgear-15kv' } }],
      // 1e9 kA: far above the 200 kA plausibility limit (shared/modelPlausibility.ts, common practice, no source).
      sources: [{ id: 'U-1', kind: 'utility', bus: 'B-1', shortCircuitKa: 1e9, xr: 10 }],
    } as unknown as ModelInput;
    const r = parseModel(model);
    if (!r.success) throw new Error(JSON.stringify(r.issues));
    const warnings = plausibilityWarnings(r.model);
    expect(warnings.length).toBeGreaterThan(0);
    const html = renderToStaticMarkup(
      <IssueSummary
        grouped={groupIssues([], model)}
        warnings={groupIssues(warnings as never, model)}
        model={model}
        onJump={() => undefined}
      />,
    );
    expect(html).toContain('No problems found in the model.');
    expect(html).toContain('Worth checking');
    expect(html).toContain('Sources · U-1');
    expect(html).toContain('data-testid="model-warnings"');
  });
});

describe('the device settings panel rendered to HTML', () => {
  const model = {
    format: 'emberline-model',
    version: 1,
    buses: [{ id: 'B-1', nominalKv: 13.8 }],
    sources: [{ id: 'U-1', kind: 'utility', bus: 'B-1', shortCircuitMva: 250, xr: 10 }],
    // A relay with its time dial emptied: the model's issue names devices[0].device.timeDial.
    devices: [
      {
        id: 'R-1',
        source: 'U-1',
        device: { kind: 'relay', curve: 'IEC-SI', ctRatio: 120, pickupSecondaryA: 5, breakerCycles: 5 },
      },
    ],
  } as unknown as ModelInput;
  const render = (editable: boolean, studyId?: string) => {
    const r = parseModel(model);
    expect(r.success).toBe(false);
    const issues = r.success ? [] : r.issues;
    const located = groupIssues(issues, model).byElement.get('devices[0]') ?? [];
    return renderToStaticMarkup(
      <QueryClientProvider client={new QueryClient()}>
        <DeviceSettingsPanel
          model={model}
          index={0}
          typesById={new Map()}
          issues={located}
          warnings={[]}
          editable={editable}
          studyId={studyId}
          patch={() => undefined}
          onClose={() => undefined}
        />
      </QueryClientProvider>,
    );
  };
  it('shows the issue under the time multiplier field, the CT pickup with its primary amperes, and no markers yet', () => {
    const html = render(true, 'study-1');
    expect(html).toContain('Settings of R-1');
    expect(html).toContain('set in the model (not from the library)');
    // IEC 60255-151 calls the multiplier TMS: an IEC curve's dial is labelled "Time multiplier".
    expect(html).toContain('Time multiplier');
    expect(html).toMatch(/Time multiplier[\s\S]*?(Required|required)[\s\S]*?Breaker/);
    // 120 × 5 A secondary = 600 A primary (the CT ratio's definition).
    expect(html).toContain('600 A primary');
    expect(html).toContain('The band is drawn once the settings are complete.');
  });
  it('without a study there are no bus markers, and says so', () => {
    const r = parseModel({
      ...model,
      devices: [{ ...model.devices![0], device: { ...model.devices![0].device, timeDial: 0.1 } }],
    });
    expect(r.success).toBe(true);
    const html = renderToStaticMarkup(
      <QueryClientProvider client={new QueryClient()}>
        <DeviceSettingsPanel
          model={{
            ...model,
            devices: [{ ...model.devices![0], device: { ...model.devices![0].device, timeDial: 0.1 } as never }],
          }}
          index={0}
          typesById={new Map()}
          issues={[]}
          warnings={[]}
          editable={false}
          patch={() => undefined}
          onClose={() => undefined}
        />
      </QueryClientProvider>,
    );
    expect(html).toContain('No run to take B-1’s currents from.');
  });
});
