import { randomUUID } from 'node:crypto';
import type { Role } from '../../shared/schemas/common';
import { hashPassword } from '../auth/passwords';
import { Organization, Site, User } from '../db/models';
import type { AppContext, AuthUser } from '../http/context';
import { recordAudit } from '../services/audit';
import { seedGenericLibrary } from '../services/deviceTypes';
import { startRun } from '../services/runs';
import { approveStudy, createStudy, saveModel, submitForReview } from '../services/studies';
import { larkspurModel } from './larkspurModel';

/** The invented demo scenario (DESIGN.md §9). Every name here is fictional. */
export const DEMO_ORGANIZATION = 'Larkspur Valley Utility District';
export const DEMO_SITE = {
  name: 'Larkspur Valley Water Reclamation Facility',
  address: '1 Reclamation Way, Larkspur Valley (fictional)',
  description:
    '12.47 kV utility service, main switchgear, two 480 V unit substations (1500 kVA and 750 kVA), a 480 V switchboard, ' +
    'two motor control centres with pump motors, panelboards and a standby generator.',
};
export const DEMO_USERS: { email: string; name: string; role: Role }[] = [
  { email: 'admin@larkspur.example', name: 'Robin Okafor-Lind', role: 'admin' },
  { email: 'engineer@larkspur.example', name: 'Sam Ardent', role: 'engineer' },
  { email: 'electrician@larkspur.example', name: 'Jo Halvorsen-Reyes', role: 'electrician' },
  { email: 'safety@larkspur.example', name: 'Kit Marchetti-Vale', role: 'safety' },
];

export async function isEmpty(): Promise<boolean> {
  return (await Organization.count()) === 0;
}

/**
 * Seeds the demo organization, one user per role, the site and its device library (one transaction), then the
 * site's study: the model, a run, and one approved revision — through the same services the API uses.
 */
export async function seedDemo(ctx: AppContext, password: string): Promise<{ organizationId: string; siteId: string; studyId: string }> {
  const hash = await hashPassword(password);
  const seeded = await ctx.db.sequelize.transaction(async (transaction) => {
    const org = await Organization.create({ id: randomUUID(), name: DEMO_ORGANIZATION }, { transaction });
    for (const u of DEMO_USERS) {
      await User.create({ id: randomUUID(), organizationId: org.id, passwordHash: hash, ...u }, { transaction });
    }
    await seedGenericLibrary(org.id, transaction);
    const site = await Site.create({ id: randomUUID(), organizationId: org.id, ...DEMO_SITE }, { transaction });
    await recordAudit({ organizationId: org.id, actorId: null, action: 'demo.seeded', entityType: 'organization', entityId: org.id }, transaction);
    return { organizationId: org.id, siteId: site.id };
  });
  const engineerRow = await User.findOne({ where: { organizationId: seeded.organizationId, role: 'engineer' } });
  if (!engineerRow) throw new Error('demo engineer missing');
  const engineer: AuthUser = {
    id: engineerRow.id,
    organizationId: engineerRow.organizationId,
    role: 'engineer',
    email: engineerRow.email,
    name: engineerRow.name,
    jti: 'seed',
    tokenExpiresAt: new Date(0),
  };
  const study = await createStudy(ctx, engineer, seeded.siteId, { title: 'Arc-flash study, whole facility' });
  await saveModel(ctx, engineer, study.id, larkspurModel() as Record<string, unknown>, null, 'study.model-imported', { files: ['demo'] });
  await startRun(ctx, engineer, study.id);
  await ctx.jobs.idle();
  await submitForReview(ctx, engineer, study.id);
  await approveStudy(ctx, engineer, study.id, {
    approverName: engineerRow.name,
    licenceNumber: 'PE-DEMO-0417',
    jurisdiction: 'Larkspur Valley (fictional)',
    confirm: true,
  });
  return { ...seeded, studyId: study.id };
}
