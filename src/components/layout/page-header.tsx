import type { ReactNode } from 'react';
import { cx } from '@/lib/cx';

export interface PageHeaderProps {
  /** The page's one h1. */
  title: ReactNode;
  description?: ReactNode;
  /** Page-wide controls, placed right on wide screens and below the title on phones. */
  actions?: ReactNode;
  /** Replaces the default bottom margin, e.g. inside a flex column that sets its own gaps. */
  className?: string;
}

export function PageHeader({ title, description, actions, className }: PageHeaderProps) {
  return (
    <div className={cx('flex flex-wrap items-end justify-between gap-4', className ?? 'mb-6')}>
      <div className="min-w-0">
        <h1 className="text-2xl font-bold tracking-tight text-ink sm:text-3xl">{title}</h1>
        {description && <p className="mt-1 max-w-prose text-muted">{description}</p>}
      </div>
      {actions && <div className="flex flex-wrap items-center gap-2">{actions}</div>}
    </div>
  );
}
