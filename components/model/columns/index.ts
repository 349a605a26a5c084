/**
 * The fields of each element kind, written once and shown two ways: as the cells of a table row (wide screens) and
 * as the labelled fields of a phone card. Each field names the issue fields it shows (`issueKeys`), so a
 * `ModelIssue` for `cables[2].toBus` lands beside the "To bus" input.
 */
import type { CollectionKey, ElementOf } from '../summaries';
import { BUS_COLUMNS } from './buses';
import { CABLE_COLUMNS } from './cables';
import { DEVICE_COLUMNS } from './devices';
import { MOTOR_COLUMNS } from './motors';
import type { Column } from './shared';
import { SOURCE_COLUMNS } from './sources';
import { TIE_COLUMNS } from './ties';
import { TRANSFORMER_COLUMNS } from './transformers';

export { EMPTY_CONTEXT, NotApplicable, type CellProps, type Column, type EditorContext } from './shared';
export { BUS_COLUMNS } from './buses';
export { SOURCE_COLUMNS } from './sources';
export { TRANSFORMER_COLUMNS } from './transformers';
export { CABLE_COLUMNS } from './cables';
export { MOTOR_COLUMNS } from './motors';
export { TIE_COLUMNS } from './ties';
export { DEVICE_COLUMNS, fromLibrary, libraryChanged, locationValue } from './devices';
export type { GeneratorInput } from '../summaries';

export const COLUMNS: { [C in CollectionKey]: Column<ElementOf[C]>[] } = {
  buses: BUS_COLUMNS,
  sources: SOURCE_COLUMNS,
  transformers: TRANSFORMER_COLUMNS,
  cables: CABLE_COLUMNS,
  motors: MOTOR_COLUMNS,
  ties: TIE_COLUMNS,
  devices: DEVICE_COLUMNS,
};
