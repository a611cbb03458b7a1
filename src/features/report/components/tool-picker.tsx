import { useEffect, useId, useState } from 'react';
import type { ToolChoice } from '@shared/schemas/tickets';
import { Spinner } from '@/components/ui/spinner';
import { useToolChoices } from '@/features/report/api/get-tool-choices';

/** Search by name or code; each result is one big button. */
export function ToolPicker({ onPick, errors }: { onPick: (tool: ToolChoice) => void; errors?: string[] }) {
  const id = useId();
  const [text, setText] = useState('');
  const [query, setQuery] = useState('');
  useEffect(() => {
    const t = setTimeout(() => setQuery(text.trim()), 200);
    return () => clearTimeout(t);
  }, [text]);
  const choices = useToolChoices({ q: query || undefined });

  return (
    <div className="flex flex-col gap-2">
      <label htmlFor={id} className="text-base font-semibold text-ink">
        Which tool? <span className="font-normal text-muted">(required)</span>
      </label>
      <p className="text-sm text-muted">Scan the QR label on the tool, or type part of its name or code.</p>
      <input
        id={id}
        type="search"
        inputMode="search"
        autoComplete="off"
        value={text}
        onChange={(e) => setText(e.target.value)}
        placeholder="e.g. etcher, TRACK-A"
        aria-invalid={errors?.length ? true : undefined}
        className="min-h-13 w-full rounded-xl border border-control bg-card px-4 text-lg text-ink amber:border-2"
      />
      {errors?.map((e) => (
        <p key={e} className="text-sm font-medium text-alert-danger-ink">
          {e}
        </p>
      ))}
      {choices.isFetching && !choices.data && <Spinner label="Looking for tools…" showLabel />}
      {choices.data && (
        <ul className="flex flex-col gap-2" aria-label="Matching tools">
          {choices.data.items.length === 0 && <li className="text-sm text-muted">No tool matches “{query}”.</li>}
          {choices.data.items.map((t) => (
            <li key={t.id}>
              <button
                type="button"
                onClick={() => onPick(t)}
                className="flex min-h-13 w-full flex-col items-start rounded-xl border border-control bg-card px-4 py-2 text-left hover:bg-sunken amber:border-2"
              >
                <span className="font-semibold text-ink">{t.name}</span>
                <span className="text-sm text-muted">
                  <span className="font-mono">{t.code}</span>
                  {t.areaName ? ` · ${t.areaName}` : ''}
                </span>
              </button>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
