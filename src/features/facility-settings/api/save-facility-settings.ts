import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { FacilitySettings, FacilitySettingsInput } from '@shared/schemas/facility-settings';
import { api } from '@/lib/api-client';
import { facilitySettingsKeys } from '@/lib/facility-settings';

export function saveFacilitySettings(input: FacilitySettingsInput) {
  return api.put<FacilitySettings>('/api/admin/facility-settings', input);
}

export function useSaveFacilitySettings() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: saveFacilitySettings,
    onSuccess: (saved) => {
      queryClient.setQueryData(facilitySettingsKeys.detail(), saved);
      return queryClient.invalidateQueries({ queryKey: facilitySettingsKeys.all });
    },
  });
}
