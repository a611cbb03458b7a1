import type { Transaction } from 'sequelize';
import type { AppDeps } from '../../lib/http';
import type { FacilitySettings } from '../../../shared/schemas/facility-settings';
import { FacilitySettingsRow } from './settings.model';

const ROW_ID = 1;

/** What a facility that never saved its settings gets: an open facility in the configured time zone. */
function defaults(deps: Pick<AppDeps, 'config'>): FacilitySettings {
  return {
    facilityName: 'Our facility',
    timeZone: deps.config.FACILITY_TIME_ZONE,
    emergencyNumber: '',
    localProcedure: '',
    memberTicketVisibility: 'all',
  };
}

function present(row: FacilitySettingsRow): FacilitySettings {
  return {
    facilityName: row.facilityName,
    timeZone: row.timeZone,
    emergencyNumber: row.emergencyNumber,
    localProcedure: row.localProcedure,
    memberTicketVisibility: row.memberTicketVisibility,
  };
}

/** One primary-key read; cheap enough to ask on every request that needs it (and always current across processes). */
export async function getFacilitySettings(deps: Pick<AppDeps, 'config'>, transaction?: Transaction): Promise<FacilitySettings> {
  const row = await FacilitySettingsRow.findByPk(ROW_ID, { transaction });
  return row ? present(row) : defaults(deps);
}

export async function saveFacilitySettings(deps: AppDeps, input: FacilitySettings, userId: number): Promise<FacilitySettings> {
  await FacilitySettingsRow.upsert({ id: ROW_ID, ...input, updatedById: userId });
  return getFacilitySettings(deps);
}
