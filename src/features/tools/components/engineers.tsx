import type { PersonRef } from '@shared/schemas/facility';

function Person({ role, person }: { role: string; person: PersonRef | null }) {
  return (
    <div>
      <dt className="text-sm font-semibold text-muted">{role}</dt>
      <dd className="text-ink">
        {person ? (
          <>
            {person.name}
            {person.email && (
              <a href={`mailto:${person.email}`} className="block min-h-11 py-2 text-sm break-all">
                {person.email}
              </a>
            )}
          </>
        ) : (
          <span className="text-muted">Not assigned</span>
        )}
      </dd>
    </div>
  );
}

/** Who looks after the tool; new tickets for it go to them. */
export function Engineers({ primary, backup }: { primary: PersonRef | null; backup: PersonRef | null }) {
  return (
    <dl className="flex flex-col gap-3">
      <Person role="Primary engineer" person={primary} />
      <Person role="Backup engineer" person={backup} />
    </dl>
  );
}
