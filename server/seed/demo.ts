import { randomUUID } from 'node:crypto';
import type { Role } from '../../shared/schemas/common';
import { hashPassword } from '../auth/passwords';
import { Label, Organization, Site, User } from '../db/models';
import type { AppContext, AuthUser } from '../services/context';
import { recordAudit } from '../services/audit';
import { seedGenericLibrary } from '../services/deviceTypes';
import { addMonths } from '../services/dates';
import { markInstalled, reportMismatch } from '../services/labels';
import { seedDefaultReminderRules } from '../services/reminders';
import { startRun } from '../services/runs';
import { approveStudy, createStudy, saveModel, submitForReview } from '../services/studies';
import { larkspurModel } from './larkspurModel';
import { pumpStationModel } from './pumpStationModel';
import { solidsBuildingModel } from './solidsBuildingModel';

/** The invented demo scenario (docs/ARCHITECTURE.md, Demo data). Every name here is fictional. */
export const DEMO_ORGANIZATION = 'Larkspur Valley Utility District';
export const DEMO_SITE = {
  name: 'Larkspur Valley Water Reclamation Facility',
  address: '1 Reclamation Way, Larkspur Valley (fictional)',
  description:
    '12.47 kV utility service, main switchgear, two 480 V unit substations (1500 kVA and 750 kVA), a 480 V switchboard, ' +
    'two motor control centres with pump motors, panelboards and a standby generator.',
};
/** A second, smaller site whose study was approved almost five years ago (its review comes due in the demo). */
export const DEMO_PUMP_STATION = {
  name: 'Larkspur Valley Raw Water Pump Station',
  address: '40 Intake Road, Larkspur Valley (fictional)',
  description: '12.47 kV tap, one 750 kVA unit substation at 480 V, a raw-water pump MCC and a power panel.',
};
/** A third site, its study still a draft: a double-ended substation described in operating scenarios. */
export const DEMO_SOLIDS_BUILDING = {
  name: 'Larkspur Valley Solids Handling Building',
  address: '3 Reclamation Way, Larkspur Valley (fictional)',
  description:
    'Double-ended 480 V substation on two 12.47 kV feeders with a normally open tie, a dewatering MCC and a standby ' +
    'generator; studied in four operating states.',
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
export async function seedDemo(
  ctx: AppContext,
  password: string,
): Promise<{ organizationId: string; siteId: string; studyId: string }> {
  const hash = await hashPassword(password);
  const seeded = await ctx.db.sequelize.transaction(async (transaction) => {
    const org = await Organization.create({ id: randomUUID(), name: DEMO_ORGANIZATION }, { transaction });
    for (const u of DEMO_USERS) {
      await User.create({ id: randomUUID(), organizationId: org.id, passwordHash: hash, ...u }, { transaction });
    }
    await seedGenericLibrary(org.id, transaction);
    await seedDefaultReminderRules(org.id, transaction);
    const site = await Site.create({ id: randomUUID(), organizationId: org.id, ...DEMO_SITE }, { transaction });
    await recordAudit(
      { organizationId: org.id, actorId: null, action: 'demo.seeded', entityType: 'organization', entityId: org.id },
      transaction,
    );
    return { organizationId: org.id, siteId: site.id };
  });
  const userOf = async (role: Role): Promise<AuthUser> => {
    const row = await User.findOne({ where: { organizationId: seeded.organizationId, role } });
    if (!row) throw new Error(`demo ${role} missing`);
    return {
      id: row.id,
      organizationId: row.organizationId,
      role,
      email: row.email,
      name: row.name,
      jti: 'seed',
      tokenExpiresAt: new Date(0),
    };
  };
  const engineer = await userOf('engineer');
  const electrician = await userOf('electrician');
  const approval = {
    approverName: engineer.name,
    licenceNumber: 'PE-DEMO-0417',
    jurisdiction: 'Larkspur Valley (fictional)',
    confirm: true as const,
  };
  const now = ctx.now();
  const DAY = 86_400_000;
  /** The same context with the clock set to a moment of the demo's past. */
  const at = (d: Date): AppContext => ({ ...ctx, now: () => d });

  // The pump station: approved 60 months less 40 days ago, two of its three labels installed two weeks later, and a
  // field report from twelve days ago still open. The dashboard then shows a review due, a label not installed and
  // an open report.
  const approvedAt = new Date(addMonths(now, -60).getTime() + 40 * DAY);
  const createSite = (details: typeof DEMO_PUMP_STATION) =>
    ctx.db.sequelize.transaction(async (transaction) => {
      const site = await Site.create(
        { id: randomUUID(), organizationId: seeded.organizationId, ...details },
        { transaction },
      );
      await recordAudit(
        {
          organizationId: seeded.organizationId,
          actorId: engineer.id,
          action: 'site.created',
          entityType: 'site',
          entityId: site.id,
          summary: { name: site.name },
        },
        transaction,
      );
      return site;
    });
  const pump = await createSite(DEMO_PUMP_STATION);
  const old = at(new Date(approvedAt.getTime() - 2 * DAY));
  const pumpStudy = await createStudy(old, engineer, pump.id, { title: 'Arc-flash study, pump station' });
  await saveModel(old, engineer, pumpStudy.id, pumpStationModel(), null, 'study.model-imported', { files: ['demo'] });
  await startRun(old, engineer, pumpStudy.id);
  await ctx.jobs.idle();
  await submitForReview(old, engineer, pumpStudy.id);
  await approveStudy(at(approvedAt), engineer, pumpStudy.id, approval);
  const pumpLabels = await Label.findAll({ where: { studyId: pumpStudy.id }, order: [['equipmentTag', 'ASC']] });
  for (const l of pumpLabels.filter((x) => x.equipmentTag !== 'PS-PP')) {
    await markInstalled(at(new Date(approvedAt.getTime() + 14 * DAY)), electrician, l.id, null);
  }
  const pumpMcc = pumpLabels.find((l) => l.equipmentTag === 'PS-MCC');
  if (pumpMcc) {
    await reportMismatch(
      at(new Date(now.getTime() - 12 * DAY)),
      electrician,
      pumpMcc.id,
      {
        kind: 'equipment-changed',
        text: 'Pump 2 replaced with a larger motor (nameplate 200 hp); the label was made for 150 hp.',
      },
      null,
    );
  }

  // The facility: its study, run and approved today.
  const study = await createStudy(ctx, engineer, seeded.siteId, { title: 'Arc-flash study, whole facility' });
  await saveModel(ctx, engineer, study.id, larkspurModel(), null, 'study.model-imported', {
    files: ['demo'],
  });
  await startRun(ctx, engineer, study.id);
  await ctx.jobs.idle();
  await submitForReview(ctx, engineer, study.id);
  await approveStudy(ctx, engineer, study.id, approval);
  const lp1 = await Label.findOne({ where: { studyId: study.id, equipmentTag: 'LP-1' } });
  if (lp1) {
    await reportMismatch(
      ctx,
      electrician,
      lp1.id,
      {
        kind: 'device',
        text: 'Lighting transformer nameplate reads 30 kVA, not 15 kVA.',
      },
      null,
    );
  }

  // The solids handling building: a draft study with operating scenarios, run and not yet submitted (its labels are
  // taken from the worst scenario at each bus).
  const solids = await createSite(DEMO_SOLIDS_BUILDING);
  const solidsStudy = await createStudy(ctx, engineer, solids.id, {
    title: 'Arc-flash study with operating scenarios',
  });
  await saveModel(ctx, engineer, solidsStudy.id, solidsBuildingModel(), null, 'study.model-imported', {
    files: ['demo'],
  });
  await startRun(ctx, engineer, solidsStudy.id);
  await ctx.jobs.idle();
  return { ...seeded, studyId: study.id };
}
