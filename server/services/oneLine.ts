/**
 * The one-line diagram of a study revision (shared/oneLine): its current model, with the hazard at each labelled bus
 * from the results the study stands on (the approved run, else the latest finished run) and its model problems marked.
 */
import { modelSchema, validateModel, type Model, type ModelIssue } from '../../shared/schemas/model';
import { parseStoredResults } from '../engine/study/storedResults';
import type { BusHazard, OneLineDrawing } from '../../shared/oneLine/geometry';
import { hazardsFromResults } from '../../shared/oneLine/hazards';
import { defaultCollapsed, layoutOneLine } from '../../shared/oneLine/layout';
import { oneLineSvg } from '../../shared/oneLine/svg';
import { StudyRun } from '../db/models';
import type { AuthUser } from './context';
import { ApiError } from './errors';
import { findStudy } from './scope';
import { modelIssues } from './studies';

export interface StudyOneLine {
  drawing: OneLineDrawing;
  title: string;
  scenarios: { id: string; name: string }[];
  scenarioId: string | null;
}

/** Which subtrees to collapse: these bus ids; none (`'none'`); or the default for the model's size (undefined). */
export type CollapseRequest = string[] | 'none' | undefined;

export async function studyOneLine(
  actor: AuthUser,
  studyId: string,
  scenarioId?: string,
  collapse?: CollapseRequest,
): Promise<StudyOneLine> {
  const study = await findStudy(actor, studyId);
  const input = JSON.parse(study.model) as unknown;
  // The structure must parse to be drawn; semantic problems (unknown references, islands, …) are drawn and marked.
  const parsed = modelSchema.safeParse(input);
  if (!parsed.success) {
    throw ApiError.conflict(
      `The model cannot be drawn until its values are fixed (${parsed.error.issues.length} problem(s); see the model)`,
    );
  }
  const model: Model = parsed.data;
  if (scenarioId && !(model.scenarios ?? []).some((s) => s.id === scenarioId) && scenarioId !== 'base') {
    throw new ApiError('bad_request', `Unknown scenario "${scenarioId}"`, {
      scenario: 'No such scenario in this model',
    });
  }
  const issues: ModelIssue[] = [...validateModel(model), ...modelIssues(input)];
  if (scenarioId === 'base') scenarioId = undefined;
  const problems = new Set(issues.flatMap((i) => [...(i.elementId ? [i.elementId] : []), ...(i.elementIds ?? [])]));
  const run = study.approvedRunId
    ? await StudyRun.findByPk(study.approvedRunId)
    : await StudyRun.findOne({ where: { studyId: study.id, status: 'done' }, order: [['startedAt', 'DESC']] });
  const hazards = run?.results ? hazardsFromResults(parseStoredResults(run.results)) : new Map<string, BusHazard>();
  const collapsed = collapse === 'none' ? [] : (collapse ?? defaultCollapsed(model));
  const unknown = collapsed.filter((id) => !model.buses.some((b) => b.id === id));
  if (unknown.length) {
    throw new ApiError('bad_request', `Unknown bus "${unknown[0]}" to collapse`, {
      collapsed: `No bus ${unknown[0]} in this model`,
    });
  }
  const drawing = layoutOneLine(model, { hazards, problems, scenarioId, collapsed });
  if (run?.results && run.modelVersion !== study.modelVersion) {
    drawing.notes.push('The model changed after the run shown: run the study again for current values.');
  }
  if (!run?.results) drawing.notes.push('No results yet: run the study to show the hazard at each bus.');
  drawing.notes.push(
    'Estimates from published empirical models and the data entered; not final until a qualified engineer has approved the study.',
  );
  return {
    drawing,
    title: `One-line diagram — ${model.name} (revision ${study.revision})`,
    scenarios: (model.scenarios ?? []).map((s) => ({ id: s.id, name: s.name ?? s.id })),
    scenarioId: scenarioId ?? null,
  };
}

export async function studyOneLineSvg(
  actor: AuthUser,
  studyId: string,
  scenarioId?: string,
  collapse?: CollapseRequest,
): Promise<string> {
  const { drawing, title } = await studyOneLine(actor, studyId, scenarioId, collapse);
  return oneLineSvg(drawing, { title });
}
