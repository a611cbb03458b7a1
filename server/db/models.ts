import type { Sequelize } from 'sequelize';
import { initUserModels, User } from '../modules/users/user.model';
import { initSessionModels } from '../modules/auth/session.model';
import { initAccountLinkModels } from '../modules/auth/account-link.model';
import { initOutboxModel } from '../lib/outbox.model';
import { initThrottleModel } from '../lib/throttle.model';
import { initFacilityModels, Tool, ToolModule } from '../modules/facility/facility.model';
import { initNoticeModel } from '../modules/notices/notice.model';
import { initTicketModels, Photo, Ticket, TicketEvent } from '../modules/tickets/ticket.model';
import { initAlarmModels } from '../modules/alarms/alarms.model';
import { initMaintenanceModels } from '../modules/maintenance/maintenance.model';
import { initSettingsModel } from '../modules/settings/settings.model';
import { initPushModels } from '../modules/push/push.model';

/** Binds every model to the one Sequelize instance of this process. Order matters for associations. */
export function initModels(sequelize: Sequelize) {
  initUserModels(sequelize);
  initSessionModels(sequelize);
  initAccountLinkModels(sequelize);
  initThrottleModel(sequelize);
  initOutboxModel(sequelize);
  initFacilityModels(sequelize);
  initNoticeModel(sequelize);
  initTicketModels(sequelize);
  initAlarmModels(sequelize);
  initMaintenanceModels(sequelize);
  initSettingsModel(sequelize);
  initPushModels(sequelize);
  associateAcrossModules();
}

/**
 * Associations between models of different modules live here, the one file that knows every
 * model, so a module can join another's table by association name without importing its models.
 */
function associateAcrossModules() {
  Ticket.belongsTo(Tool, { as: 'tool', foreignKey: 'toolId' });
  Ticket.belongsTo(ToolModule, { as: 'module', foreignKey: 'moduleId' });
  Ticket.belongsTo(User, { as: 'reporter', foreignKey: 'reporterId' });
  Ticket.belongsTo(User, { as: 'assignee', foreignKey: 'assigneeId' });
  TicketEvent.belongsTo(User, { as: 'actor', foreignKey: 'actorId' });
  Photo.belongsTo(User, { as: 'uploader', foreignKey: 'uploaderId' });
  Tool.hasMany(Ticket, { as: 'tickets', foreignKey: 'toolId' });
}
