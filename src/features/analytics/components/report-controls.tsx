import { useId, type ReactNode } from 'react';
import { PERIOD_PRESET_LABELS, PERIOD_PRESETS, type AnalyticsScopeKind, type ScopeOptions } from '@shared/schemas/analytics';
import { cx } from '@/lib/cx';
import type { AnalyticsSelection } from '@/features/analytics/hooks/use-analytics-selection';

const SCOPE_LABELS: Record<AnalyticsScopeKind, string> = { facility: 'Whole facility', area: 'One area', tool: 'One tool' };

function Segmented<T extends string>({
  legend,
  name,
  options,
  value,
  onChange,
}: {
  legend: string;
  name: string;
  options: readonly { value: T; label: string }[];
  value: T;
  onChange: (v: T) => void;
}) {
  return (
    <fieldset className="flex min-w-0 flex-col gap-1.5">
      <legend className="mb-1.5 text-sm font-semibold text-ink">{legend}</legend>
      <div className="flex flex-wrap gap-2">
        {options.map((o) => (
          <label
            key={o.value}
            className={cx(
              'inline-flex min-h-11 cursor-pointer items-center rounded-lg border px-3 text-sm font-semibold amber:border-2',
              'has-[:focus-visible]:outline has-[:focus-visible]:outline-3 has-[:focus-visible]:outline-offset-2 has-[:focus-visible]:outline-focus',
              value === o.value
                ? 'border-accent bg-accent-tint text-accent-ink amber:underline amber:border-4'
                : 'border-control bg-card text-ink hover:bg-sunken',
            )}
          >
            <input
              type="radio"
              name={name}
              value={o.value}
              checked={value === o.value}
              onChange={() => onChange(o.value)}
              className="sr-only"
            />
            {o.label}
          </label>
        ))}
      </div>
    </fieldset>
  );
}

function Labelled({ label, children }: { label: string; children: (id: string) => ReactNode }) {
  const id = useId();
  return (
    <div className="flex min-w-0 flex-col gap-1.5">
      <label htmlFor={id} className="text-sm font-semibold text-ink">
        {label}
      </label>
      {children(id)}
    </div>
  );
}

const control = 'min-h-11 w-full min-w-0 rounded-lg border border-control bg-card px-3 text-base text-ink amber:border-2';

export interface ReportControlsProps {
  selection: AnalyticsSelection;
  update: (patch: Partial<AnalyticsSelection>) => void;
  options: ScopeOptions | undefined;
}

/** The period and scope of the report; every change lands in the address at once. */
export function ReportControls({ selection, update, options }: ReportControlsProps) {
  const areas = options?.areas ?? [];
  const tools = options?.tools ?? [];
  return (
    <form className="flex flex-col gap-5 print:hidden" onSubmit={(e) => e.preventDefault()} aria-label="Period and scope">
      <div className="grid grid-cols-1 gap-5 lg:grid-cols-2">
        <div className="flex flex-col gap-3">
          <Segmented
            legend="Period"
            name="period"
            options={PERIOD_PRESETS.map((p) => ({ value: p, label: PERIOD_PRESET_LABELS[p] }))}
            value={selection.period}
            onChange={(period) => update({ period })}
          />
          {selection.period === 'custom' && (
            <div className="grid grid-cols-2 gap-3">
              <Labelled label="First day">
                {(id) => (
                  <input
                    id={id}
                    type="date"
                    className={control}
                    value={selection.fromDay}
                    onChange={(e) => update({ fromDay: e.target.value })}
                  />
                )}
              </Labelled>
              <Labelled label="Last day (included)">
                {(id) => (
                  <input
                    id={id}
                    type="date"
                    className={control}
                    value={selection.toDay}
                    onChange={(e) => update({ toDay: e.target.value })}
                  />
                )}
              </Labelled>
            </div>
          )}
        </div>
        <div className="flex flex-col gap-3">
          <Segmented
            legend="Scope"
            name="scope"
            options={(['facility', 'area', 'tool'] as const).map((s) => ({ value: s, label: SCOPE_LABELS[s] }))}
            value={selection.scope}
            onChange={(scope) => update({ scope })}
          />
          {selection.scope === 'area' && (
            <Labelled label="Area">
              {(id) => (
                <select
                  id={id}
                  className={control}
                  value={selection.areaId ?? ''}
                  onChange={(e) => update({ areaId: e.target.value ? Number(e.target.value) : null })}
                >
                  <option value="">Choose an area…</option>
                  {areas.map((a) => (
                    <option key={a.id} value={a.id}>
                      {a.name}
                    </option>
                  ))}
                </select>
              )}
            </Labelled>
          )}
          {selection.scope === 'tool' && (
            <Labelled label="Tool">
              {(id) => (
                <select
                  id={id}
                  className={control}
                  value={selection.toolId ?? ''}
                  onChange={(e) => update({ toolId: e.target.value ? Number(e.target.value) : null })}
                >
                  <option value="">Choose a tool…</option>
                  {areas.map((a) => (
                    <optgroup key={a.id} label={a.name}>
                      {tools
                        .filter((t) => t.areaId === a.id)
                        .map((t) => (
                          <option key={t.id} value={t.id}>
                            {t.code} · {t.name}
                            {t.retired ? ' (retired)' : ''}
                          </option>
                        ))}
                    </optgroup>
                  ))}
                </select>
              )}
            </Labelled>
          )}
        </div>
      </div>
    </form>
  );
}
