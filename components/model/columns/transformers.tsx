/** Transformer fields. */
import { type TransformerInput } from '../summaries';
import { type Column, numberColumn, idColumn, nameColumn, busColumn } from './shared';

export const TRANSFORMER_COLUMNS: Column<TransformerInput>[] = [
  idColumn(),
  nameColumn(170),
  busColumn<TransformerInput>('fromBus', 'Primary bus', 160, (t, kv) =>
    t.primaryKv === undefined && kv !== undefined ? { ...t, primaryKv: kv } : t,
  ),
  busColumn<TransformerInput>('toBus', 'Secondary bus', 160, (t, kv) =>
    t.secondaryKv === undefined && kv !== undefined ? { ...t, secondaryKv: kv } : t,
  ),
  numberColumn<TransformerInput>('kva', 'Rating', 'kVA', 100),
  numberColumn<TransformerInput>('primaryKv', 'Primary', 'kV', 90),
  numberColumn<TransformerInput>('secondaryKv', 'Secondary', 'kV', 96),
  numberColumn<TransformerInput>('impedancePct', 'Impedance', '%Z', 96),
  numberColumn<TransformerInput>('xr', 'X/R', undefined, 80, {
    placeholder: () => 'typical',
    hint: (t) => (t.xr === undefined ? 'Empty: a typical value by size, with a warning' : undefined),
  }),
];
