import type { Transaction } from 'sequelize';
import { FacilitySettingsRow } from '../../modules/settings/settings.model';
import { DEMO_FACILITY_NAME } from './facility';

/** The demo facility's settings: an invented internal extension and a short local procedure. */
export async function seedSettings(transaction: Transaction) {
  await FacilitySettingsRow.create(
    {
      id: 1,
      facilityName: DEMO_FACILITY_NAME,
      timeZone: 'Europe/Berlin',
      emergencyNumber: '4444 (internal, fictional)',
      localProcedure:
        'Alarm points are by both gowning-room doors. Assembly point: the car park opposite the main entrance.\nAfter the emergency call, ring the cleanroom desk on 4410 (fictional).',
      memberTicketVisibility: 'all',
      updatedById: null,
    },
    { transaction },
  );
}
