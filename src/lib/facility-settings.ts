import { queryOptions, useQuery } from '@tanstack/react-query';
import type { FacilitySettings } from '@shared/schemas/facility-settings';
import { api } from '@/lib/api-client';

// The facility's settings are read by many features (report form, tickets, lobby display,
// analytics) and written by one admin page, so the query lives here rather than in a feature.

export const facilitySettingsKeys = {
  all: ['facility-settings'] as const,
  detail: (displayKey?: string) => [...facilitySettingsKeys.all, displayKey ?? 'session'] as const,
};

export function getFacilitySettings(options: { signal?: AbortSignal; displayKey?: string } = {}): Promise<FacilitySettings> {
  return api.get<FacilitySettings>('/api/facility-settings', {
    signal: options.signal,
    headers: options.displayKey ? { 'X-Display-Key': options.displayKey } : undefined,
  });
}

export function facilitySettingsQueryOptions(displayKey?: string) {
  return queryOptions({
    queryKey: facilitySettingsKeys.detail(displayKey),
    queryFn: ({ signal }) => getFacilitySettings({ signal, displayKey }),
    staleTime: 5 * 60_000,
  });
}

export function useFacilitySettings(displayKey?: string) {
  return useQuery(facilitySettingsQueryOptions(displayKey));
}
