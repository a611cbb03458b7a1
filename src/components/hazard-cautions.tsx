import { forwardRef } from 'react';
import { cautionsFor } from '@shared/hazard-cautions';
import type { Hazard } from '@shared/report-options';
import { Alert } from '@/components/ui/alert';
import { useFacilitySettings } from '@/lib/facility-settings';

/**
 * What to do now, for the hazards that were named: the facility's emergency number and its
 * own procedure first, then first steps per hazard, then the lines that always apply; the
 * line saying what Faultline does not replace is always last. Used by the report form and
 * the ticket page.
 */
export const HazardCautions = forwardRef<HTMLDivElement, { hazards: readonly Hazard[]; live?: boolean; className?: string }>(
  function HazardCautions({ hazards, live, className }, ref) {
    const settings = useFacilitySettings();
    const c = cautionsFor(hazards, settings.data ?? null);
    return (
      <div ref={ref} className={className} data-testid="hazard-cautions">
        <Alert tone="danger" live={live} title="Safety first: do this now">
          <div className="flex flex-col gap-3">
            <p className="text-base font-bold" data-testid="emergency-number">
              {c.emergencyNumber ? (
                <>
                  Emergency number:{' '}
                  <a href={`tel:${c.emergencyNumber.replace(/[^0-9+#*]/g, '')}`} className="underline">
                    {c.emergencyNumber}
                  </a>
                </>
              ) : (
                'Use the facility emergency number posted at the entrance.'
              )}
            </p>
            {c.localProcedure && (
              <div data-testid="local-procedure">
                <p className="font-semibold">Our procedure</p>
                <p className="whitespace-pre-line">{c.localProcedure}</p>
              </div>
            )}
            {c.specific.map((s) => (
              <div key={s.hazard} data-hazard={s.hazard}>
                <p className="font-semibold">{s.label}</p>
                <ul className="list-disc space-y-1 pl-5">
                  {s.steps.map((line) => (
                    <li key={line}>{line}</li>
                  ))}
                </ul>
              </div>
            ))}
            <ul className="list-disc space-y-1 pl-5" data-testid="caution-lines">
              {c.generic.map((line) => (
                <li key={line}>{line}</li>
              ))}
              <li className="font-semibold">{c.limits}</li>
            </ul>
          </div>
        </Alert>
      </div>
    );
  },
);
