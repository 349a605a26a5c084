import { randomUUID } from 'node:crypto';
import type { Transaction } from 'sequelize';
import type { Device } from '../../shared/schemas/device';
import {
  deviceDefinitionSchema,
  type DeviceDefinition,
  type DeviceType as DeviceTypeDto,
  type DeviceTypeInput,
  deviceTypeInputSchema,
} from '../../shared/schemas/deviceLibrary';
import { DeviceType } from '../db/models';
import { EngineError } from '../engine/errors';
import { resolveElectronicSettings } from '../engine/trip';
import { clampStoredCurves } from '../engine/trip/clampCurves';
import {
  EXAMPLE_BAND,
  EXAMPLE_ELECTRONIC_TYPE,
  EXAMPLE_FUSE,
  EXAMPLE_RELAY_IEC,
  EXAMPLE_RELAY_IEEE,
  EXAMPLE_THERMAL_MAGNETIC,
} from '../engine/trip/exampleDevices';
import type { AppContext, AuthUser } from './context';
import { ApiError } from './errors';
import { recordAudit } from './audit';

/** The device with every setting as a number (electronic trip units: positions resolved). */
export function resolveDefinition(definition: DeviceDefinition): Device {
  if (definition.kind === 'electronic') {
    return resolveElectronicSettings(definition.tripType, definition.positions);
  }
  return definition;
}

function toDto(row: DeviceType): DeviceTypeDto {
  // Rows saved before the curve limits existed are clamped into them (they would otherwise fail to read).
  const definition = deviceDefinitionSchema.parse(clampStoredCurves(JSON.parse(row.definition)));
  return {
    id: row.id,
    name: row.name,
    description: row.description,
    source: row.source,
    kind: definition.kind,
    definition,
    device: resolveDefinition(definition),
    createdAt: row.createdAt.toISOString(),
    updatedAt: row.updatedAt.toISOString(),
  };
}

export async function listDeviceTypes(actor: AuthUser): Promise<DeviceTypeDto[]> {
  const rows = await DeviceType.findAll({ where: { organizationId: actor.organizationId }, order: [['name', 'ASC']] });
  return rows.map(toDto);
}

async function findRow(actor: AuthUser, id: string, transaction?: Transaction): Promise<DeviceType> {
  const row = await DeviceType.findOne({ where: { id, organizationId: actor.organizationId }, transaction });
  if (!row) throw ApiError.notFound('No such device type');
  return row;
}

export async function getDeviceType(actor: AuthUser, id: string): Promise<DeviceTypeDto> {
  return toDto(await findRow(actor, id));
}

function prepare(input: DeviceTypeInput) {
  const data = deviceTypeInputSchema.parse(input);
  try {
    resolveDefinition(data.definition); // an unknown switch position is refused here (400, naming the field)
  } catch (e) {
    if (e instanceof EngineError)
      throw new EngineError(e.kind, e.code, e.message, e.field ? `definition.${e.field}` : 'definition');
    throw e;
  }
  return data;
}

export async function createDeviceType(
  ctx: AppContext,
  actor: AuthUser,
  input: DeviceTypeInput,
): Promise<DeviceTypeDto> {
  const data = prepare(input);
  return ctx.db.sequelize.transaction(async (transaction) => {
    const row = await DeviceType.create(
      {
        id: randomUUID(),
        organizationId: actor.organizationId,
        name: data.name,
        kind: data.definition.kind,
        description: data.description,
        source: data.source,
        definition: JSON.stringify(data.definition),
      },
      { transaction },
    );
    await recordAudit(
      {
        organizationId: actor.organizationId,
        actorId: actor.id,
        action: 'device-type.created',
        entityType: 'device-type',
        entityId: row.id,
        summary: { name: row.name, kind: row.kind },
      },
      transaction,
    );
    return toDto(row);
  });
}

export async function updateDeviceType(
  ctx: AppContext,
  actor: AuthUser,
  id: string,
  input: DeviceTypeInput,
): Promise<DeviceTypeDto> {
  const data = prepare(input);
  return ctx.db.sequelize.transaction(async (transaction) => {
    const row = await findRow(actor, id, transaction);
    const before = { name: row.name, definition: JSON.parse(row.definition) as unknown };
    await row.update(
      {
        name: data.name,
        kind: data.definition.kind,
        description: data.description,
        source: data.source,
        definition: JSON.stringify(data.definition),
      },
      { transaction },
    );
    await recordAudit(
      {
        organizationId: actor.organizationId,
        actorId: actor.id,
        action: 'device-type.updated',
        entityType: 'device-type',
        entityId: row.id,
        summary: { before, after: { name: data.name, definition: data.definition } },
      },
      transaction,
    );
    return toDto(row);
  });
}

export async function deleteDeviceType(ctx: AppContext, actor: AuthUser, id: string): Promise<void> {
  await ctx.db.sequelize.transaction(async (transaction) => {
    const row = await findRow(actor, id, transaction);
    await recordAudit(
      {
        organizationId: actor.organizationId,
        actorId: actor.id,
        action: 'device-type.deleted',
        entityType: 'device-type',
        entityId: row.id,
        summary: { name: row.name, definition: JSON.parse(row.definition) as unknown },
      },
      transaction,
    );
    await row.destroy({ transaction });
  });
}

/** Invented generic examples for a new organization's library (never a maker's data or names). */
export const GENERIC_LIBRARY: DeviceTypeInput[] = [
  {
    name: 'Generic 20 A molded-case breaker',
    description: 'Thermal-magnetic, fixed instantaneous.',
    source: 'Invented example',
    definition: EXAMPLE_THERMAL_MAGNETIC,
  },
  {
    name: 'Generic 200 A current-limiting fuse',
    description: 'Total-clearing and minimum-melting curves.',
    source: 'Invented example',
    definition: EXAMPLE_FUSE,
  },
  {
    name: 'Feeder relay, very inverse',
    description: 'IEEE C37.112 very inverse with a 5-cycle breaker.',
    source: 'Invented example',
    definition: EXAMPLE_RELAY_IEEE,
  },
  {
    name: 'Incomer relay, standard inverse',
    description: 'IEC 60255-151 standard inverse.',
    source: 'Invented example',
    definition: EXAMPLE_RELAY_IEC,
  },
  {
    name: 'Digitized band, multiples of rating',
    description: 'A band read off a published curve, as min/max points.',
    source: 'Invented example',
    definition: EXAMPLE_BAND,
  },
  {
    name: 'Generic LSIG trip unit, 1600 A frame',
    description: 'Electronic trip unit: long-time, short-time, instantaneous and ground-fault switches.',
    source: 'Invented example',
    definition: {
      kind: 'electronic',
      tripType: EXAMPLE_ELECTRONIC_TYPE,
      positions: {
        ratingPlug: '1600',
        longTimePickup: '1.0',
        longTimeDelay: '10',
        shortTimePickup: '4',
        shortTimeDelay: '0.3',
        shortTimeI2t: 'OUT',
        instantaneousPickup: '10',
        groundFaultPickup: '640',
        groundFaultDelay: '0.2',
      },
    },
  },
];

export async function seedGenericLibrary(organizationId: string, transaction?: Transaction): Promise<void> {
  for (const input of GENERIC_LIBRARY) {
    const data = prepare(input);
    await DeviceType.create(
      {
        id: randomUUID(),
        organizationId,
        name: data.name,
        kind: data.definition.kind,
        description: data.description,
        source: data.source,
        definition: JSON.stringify(data.definition),
      },
      { transaction },
    );
  }
}
