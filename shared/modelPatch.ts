/**
 * Applies a mitigation option's model patch (shared/schemas/mitigation.ts) to a model: a new model, the input
 * untouched. Used by the engine (to evaluate an option), the server (to write it into a new revision) and the client
 * (to show the change). Throws for an op that names an element the model does not have.
 */
import type { ModelPatchOp } from './schemas/mitigation';
import type { Model } from './schemas/model';

export class ModelPatchError extends Error {}

export function applyModelPatch(model: Model, ops: readonly ModelPatchOp[]): Model {
  let devices = model.devices;
  let buses = model.buses;
  for (const op of ops) {
    if (op.op === 'replace-device') {
      const at = devices.findIndex((d) => d.id === op.deviceId);
      if (at < 0) throw new ModelPatchError(`No device ${op.deviceId} in the model`);
      const { library: _dropped, ...placed } = devices[at];
      devices = devices.map((d, i) =>
        i === at ? { ...placed, device: op.device, ...(op.library ? { library: op.library } : {}) } : d,
      );
    } else if (op.op === 'add-device') {
      if (devices.some((d) => d.id === op.placed.id)) {
        throw new ModelPatchError(`The model already has a device ${op.placed.id}`);
      }
      devices = [...devices, op.placed];
    } else {
      const at = buses.findIndex((b) => b.id === op.busId);
      if (at < 0) throw new ModelPatchError(`No bus ${op.busId} in the model`);
      const bus = buses[at];
      if (!bus.equipment) throw new ModelPatchError(`Bus ${op.busId} has no equipment`);
      buses = buses.map((b, i) => (i === at ? { ...bus, equipment: { ...bus.equipment!, mainIsolated: true } } : b));
    }
  }
  return { ...model, devices, buses };
}
