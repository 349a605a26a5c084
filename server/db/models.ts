/** The database models, one file per domain under ./models/; everything is re-exported here. */
import type { Sequelize } from 'sequelize';
import { initLinkToken, initOrganization, initRevokedToken, initUser } from './models/users';
import { initDeviceType, initEquipment, initSite, initStudy, initStudyRun } from './models/studies';
import { initFieldReport, initLabel, initLabelBatch } from './models/labels';
import { initAuditEvent, initCapturedMail, initReminderDeliveryRow, initReminderRuleRow } from './models/audit';

export { Organization, User, LinkToken, RevokedToken, type LinkPurpose } from './models/users';
export {
  Site,
  DeviceType,
  GenericLibraryOffer,
  Study,
  StudyRun,
  Equipment,
  type StudyStatus,
  type RunStatus,
} from './models/studies';
export { Label, FieldReport, LabelBatch, type FieldReportStatus } from './models/labels';
export { AuditEvent, ReminderRuleRow, ReminderDeliveryRow, CapturedMail } from './models/audit';

export function initModels(sequelize: Sequelize): void {
  initOrganization(sequelize);
  initUser(sequelize);
  initSite(sequelize);
  initAuditEvent(sequelize);
  initDeviceType(sequelize);
  initStudy(sequelize);
  initStudyRun(sequelize);
  initEquipment(sequelize);
  initLabel(sequelize);
  initFieldReport(sequelize);
  initLinkToken(sequelize);
  initReminderRuleRow(sequelize);
  initReminderDeliveryRow(sequelize);
  initCapturedMail(sequelize);
  initLabelBatch(sequelize);
  initRevokedToken(sequelize);
}
