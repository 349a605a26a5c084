/** Types and constants shared by the parts of the model editor. */
import { type EditorContext } from '../columns';
import { type AnyElement, type CollectionKey, type LocatedIssue } from '../summaries';

export type Section = CollectionKey | 'scenarios' | 'general';

export const NO_ISSUES: readonly LocatedIssue[] = [];

export const SECTION_NOTES: Record<Section, string> = {
  general: 'The study as a whole.',
  buses:
    'Each bus with equipment gets a label. The equipment class gives the typical electrode configuration, gap, enclosure and working distance (IEEE 1584-2018); fill a field only to override it.',
  sources:
    'Utility services (available short circuit and X/R at the bus) and generators (rating and subtransient reactance).',
  transformers: 'From the primary bus to the secondary bus; %Z on the transformer rating.',
  cables: 'Conductor size, material and conduit (NEC Chapter 9 Table 9), or R and X per km of one conductor.',
  motors: 'Induction motors that feed the fault: rating in hp or kVA.',
  ties: 'Bus ties and switches of negligible impedance; a closed tie joins two buses into one node.',
  scenarios:
    'The operating states the plant runs in. The model as written is the base, always run; a scenario changes only what it names. Each bus’s label takes the scenario with the highest incident energy.',
  devices:
    'Each protective device sits at one end of a transformer, cable or tie, or on a source or motor. Take its settings from the device library, then adjust them under “Edit settings”.',
};

export interface Focus {
  key: string;
  nonce: number;
  /** The field a jump to a problem asks for (a scenario's `sources.UTIL-1`: the row of that source). */
  field?: string;
}

/** Callbacks shared by every row: stable for the editor's lifetime (they read the latest model from a ref). */
export interface RowActions {
  patch: (collection: CollectionKey, index: number, update: (e: AnyElement) => AnyElement) => void;
  rename: (collection: CollectionKey, index: number, id: string) => void;
  duplicate: (collection: CollectionKey, index: number) => void;
  remove: (collection: CollectionKey, index: number) => void;
  toggle: (key: string) => void;
}

export interface RowProps {
  collection: CollectionKey;
  index: number;
  element: AnyElement;
  issues: readonly LocatedIssue[];
  /** Plausibility warnings on the element (never blocking), shown in the caution tone. */
  warnings?: readonly LocatedIssue[];
  ctx: EditorContext;
  editable: boolean;
  focused: number;
  actions: RowActions;
}
