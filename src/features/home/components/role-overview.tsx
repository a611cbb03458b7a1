import { Link } from 'react-router';
import { hasRole, type Role } from '@shared/roles';
import { Card } from '@/components/ui/card';
import { openablePath } from '@/components/layout/nav-items';
import { HOME_SECTIONS } from '@/features/home/components/home-cards';

/** The things a person can do here, their own role's work first and everyone's last. */
export function RoleOverview({ role }: { role: Role }) {
  const sections = HOME_SECTIONS.filter((section) => hasRole(role, section.role));
  return (
    <div className="flex flex-col gap-8">
      {sections.map((section) => (
        <section key={section.role} aria-labelledby={`home-section-${section.role}`}>
          <h2 id={`home-section-${section.role}`} className="mb-3 text-lg font-semibold text-ink">
            {section.heading}
          </h2>
          <ul className="grid gap-4 sm:grid-cols-2 xl:grid-cols-4">
            {section.cards.map((card) => {
              const href = openablePath(card.to, role);
              return (
                <Card as="li" key={card.title} data-testid="home-card" title={card.title} headingLevel={3} className="flex flex-col">
                  <p className="text-sm leading-relaxed text-muted">{card.text}</p>
                  {href && (
                    <Link to={href} className="mt-3 inline-flex min-h-11 items-center font-semibold">
                      {card.linkLabel}
                      <span aria-hidden="true">&nbsp;→</span>
                    </Link>
                  )}
                </Card>
              );
            })}
          </ul>
        </section>
      ))}
    </div>
  );
}
