import { route, type RouteSpec } from '../../lib/http';
import { facilitySettingsSchema } from '../../../shared/schemas/facility-settings';
import { getFacilitySettings, saveFacilitySettings } from './settings.service';

export function settingsRoutes(): RouteSpec[] {
  return [
    route({
      method: 'get',
      path: '/facility-settings',
      access: 'display',
      summary: 'The facility name, time zone, emergency number, local procedure and ticket visibility',
      handle: ({ deps }) => getFacilitySettings(deps),
    }),
    route({
      method: 'put',
      path: '/admin/facility-settings',
      access: 'admin',
      summary: 'Save the facility settings',
      body: facilitySettingsSchema,
      handle: ({ deps, body, user }) => saveFacilitySettings(deps, body, user!.id),
    }),
  ];
}
