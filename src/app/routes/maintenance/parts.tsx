import { useState } from 'react';
import { PageHeader } from '@/components/layout/page-header';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { PageSpinner } from '@/components/ui/spinner';
import { isApiError } from '@/lib/api-client';
import { useParts, useSavePart } from '@/features/maintenance/api/parts';

/** /maintenance/parts — the spare-parts list: stock, reorder level, add and restock. */
export function PartsPage() {
  const [q, setQ] = useState('');
  const parts = useParts(q ? { q } : {});
  const save = useSavePart();
  const [form, setForm] = useState({ name: '', partNumber: '', stock: '0', reorderLevel: '0' });
  const fields = isApiError(save.error) ? save.error.fields : undefined;
  const input = 'min-h-11 rounded-lg border border-control bg-card px-2 font-normal';
  return (
    <>
      <title>Parts · Faultline</title>
      <PageHeader
        title="Spare parts"
        description="Parts used on tickets and work orders draw the count down; below the reorder level the tools' engineers are told once."
      />
      <div className="flex flex-col gap-6">
        <Card as="section" title="Add a part">
          <form
            className="flex flex-wrap items-end gap-3 px-5 pb-5"
            onSubmit={(e) => {
              e.preventDefault();
              save.mutate({
                input: {
                  name: form.name,
                  partNumber: form.partNumber,
                  stock: Number(form.stock),
                  reorderLevel: Number(form.reorderLevel),
                  toolIds: [],
                },
              });
            }}
          >
            {(
              [
                ['name', 'Name'],
                ['partNumber', 'Part number'],
                ['stock', 'In stock'],
                ['reorderLevel', 'Reorder below'],
              ] as const
            ).map(([k, label]) => (
              <label key={k} className="flex flex-col gap-1 text-sm font-semibold">
                {label}
                <input
                  value={form[k]}
                  onChange={(e) => setForm({ ...form, [k]: e.target.value })}
                  className={input}
                  aria-invalid={Boolean(fields?.[k])}
                  inputMode={k === 'stock' || k === 'reorderLevel' ? 'numeric' : undefined}
                />
                {fields?.[k] && <span className="font-medium text-alert-danger-ink">{fields[k].join(' ')}</span>}
              </label>
            ))}
            <Button type="submit" busy={save.isPending}>
              Add
            </Button>
          </form>
        </Card>
        <Card as="section" title="The list" flush>
          <div className="px-5 pb-3">
            <label className="flex flex-col gap-1 text-sm font-semibold">
              Find
              <input value={q} onChange={(e) => setQ(e.target.value)} className={input} />
            </label>
          </div>
          {parts.isPending && <PageSpinner label="Loading parts…" />}
          {parts.isError && <Alert tone="danger">{parts.error.message}</Alert>}
          {parts.data && (
            <div className="overflow-x-auto" tabIndex={0} role="region" aria-label="Parts (scrolls sideways)">
              <table className="w-full text-sm" data-testid="parts-table">
                <caption className="sr-only">Spare parts</caption>
                <thead>
                  <tr className="border-b border-line text-left text-muted">
                    <th className="px-5 py-2">Part</th>
                    <th className="px-2 py-2">Number</th>
                    <th className="px-2 py-2 text-right">Stock</th>
                    <th className="px-2 py-2 text-right">Reorder below</th>
                    <th className="px-5 py-2">Restock</th>
                  </tr>
                </thead>
                <tbody>
                  {parts.data.items.map((p) => (
                    <tr key={p.id} className="border-b border-line">
                      <td className="px-5 py-2">{p.name}</td>
                      <td className="px-2 py-2 font-mono">{p.partNumber}</td>
                      <td className={`px-2 py-2 text-right ${p.low ? 'font-bold text-alert-danger-ink' : ''}`}>
                        {p.low && '▼ low · '}
                        {p.stock}
                      </td>
                      <td className="px-2 py-2 text-right">{p.reorderLevel}</td>
                      <td className="px-5 py-2">
                        <Button
                          variant="secondary"
                          onClick={() => save.mutate({ id: p.id, input: { stock: p.stock + Math.max(1, p.reorderLevel) } })}
                        >
                          +{Math.max(1, p.reorderLevel)}
                        </Button>
                      </td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          )}
        </Card>
      </div>
    </>
  );
}

export const Component = PartsPage;
