import { HAZARD_CAUTIONS } from '@shared/report-options';
import { Alert } from '@/components/ui/alert';

/** The usual cautions, shown wherever a hazard is named; the last line states the app's limits. */
export function HazardCautions({ className }: { className?: string }) {
  return (
    <Alert tone="danger" title="Safety first — the usual cautions" className={className}>
      <ul className="list-disc space-y-1 pl-5" data-testid="hazard-cautions">
        {HAZARD_CAUTIONS.map((line) => (
          <li key={line}>{line}</li>
        ))}
      </ul>
    </Alert>
  );
}
