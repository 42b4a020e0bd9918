import { queryOptions, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { LabSettingsSchema, type LabSettings } from '../../shared/schemas/lab-settings';
import { api } from './api-client';
import { queryKeys } from './queries/query-keys';

/** Query key of the lab's settings. */
export const LAB_SETTINGS_QUERY_KEY = queryKeys.settings;

/** GET /api/settings (every signed-in role reads it: units and time zone apply to all screens). */
export const labSettingsQueryOptions = () =>
  queryOptions({
    queryKey: LAB_SETTINGS_QUERY_KEY,
    queryFn: () => api('/api/settings', { schema: z.object({ settings: LabSettingsSchema }) }).then((b) => b.settings),
  });

const DEFAULTS: LabSettings = LabSettingsSchema.parse({});

/** The lab's display preferences; the defaults stand in until (or unless) the server answers. */
export function useLabSettings(): LabSettings {
  const query = useQuery(labSettingsQueryOptions());
  return query.data ?? DEFAULTS;
}

/** A date-time in the lab's time zone, with the zone, e.g. "2026-12-01 22:14 UTC". */
export function formatLabTime(iso: string | null | undefined, timeZone: string): string {
  if (!iso) return '—';
  const date = new Date(iso);
  if (Number.isNaN(date.getTime())) return '—';
  return new Intl.DateTimeFormat('en-CA', {
    timeZone,
    year: 'numeric',
    month: '2-digit',
    day: '2-digit',
    hour: '2-digit',
    minute: '2-digit',
    hour12: false,
    timeZoneName: 'short',
  })
    .format(date)
    .replace(',', '');
}
