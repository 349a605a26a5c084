import { compareBusResults, compareModels } from '../../shared/revisionCompare';
import type { RevisionComparison } from '../../shared/schemas/compare';
import type { StudyResults } from '../../shared/schemas/studyResults';
import { parseStoredResults } from '../engine/study/storedResults';
import { Study, StudyRun } from '../db/models';
import type { AuthUser } from './context';
import { ApiError } from './errors';
import { findStudy } from './scope';

/** The run a revision's results stand on: the approved run, or else its latest finished run. */
async function resultsRun(study: Study): Promise<StudyRun | null> {
  return study.approvedRunId
    ? StudyRun.findByPk(study.approvedRunId)
    : StudyRun.findOne({ where: { studyId: study.id, status: 'done' }, order: [['startedAt', 'DESC']] });
}

/**
 * What changed from `otherStudyId` (the baseline, usually the approved revision) to `studyId`: the models as stored,
 * and the results of each revision's run (shared/revisionCompare.ts). Both revisions must belong to the same site.
 */
export async function compareRevisions(
  actor: AuthUser,
  studyId: string,
  otherStudyId: string,
): Promise<RevisionComparison> {
  const study = await findStudy(actor, studyId);
  const baseline = await findStudy(actor, otherStudyId);
  if (study.siteId !== baseline.siteId) {
    throw new ApiError('bad_request', 'Compare two revisions of the same site', {
      otherStudyId: 'This revision belongs to another site',
    });
  }
  const [run, baseRun] = await Promise.all([resultsRun(study), resultsRun(baseline)]);
  const notes: string[] = [];
  const resultsOf = (s: Study, r: StudyRun | null): StudyResults['buses'] => {
    if (!r?.results) {
      notes.push(`Revision ${s.revision} has no results yet: run it to compare the hazard at each bus.`);
      return [];
    }
    if (r.modelVersion !== s.modelVersion) {
      notes.push(
        `Revision ${s.revision}'s results are from an earlier version of its model: run it again for results that match the model compared.`,
      );
    }
    return parseStoredResults(r.results).buses;
  };
  const after = resultsOf(study, run);
  const before = resultsOf(baseline, baseRun);
  const elements = compareModels(JSON.parse(baseline.model), JSON.parse(study.model));
  const buses = run?.results && baseRun?.results ? compareBusResults(before, after) : [];
  const ref = (s: Study, r: StudyRun | null) => ({
    id: s.id,
    revision: s.revision,
    title: s.title,
    status: s.status,
    runId: r?.results ? r.id : null,
    resultsCurrent: !!r?.results && r.modelVersion === s.modelVersion,
  });
  return {
    study: ref(study, run),
    baseline: ref(baseline, baseRun),
    model: {
      counts: {
        added: elements.filter((e) => e.change === 'added').length,
        removed: elements.filter((e) => e.change === 'removed').length,
        changed: elements.filter((e) => e.change === 'changed').length,
      },
      elements,
    },
    buses,
    counts: {
      higher: buses.filter((b) => (b.energyRiseCalPerCm2 ?? 0) > 0).length,
      lower: buses.filter((b) => (b.energyRiseCalPerCm2 ?? 0) < 0).length,
      ppeLevelChanged: buses.filter((b) => b.ppeLevelChanged).length,
      signalWordChanged: buses.filter((b) => b.signalWordChanged).length,
    },
    notes,
  };
}

/**
 * The revision a study is compared with by default (the study report; the overview offers the same): the site's
 * approved revision when it is another one, else the revision the study was started from; null when there is none.
 */
export async function defaultBaselineId(actor: AuthUser, studyId: string): Promise<string | null> {
  const study = await findStudy(actor, studyId);
  const approved = await Study.findOne({
    where: { siteId: study.siteId, organizationId: actor.organizationId, status: 'approved' },
    attributes: ['id'],
  });
  if (approved && approved.id !== study.id) return approved.id;
  return study.parentStudyId ?? null;
}
