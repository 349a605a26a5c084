/**
 * Organization-scoped look-ups, in one place: every read of a site or a study by id goes through here, so another
 * organization's id is simply not found, and an electrician finds only approved work (and what it superseded).
 */
import type { Transaction } from 'sequelize';
import { can } from '../../shared/permissions';
import { Site, Study } from '../db/models';
import type { AuthUser } from './context';
import { ApiError } from './errors';

/** The statuses of revisions that a role without `seeUnapprovedStudies` (the electrician) sees. */
export const APPROVED_WORK = ['approved', 'superseded'];

/** Whether the actor sees a revision of this status. */
export function seesStudyStatus(actor: AuthUser, status: string): boolean {
  return can(actor.role, 'seeUnapprovedStudies') || APPROVED_WORK.includes(status);
}

export async function findSite(actor: AuthUser, siteId: string, transaction?: Transaction): Promise<Site> {
  const site = await Site.findOne({ where: { id: siteId, organizationId: actor.organizationId }, transaction });
  if (!site) throw ApiError.notFound('No such site');
  return site;
}

export async function findStudy(actor: AuthUser, studyId: string, transaction?: Transaction): Promise<Study> {
  const study = await Study.findOne({ where: { id: studyId, organizationId: actor.organizationId }, transaction });
  if (!study || !seesStudyStatus(actor, study.status)) throw ApiError.notFound('No such study');
  return study;
}

/**
 * The same look-up and visibility rule as `findStudy`, reading only the columns a results request needs (never the
 * model, which can be megabytes): for the routes every results page and bus goes through.
 */
export async function findStudyHead(
  actor: AuthUser,
  studyId: string,
): Promise<{ id: string; status: string; approvedRunId: string | null }> {
  const study = await Study.findOne({
    where: { id: studyId, organizationId: actor.organizationId },
    attributes: ['id', 'status', 'approvedRunId'],
    raw: true,
  });
  if (!study || !seesStudyStatus(actor, study.status)) throw ApiError.notFound('No such study');
  return { id: study.id, status: study.status, approvedRunId: study.approvedRunId ?? null };
}
