/**
 * Who may do what: one map from named capabilities to the roles that hold them, for the app's navigation, its guarded
 * pages and every button that only some roles see.
 *
 * The API's route access lists (`access` of each route in the route table) stay the authority for what the server
 * allows. Every capability that a route checks names its routes in `CAPABILITY_ROUTES`, and
 * tests/api/permissions.test.ts checks that the roles here equal each route's access list and that every route with
 * a list of roles belongs to one capability: a change on one side without the other fails that test.
 *
 * The other capabilities are the app's own (what a role is shown; the server decides what it may read). The two that
 * mirror what the API shows a role (`seeAllFieldReports`, `seeUnapprovedStudies`) are checked against its answers in
 * the same test.
 */
import { ROLES, type Role } from './schemas/common';

export const PERMISSIONS = {
  // —— Checked by API routes (CAPABILITY_ROUTES) ——
  /** People and invitations: list, create, change role, deactivate, invite, resend, revoke. */
  manageUsers: ['admin'],
  /** The organization settings (label defaults, reminder hour, study defaults). */
  manageSettings: ['admin'],
  /** Mail captured by the local mail sink. */
  readOutbox: ['admin'],
  /** Create and edit sites. */
  editSites: ['admin', 'engineer'],
  /** Add, edit and remove device types of the library. */
  editDevices: ['engineer'],
  /** Start a study of a site (a new draft revision). */
  startStudy: ['engineer'],
  /** Read a revision's system model and export it. */
  readModel: ['engineer', 'safety', 'admin'],
  /** Change a draft's model: edit and save, or import a workbook, CSV files or JSON. */
  editModel: ['engineer'],
  /** Run a study on its current model. */
  runStudy: ['engineer'],
  /** Submit a draft for review, return it to draft, approve it, start a new revision from an approved one. */
  approveStudy: ['engineer'],
  /** Mitigation options for a bus, and applying one in a new draft revision. */
  mitigate: ['engineer'],
  /** The study report PDF. */
  downloadReport: ['engineer', 'safety', 'admin'],
  /** Make label PDFs (print batches, all labels of a revision). */
  printLabels: ['electrician', 'engineer', 'admin'],
  /** Mark a label installed with a photo. */
  installLabels: ['electrician', 'engineer'],
  /** Report what does not match a label. */
  reportField: ['electrician', 'engineer', 'safety'],
  /** Acknowledge and resolve field reports. */
  triageReports: ['engineer', 'safety'],
  /** The attention dashboard and its lists. */
  viewAttention: ['admin', 'engineer', 'safety'],
  /** Search and export the audit log. */
  viewAudit: ['admin', 'engineer', 'safety'],
  /** Reminder rules: create, change, delete, send now, read deliveries. */
  manageReminders: ['admin', 'safety'],
  /** Approve outside e-mail addresses on a reminder rule. */
  approveReminderEmails: ['admin'],

  // —— The app's own ——
  /** Run a spot check (one equipment, no model; the API's calculation routes are open to every signed-in user). */
  spotCheck: ['engineer'],
  /** The Scan page (check a label by its code) in the navigation. */
  scanLabels: ['electrician', 'engineer', 'safety'],
  /** The label page opens with the field actions (mark installed, report a mismatch): the electrician's work. */
  fieldWork: ['electrician'],
  /** Sees every field report of the organization (the server shows an electrician only their own). */
  seeAllFieldReports: ['admin', 'engineer', 'safety'],
  /** Sees draft and in-review revisions (the server shows an electrician approved and superseded ones only). */
  seeUnapprovedStudies: ['admin', 'engineer', 'safety'],
} as const satisfies Record<string, readonly Role[]>;

export type Capability = keyof typeof PERMISSIONS;

export const CAPABILITIES = Object.keys(PERMISSIONS) as Capability[];

/** Whether a role holds a capability. */
export function can(role: Role, capability: Capability): boolean {
  return (PERMISSIONS[capability] as readonly Role[]).includes(role);
}

/** The roles that hold a capability, in the order of ROLES. */
export function rolesThatCan(capability: Capability): Role[] {
  return ROLES.filter((r) => can(r, capability));
}

/**
 * The API routes (`METHOD /path`, as in the route table) each capability stands for. A capability listed here must hold
 * exactly the roles of each of its routes' access lists (tests/api/permissions.test.ts).
 */
export const CAPABILITY_ROUTES: Partial<Record<Capability, readonly string[]>> = {
  manageUsers: [
    'GET /users',
    'POST /users',
    'PATCH /users/:userId',
    'GET /invitations',
    'POST /invitations',
    'POST /invitations/:invitationId/resend',
    'DELETE /invitations/:invitationId',
  ],
  manageSettings: ['PUT /organization/settings'],
  readOutbox: ['GET /outbox'],
  editSites: ['POST /sites', 'PUT /sites/:siteId'],
  editDevices: [
    'POST /device-types',
    'PUT /device-types/:deviceTypeId',
    'DELETE /device-types/:deviceTypeId',
    'POST /device-types/parse-band-csv',
  ],
  startStudy: ['POST /sites/:siteId/studies'],
  readModel: [
    'GET /studies/:studyId/model',
    'GET /studies/:studyId/export',
    'GET /studies/:studyId/one-line.svg',
    'GET /studies/:studyId/one-line',
    'GET /studies/:studyId/compare/:otherStudyId',
  ],
  editModel: ['PUT /studies/:studyId/model', 'POST /studies/:studyId/import'],
  runStudy: ['POST /studies/:studyId/run'],
  approveStudy: [
    'POST /studies/:studyId/submit',
    'POST /studies/:studyId/return-to-draft',
    'POST /studies/:studyId/approve',
    'POST /studies/:studyId/revise',
  ],
  mitigate: ['POST /studies/:studyId/mitigate', 'POST /studies/:studyId/mitigate/apply'],
  downloadReport: ['GET /studies/:studyId/report.pdf'],
  printLabels: [
    'POST /label-batches',
    'GET /label-batches/:batchId',
    'GET /label-batches/:batchId/file',
    'GET /studies/:studyId/labels.pdf',
  ],
  installLabels: ['POST /labels/:code/installed'],
  reportField: ['POST /labels/:code/reports'],
  triageReports: ['POST /field-reports/:reportId/triage'],
  viewAttention: ['GET /attention', 'GET /attention/:list', 'GET /attention/:list/export.csv'],
  viewAudit: ['GET /audit-events', 'GET /audit-events/export.csv'],
  manageReminders: [
    'GET /reminder-rules',
    'POST /reminder-rules',
    'PUT /reminder-rules/:ruleId',
    'DELETE /reminder-rules/:ruleId',
    'POST /reminders/send-now',
    'GET /reminders/deliveries',
  ],
  approveReminderEmails: ['POST /reminder-rules/:ruleId/approve-emails'],
};
