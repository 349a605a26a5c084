/** What the study report is drawn from. */
import type { RevisionComparison } from '../../../shared/schemas/compare';
import type { Model } from '../../../shared/schemas/model';
import type { StudyDto } from '../../../shared/schemas/studies';
import type { StudyResults } from '../../../shared/schemas/studyResults';
import type { MitigationAppendix } from './mitigation';

export interface StudyReportInput {
  organizationName: string;
  site: { name: string; address: string };
  study: StudyDto;
  results: StudyResults;
  model: Model;
  cautions: readonly string[];
  /** What changed from another revision of the site (by default the approved one); absent when there is none. */
  comparison?: RevisionComparison;
  /** The mitigation appendix (buses above a chosen energy and their options); absent when not asked for. */
  mitigation?: MitigationAppendix;
}

/** An approved (or later superseded) revision with its approval: the report carries the approval block. */
export function isApproved(study: StudyDto): boolean {
  return study.approval !== null && (study.status === 'approved' || study.status === 'superseded');
}
