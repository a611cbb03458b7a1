import { Card } from '@/components/ui/card';
import { useToolRequal } from '@/features/maintenance/api/requalification';
import { ControlChart } from '@/features/maintenance/components/control-chart';

/** The tool page's requalification history: one individuals chart per measured figure. */
export function RequalCharts({ toolId }: { toolId: number }) {
  const requal = useToolRequal(toolId);
  if (!requal.data || requal.data.length === 0) return null;
  return (
    <Card
      as="section"
      title="Requalification history"
      description="Each figure as an individuals control chart (centre line and limits after the NIST/SEMATECH method)."
    >
      <div className="flex flex-col gap-6 px-5 pb-5">
        {requal.data.map((t) => (
          <div key={t.template.id} className="flex flex-col gap-3">
            <h3 className="font-semibold text-ink">
              {t.template.name}{' '}
              <span className="font-normal text-muted">
                — {t.template.quantity}, {t.template.points} points
              </span>
            </h3>
            {t.charts.map((c) => (
              <ControlChart
                key={c.figure}
                label={c.label}
                unit={c.figure === 'mean' || c.figure === 'range' ? t.template.unit : '%'}
                points={c.points}
                chart={c.chart}
              />
            ))}
            {t.charts.length === 0 && <p className="text-sm text-muted">No records yet.</p>}
          </div>
        ))}
      </div>
    </Card>
  );
}
