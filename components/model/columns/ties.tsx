/** Tie fields. */
import { SegCell } from '../controls';
import { type TieInput } from '../summaries';
import { type Column, idColumn, nameColumn, busColumn } from './shared';

export const TIE_COLUMNS: Column<TieInput>[] = [
  idColumn(),
  nameColumn(),
  busColumn<TieInput>('fromBus', 'From bus'),
  busColumn<TieInput>('toBus', 'To bus'),
  {
    key: 'closed',
    label: 'State',
    width: 170,
    basis: 200,
    issueKeys: ['closed'],
    render: ({ e, size, invalid, editable, patch, testID, label }) => (
      <SegCell
        value={e.closed === false ? 'open' : 'closed'}
        options={[
          { value: 'closed', label: 'Closed' },
          { value: 'open', label: 'Open' },
        ]}
        onChange={(v) => patch((t) => ({ ...t, closed: v === 'closed' }))}
        size={size}
        invalid={invalid}
        editable={editable}
        testID={testID}
        accessibilityLabel={label}
      />
    ),
  },
];
