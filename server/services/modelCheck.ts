import { LRUCache } from 'lru-cache';
import { plausibilityWarnings } from '../../shared/modelPlausibility';
import { parseModel, type ModelIssue } from '../../shared/schemas/model';
import type { ModelWarning } from '../../shared/schemas/modelWarnings';

/** What the model checks say about one stored model text. */
export interface CheckedModel {
  /** Every problem found (empty: the model is valid). */
  readonly issues: readonly ModelIssue[];
  /** For a sound model, its plausibility warnings (shared/modelPlausibility.ts). */
  readonly warnings: readonly ModelWarning[];
  /** The checked model as JSON text (what a run stores as its snapshot); null when the model has problems. */
  readonly snapshot: string | null;
  /** Whether any bus has equipment to label. */
  readonly hasEquipment: boolean;
}

/**
 * Answers by the exact model text (the checks are a pure function of it), the most recently used kept: a large model
 * (a 10 000-bus plant is about 5 MB of JSON and takes the checks about 0.3 s) is checked when it is saved or
 * imported, and starting its run or reading it back reuses that answer instead of checking it again on the request
 * thread.
 */
const checked = new LRUCache<string, CheckedModel>({
  maxSize: 64 * 1024 * 1024,
  sizeCalculation: (v, text) => Math.max(1, text.length + (v.snapshot?.length ?? 0)),
});

/** The model checks (`parseModel`) of a stored model's JSON text. */
export function checkModelText(text: string): CheckedModel {
  const hit = checked.get(text);
  if (hit) return hit;
  const parsed = parseModel(JSON.parse(text));
  const answer: CheckedModel = Object.freeze(
    parsed.success
      ? {
          issues: Object.freeze([]),
          warnings: Object.freeze(plausibilityWarnings(parsed.model)),
          snapshot: JSON.stringify(parsed.model),
          hasEquipment: parsed.model.buses.some((b) => b.equipment),
        }
      : { issues: Object.freeze(parsed.issues), warnings: Object.freeze([]), snapshot: null, hasEquipment: false },
  );
  checked.set(text, answer);
  return answer;
}

/** The issues and warnings of a stored model's JSON text, as a model route answers them (copies). */
export function modelCheckOfText(text: string): { issues: ModelIssue[]; warnings: ModelWarning[] } {
  const c = checkModelText(text);
  return { issues: [...c.issues], warnings: [...c.warnings] };
}
