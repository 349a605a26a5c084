import { randomUUID } from 'node:crypto';
import type { Role } from '../../shared/schemas/common';
import { hashPassword } from '../auth/passwords';
import type { Db } from '../db';
import { Organization, Site, User } from '../db/models';
import { recordAudit } from '../services/audit';
import { seedGenericLibrary } from '../services/deviceTypes';

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

/** Seeds the demo organization, one user per role, and the site. Runs in one transaction. */
export async function seedDemo(db: Db, password: string): Promise<{ organizationId: string; siteId: string }> {
  const hash = await hashPassword(password);
  return db.sequelize.transaction(async (transaction) => {
    const org = await Organization.create({ id: randomUUID(), name: DEMO_ORGANIZATION }, { transaction });
    for (const u of DEMO_USERS) {
      await User.create({ id: randomUUID(), organizationId: org.id, passwordHash: hash, ...u }, { transaction });
    }
    await seedGenericLibrary(org.id, transaction);
    const site = await Site.create({ id: randomUUID(), organizationId: org.id, ...DEMO_SITE }, { transaction });
    await recordAudit({ organizationId: org.id, actorId: null, action: 'demo.seeded', entityType: 'organization', entityId: org.id }, transaction);
    return { organizationId: org.id, siteId: site.id };
  });
}
