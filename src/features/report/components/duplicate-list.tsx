import { STATUS_LABELS } from '@shared/ticket-workflow';
import type { TicketSummary } from '@shared/schemas/tickets';
import { Button } from '@/components/ui/button';
import { RelativeTime } from '@/components/ui/relative-time';

const words = (s: string) =>
  new Set(
    s
      .toLowerCase()
      .split(/[^a-z0-9]+/)
      .filter((w) => w.length > 2),
  );

/** Open tickets ranked by how many words they share with what is being typed. */
export function rankBySimilarity(items: TicketSummary[], typed: string) {
  const mine = words(typed);
  const score = (t: TicketSummary) => [...words(t.title)].filter((w) => mine.has(w)).length;
  return [...items].map((t) => ({ t, score: score(t) })).sort((a, b) => b.score - a.score || b.t.createdAt.localeCompare(a.t.createdAt));
}

/**
 * "Already reported?" — the open tickets on this tool while the user writes. Adding to one
 * keeps the user's own text and photos on it and avoids a second ticket for one problem.
 */
export function DuplicateList({ items, typed, onAddTo }: { items: TicketSummary[]; typed: string; onAddTo: (t: TicketSummary) => void }) {
  if (items.length === 0) return null;
  const ranked = rankBySimilarity(items, typed);
  return (
    <section
      aria-labelledby="dupes-title"
      className="flex flex-col gap-2 rounded-xl border-2 border-accent/40 bg-accent-tint p-4 amber:border-black"
      data-testid="duplicates"
    >
      <h2 id="dupes-title" className="text-base font-semibold text-accent-ink">
        Already reported on this tool ({items.length} open)
      </h2>
      <p className="text-sm text-accent-ink">
        If it is the same problem, add your report to it instead of opening a new one. Your text and photos stay with your name.
      </p>
      <ul className="flex flex-col gap-2">
        {ranked.map(({ t, score }) => (
          <li key={t.id} className="flex flex-col gap-2 rounded-lg border border-line bg-card p-3 sm:flex-row sm:items-center">
            <div className="min-w-0 flex-1">
              <p className="font-semibold text-ink">
                <span className="font-mono text-sm text-muted">#{t.id}</span> {t.title}
              </p>
              <p className="text-sm text-muted">
                {STATUS_LABELS[t.status]} · reported <RelativeTime value={t.createdAt} />
                {t.reporter ? ` by ${t.reporter.name}` : ''}
                {score > 0 && typed.trim() ? ' · looks similar' : ''}
              </p>
            </div>
            <Button variant="secondary" size="lg" onClick={() => onAddTo(t)}>
              Same problem: add my report
            </Button>
          </li>
        ))}
      </ul>
    </section>
  );
}
