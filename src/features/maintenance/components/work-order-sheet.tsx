import type { WorkOrderDetail } from '@/features/maintenance/api/types';

// The printed work order: one clean page for technicians in gowns — tool, plan, every step
// with an empty box and its limits, space for readings and parts, and signature lines.

function limits(step: { min: number | null; max: number | null; unit: string | null }) {
  const u = step.unit ? ` ${step.unit}` : '';
  if (step.min !== null && step.max !== null) return `${step.min}–${step.max}${u}`;
  if (step.min !== null) return `≥ ${step.min}${u}`;
  if (step.max !== null) return `≤ ${step.max}${u}`;
  return step.unit ?? '';
}

export function WorkOrderSheet({ detail }: { detail: WorkOrderDetail }) {
  const wo = detail.workOrder;
  return (
    <article className="work-order-sheet mx-auto max-w-3xl bg-white p-6 text-black" data-testid="work-order-sheet">
      <header className="flex items-start justify-between gap-4 border-b-2 border-black pb-2">
        <div>
          <p className="text-xs tracking-wide uppercase">Faultline · work order #{wo.id}</p>
          <h1 className="text-xl font-bold">{detail.tool.name}</h1>
          <p className="font-mono text-sm">{detail.tool.code}</p>
        </div>
        <div className="text-right text-sm">
          <p className="font-semibold">{wo.title}</p>
          {wo.dueAt && <p>Due {new Date(wo.dueAt).toLocaleDateString()}</p>}
          {detail.window && detail.window.status === 'booked' && (
            <p>
              Window {new Date(detail.window.startsAt).toLocaleString()} – {new Date(detail.window.endsAt).toLocaleTimeString()}
            </p>
          )}
          {detail.plan && (
            <p>
              Plan: every{' '}
              {[
                detail.plan.everyDays && `${detail.plan.everyDays} days`,
                detail.plan.everyUnits && `${detail.plan.everyUnits} ${detail.plan.counterName}`,
              ]
                .filter(Boolean)
                .join(' or ')}
            </p>
          )}
          {wo.estimatedMinutes && <p>Estimated {wo.estimatedMinutes} min</p>}
        </div>
      </header>
      <p className="mt-2 text-xs">
        Follow the facility&apos;s lock-out and safety procedures for this tool. This sheet does not replace them.
      </p>
      <table className="mt-3 w-full border-collapse text-sm">
        <thead>
          <tr className="border-b border-black text-left">
            <th className="w-10 py-1">Done</th>
            <th className="py-1">Step</th>
            <th className="w-28 py-1">Limits</th>
            <th className="w-28 py-1">Reading</th>
          </tr>
        </thead>
        <tbody>
          {wo.checklist.map((s, i) => (
            <tr key={i} className="border-b border-gray-400 align-top">
              <td className="py-2">
                <span className="inline-block size-5 border-2 border-black" aria-label="empty box" />
              </td>
              <td className="py-2">
                {i + 1}. {s.text}
              </td>
              <td className="py-2">{s.asksValue ? limits(s) : ''}</td>
              <td className="py-2">{s.asksValue ? <span className="inline-block w-24 border-b border-black">&nbsp;</span> : ''}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <div className="mt-4 grid grid-cols-2 gap-4 text-sm">
        <div>
          <p className="font-semibold">Parts used (name, part number, how many)</p>
          {[0, 1, 2].map((i) => (
            <p key={i} className="mt-5 border-b border-black" />
          ))}
        </div>
        <div>
          <p className="font-semibold">Hands-on time and notes</p>
          {[0, 1, 2].map((i) => (
            <p key={i} className="mt-5 border-b border-black" />
          ))}
        </div>
      </div>
      <div className="mt-8 grid grid-cols-2 gap-8 text-sm">
        <p className="border-t border-black pt-1">Performed by (name, signature, date)</p>
        <p className="border-t border-black pt-1">Checked / returned to service by (name, signature, date)</p>
      </div>
    </article>
  );
}
