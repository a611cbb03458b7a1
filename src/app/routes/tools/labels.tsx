import { useId } from 'react';
import { useSearchParams } from 'react-router';
import { PageHeader } from '@/components/layout/page-header';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { PageSpinner } from '@/components/ui/spinner';
import { useAreas } from '@/features/tools/api/get-areas';
import { useLabels } from '@/features/tools/api/get-labels';
import { LabelSheet } from '@/features/tools/components/label-sheet';

export function LabelsPage() {
  // The area is in the address, so "labels for the litho bay" can be bookmarked.
  const [params, setParams] = useSearchParams();
  const areaParam = Number(params.get('area'));
  const areaId = Number.isInteger(areaParam) && areaParam > 0 ? areaParam : null;
  const setAreaId = (id: number | null) => setParams(id ? { area: String(id) } : {}, { replace: true });
  const selectId = useId();
  const areas = useAreas();
  const labels = useLabels(areaId);
  return (
    <>
      <title>QR labels · Faultline</title>
      {/* The sheet prints alone: the app's bars and footer stay on screen only. */}
      <style>
        {
          '@media print { body header, body footer, .skip-link { display: none !important; } main { padding: 0 !important; max-width: none !important; } }'
        }
      </style>
      <div className="print:hidden">
        <PageHeader
          title="QR labels"
          description="One label per tool. Scanning one opens the tool’s page, where anyone can see its state and report a fault."
          actions={
            <Button onClick={() => window.print()} disabled={!labels.data}>
              Print
            </Button>
          }
        />
        <div className="mb-6 flex w-full flex-col gap-1.5 sm:w-72">
          <label htmlFor={selectId} className="text-sm font-semibold text-ink">
            Area
          </label>
          <select
            id={selectId}
            value={areaId ?? ''}
            onChange={(e) => setAreaId(e.target.value ? Number(e.target.value) : null)}
            className="min-h-11 rounded-lg border border-control bg-card px-3 text-base text-ink amber:border-2"
          >
            <option value="">All areas</option>
            {areas.data?.items.map((a) => (
              <option key={a.id} value={a.id}>
                {a.name}
              </option>
            ))}
          </select>
        </div>
      </div>
      {labels.isPending && <PageSpinner label="Making the labels…" />}
      {labels.isError && <Alert tone="danger">{labels.error.message}</Alert>}
      {labels.data && <LabelSheet labels={labels.data.items} />}
    </>
  );
}

export { LabelsPage as Component };
