/**
 * A placed device taken from a type of the generic starter set shows the type's note in the model editor, the same
 * words as in the device library (issue 20: "generic — verify against the manufacturer's published curve"); a device
 * from the organization's own type shows none. The device and types here are invented.
 */
import React from 'react';
import { renderToStaticMarkup } from 'react-dom/server';
import { GENERIC_DEVICE_NOTE, type DeviceType } from '../../shared/schemas/deviceLibrary';
import type { RelayDevice } from '../../shared/schemas/device';
import { DEVICE_COLUMNS } from '../../components/model/columns/devices';
import { EMPTY_CONTEXT } from '../../components/model/columns/shared';
import type { PlacedDeviceInput } from '../../components/model/summaries';

const relay: RelayDevice = {
  kind: 'relay',
  curve: 'IEEE-VI',
  pickupA: 600,
  timeDial: 2,
  breakerCycles: 5,
};

function type(genericNote: string | null): DeviceType {
  return {
    id: 'type-1',
    name: 'Feeder relay, very inverse',
    description: '',
    source: '',
    genericNote,
    kind: 'relay',
    definition: relay,
    device: relay,
    createdAt: '2026-01-01T00:00:00.000Z',
    updatedAt: '2026-01-01T00:00:00.000Z',
  };
}

function renderTypeCell(t: DeviceType): string {
  const column = DEVICE_COLUMNS.find((c) => c.key === 'type')!;
  const placed: PlacedDeviceInput = {
    id: 'R-1',
    branch: 'TX-1',
    end: 'from',
    device: relay,
    library: { deviceTypeId: t.id, name: t.name },
  };
  return renderToStaticMarkup(
    <>
      {column.render({
        e: placed,
        size: 'card',
        invalid: false,
        editable: true,
        patch: () => undefined,
        rename: () => undefined,
        ctx: { ...EMPTY_CONTEXT, typesById: new Map([[t.id, t]]), typeOptions: [{ value: t.id, label: t.name }] },
        testID: 'dev-R-1-type',
        label: 'R-1 device type',
      })}
    </>,
  );
}

it('a device from a generic type carries its note; one from the organization’s own type does not', () => {
  const generic = renderTypeCell(type(GENERIC_DEVICE_NOTE));
  expect(generic).toContain('Generic — verify against the manufacturer&#x27;s published curve.');
  expect(generic).toContain('dev-R-1-type-generic');
  const own = renderTypeCell(type(null));
  expect(own).not.toContain('verify against the manufacturer');
});
