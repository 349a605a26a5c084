import { LRUCache } from 'lru-cache';
import { plausibilityWarnings } from '../../shared/modelPlausibility';
import { parseModel, type Model, type ModelIssue } from '../../shared/schemas/model';
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

/**
 * Models `parseModel` has just accepted (an import checks the file's model as it reads it), by object: their text need
 * not be parsed and checked again when they are stored (see `checkModelText`).
 */
const accepted = new WeakSet<object>();

/** Marks a model as `parseModel`'s accepted output (`parseModel(input).model`, unchanged since). */
export function markAcceptedModel(model: Model): void {
  accepted.add(model);
}

/**
 * The model checks (`parseModel`) of a stored model's JSON text. With `source`, the model the text was made from
 * (`JSON.stringify(source)`): when `parseModel` has just accepted it (`markAcceptedModel`), the answer is the accepted
 * model's without parsing the text and checking it again — the same answer, since `parseModel` only adds defaults
 * (no transforms), so its output checks to itself (tests/api/modelCheck.test.ts holds the two to each other).
 */
export function checkModelText(text: string, source?: object): CheckedModel {
  const hit = checked.get(text);
  if (hit) return hit;
  if (source && accepted.has(source)) {
    const model = source as Model;
    const answer: CheckedModel = Object.freeze({
      issues: Object.freeze([]),
      warnings: Object.freeze(plausibilityWarnings(model)),
      snapshot: text,
      hasEquipment: model.buses.some((b) => b.equipment),
    });
    checked.set(text, answer);
    return answer;
  }
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

/** The issues and warnings of a stored model's JSON text, as a model route answers them (copies); `source` as above. */
export function modelCheckOfText(text: string, source?: object): { issues: ModelIssue[]; warnings: ModelWarning[] } {
  const c = checkModelText(text, source);
  return { issues: [...c.issues], warnings: [...c.warnings] };
}
