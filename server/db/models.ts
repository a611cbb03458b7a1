import type { Sequelize } from 'sequelize';
import { initUserModels } from '../modules/users/user.model';
import { initSessionModels } from '../modules/auth/session.model';
import { initOutboxModel } from '../modules/mail/outbox.model';
import { initFacilityModels } from '../modules/facility/facility.model';
import { initNoticeModel } from '../modules/notices/notice.model';
import { initTicketModels } from '../modules/tickets/ticket.model';
import { initAlarmModels } from '../modules/alarms/alarms.model';
import { initMaintenanceModels } from '../modules/maintenance/maintenance.model';
import { initSettingsModel } from '../modules/settings/settings.model';
import { initPushModels } from '../modules/push/push.model';
import { initOncallModels } from '../modules/oncall/oncall.model';

/** Binds every model to the one Sequelize instance of this process. Order matters for associations. */
export function initModels(sequelize: Sequelize) {
  initUserModels(sequelize);
  initSessionModels(sequelize);
  initOutboxModel(sequelize);
  initFacilityModels(sequelize);
  initNoticeModel(sequelize);
  initTicketModels(sequelize);
  initAlarmModels(sequelize);
  initMaintenanceModels(sequelize);
  initSettingsModel(sequelize);
  initPushModels(sequelize);
  initOncallModels(sequelize);
}
