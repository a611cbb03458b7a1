import { useCallback, useMemo, useState } from 'react';
import { useSearchParams } from 'react-router';
import {
  ANALYTICS_SCOPES,
  MAX_PERIOD_DAYS,
  PERIOD_PRESETS,
  presetPeriod,
  type AnalyticsScopeKind,
  type PeriodPreset,
} from '@shared/schemas/analytics';
import type { AnalyticsParams } from '@/features/analytics/api/analytics-keys';

// The period and scope live in the address, so a report can be bookmarked, shared and
// printed as it is. Presets are counted back from the moment the page opened (or was
// refreshed), not from every render, so the report is not refetched every second.

export interface AnalyticsSelection {
  period: PeriodPreset;
  /** Custom dates, local calendar days, YYYY-MM-DD; `toDay` is included. */
  fromDay: string;
  toDay: string;
  scope: AnalyticsScopeKind;
  areaId: number | null;
  toolId: number | null;
}

const DAY_PATTERN = /^\d{4}-\d{2}-\d{2}$/;

function positiveInt(value: string | null): number | null {
  const n = Number(value);
  return value && Number.isInteger(n) && n > 0 ? n : null;
}

/** Local midnight at the start of a YYYY-MM-DD day. */
export function startOfLocalDay(day: string): Date | null {
  if (!DAY_PATTERN.test(day)) return null;
  const [y, m, d] = day.split('-').map(Number);
  const date = new Date(y, m - 1, d);
  return Number.isNaN(date.getTime()) || date.getDate() !== d ? null : date;
}

export function toLocalDay(date: Date): string {
  const pad = (n: number) => String(n).padStart(2, '0');
  return `${date.getFullYear()}-${pad(date.getMonth() + 1)}-${pad(date.getDate())}`;
}

export function readSelection(search: URLSearchParams, anchor: Date): AnalyticsSelection {
  const period = (PERIOD_PRESETS as readonly string[]).includes(search.get('period') ?? '')
    ? (search.get('period') as PeriodPreset)
    : '12m';
  const scope = (ANALYTICS_SCOPES as readonly string[]).includes(search.get('scope') ?? '')
    ? (search.get('scope') as AnalyticsScopeKind)
    : 'facility';
  const defaults = presetPeriod('30d', anchor);
  return {
    period,
    fromDay: search.get('from') ?? toLocalDay(defaults.from),
    toDay: search.get('to') ?? toLocalDay(anchor),
    scope,
    areaId: positiveInt(search.get('area')),
    toolId: positiveInt(search.get('tool')),
  };
}

/** The API parameters of a selection, or the reason it cannot be asked for yet. */
export function paramsOf(selection: AnalyticsSelection, anchor: Date): { params: AnalyticsParams | null; problem: string | null } {
  let from: Date;
  let to: Date;
  if (selection.period === 'custom') {
    const start = startOfLocalDay(selection.fromDay);
    const lastDay = startOfLocalDay(selection.toDay);
    if (!start || !lastDay) return { params: null, problem: 'Enter both dates of the custom period.' };
    // The end date is included: the period runs to the following midnight.
    to = new Date(lastDay.getFullYear(), lastDay.getMonth(), lastDay.getDate() + 1);
    from = start;
    if (to <= from) return { params: null, problem: 'The last day must not come before the first day.' };
    if (to.getTime() - from.getTime() > MAX_PERIOD_DAYS * 86_400_000)
      return { params: null, problem: 'Choose a period of at most five years.' };
    if (from > anchor) return { params: null, problem: 'The period starts in the future; there is nothing to show yet.' };
  } else {
    ({ from, to } = presetPeriod(selection.period, anchor));
  }
  if (selection.scope === 'area' && !selection.areaId) return { params: null, problem: 'Choose an area.' };
  if (selection.scope === 'tool' && !selection.toolId) return { params: null, problem: 'Choose a tool.' };
  return {
    params: {
      from: from.toISOString(),
      to: to.toISOString(),
      scope: selection.scope,
      areaId: selection.scope === 'area' ? selection.areaId! : undefined,
      toolId: selection.scope === 'tool' ? selection.toolId! : undefined,
    },
    problem: null,
  };
}

export function useAnalyticsSelection() {
  const [search, setSearch] = useSearchParams();
  const [anchor, setAnchor] = useState(() => new Date());
  const selection = useMemo(() => readSelection(search, anchor), [search, anchor]);
  const { params, problem } = useMemo(() => paramsOf(selection, anchor), [selection, anchor]);

  const update = useCallback(
    (patch: Partial<AnalyticsSelection>) => {
      setSearch(
        (current) => {
          const next = new URLSearchParams(current);
          const set = (key: string, value: string | number | null | undefined) => {
            if (value === null || value === undefined || value === '') next.delete(key);
            else next.set(key, String(value));
          };
          if ('period' in patch) set('period', patch.period);
          if ('fromDay' in patch) set('from', patch.fromDay);
          if ('toDay' in patch) set('to', patch.toDay);
          if ('scope' in patch) set('scope', patch.scope);
          if ('areaId' in patch) set('area', patch.areaId);
          if ('toolId' in patch) set('tool', patch.toolId);
          return next;
        },
        { replace: true },
      );
    },
    [setSearch],
  );

  /** Counts the presets back from now again (the "Refresh" button). */
  const refresh = useCallback(() => setAnchor(new Date()), []);

  return { selection, params, problem, update, refresh, anchor };
}
