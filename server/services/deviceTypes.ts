import { randomUUID } from 'node:crypto';
import type { Transaction } from 'sequelize';
import type { Device } from '../../shared/schemas/device';
import {
  GENERIC_DEVICE_NOTE,
  deviceDefinitionSchema,
  type DeviceDefinition,
  type DeviceType as DeviceTypeDto,
  type DeviceTypeInput,
  deviceTypeInputSchema,
} from '../../shared/schemas/deviceLibrary';
import { DeviceType, GenericLibraryOffer, Organization } from '../db/models';
import { EngineError } from '../engine/errors';
import { resolveElectronicSettings } from '../engine/trip';
import { clampStoredCurves } from '../engine/trip/clampCurves';
import { genericLibrary } from '../engine/trip/genericLibrary';
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
    genericNote: row.genericKey ? GENERIC_DEVICE_NOTE : null,
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
    const definition = JSON.stringify(data.definition);
    // A generic type whose curve is changed is the organization's own from then on (it no longer carries the note).
    const sameCurve = JSON.stringify(deviceDefinitionSchema.parse(before.definition)) === definition;
    await row.update(
      {
        name: data.name,
        kind: data.definition.kind,
        description: data.description,
        source: data.source,
        definition,
        ...(sameCurve ? {} : { genericKey: null }),
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

/**
 * The generic starter set (server/engine/trip/genericLibrary.ts) as library inputs: invented types covering the usual
 * range, each shown with the note "generic — verify against the manufacturer's published curve".
 */
export const GENERIC_LIBRARY: (DeviceTypeInput & { key: string })[] = genericLibrary().map((e) => ({
  key: e.key,
  name: e.name,
  description: e.description,
  source: e.source,
  definition: e.definition,
}));

/**
 * Adds the entries of the generic starter set this organization has not been given yet, and records them as given:
 * idempotent, and a type the organization created, edited or removed is never touched or brought back. Returns the
 * number of types added.
 */
export async function addMissingGenericTypes(organizationId: string, transaction?: Transaction): Promise<number> {
  const offered = await GenericLibraryOffer.findAll({ where: { organizationId }, transaction });
  const given = new Set(offered.map((o) => o.genericKey));
  let added = 0;
  for (const { key, ...input } of GENERIC_LIBRARY) {
    if (given.has(key)) continue;
    const data = prepare(input);
    await GenericLibraryOffer.create({ organizationId, genericKey: key }, { transaction });
    await DeviceType.create(
      {
        id: randomUUID(),
        organizationId,
        name: data.name,
        kind: data.definition.kind,
        description: data.description,
        source: data.source,
        definition: JSON.stringify(data.definition),
        genericKey: key,
      },
      { transaction },
    );
    added += 1;
  }
  return added;
}

/** A new organization's library: the generic starter set. */
export async function seedGenericLibrary(organizationId: string, transaction?: Transaction): Promise<void> {
  await addMissingGenericTypes(organizationId, transaction);
}

/**
 * At start: every organization gets the entries of the starter set it has not been given yet (one transaction per
 * organization; another server starting at the same moment makes one of the two give way on the offers' key).
 */
export async function addMissingGenericTypesEverywhere(ctx: Pick<AppContext, 'db'>): Promise<number> {
  const orgs = await Organization.findAll({ attributes: ['id'] });
  let added = 0;
  for (const org of orgs) {
    try {
      added += await ctx.db.sequelize.transaction((transaction) => addMissingGenericTypes(org.id, transaction));
    } catch (e) {
      if ((e as Error).name !== 'SequelizeUniqueConstraintError') throw e;
    }
  }
  return added;
}
