import type { HTMLAttributes, ReactNode } from 'react';
import { cx } from '@/lib/cx';

export interface CardProps extends Omit<HTMLAttributes<HTMLElement>, 'title'> {
  /** Element to render; `section` and `article` give the card a landmark or item meaning. */
  as?: 'div' | 'section' | 'article' | 'li';
  /** Rendered as a heading at `headingLevel` (default h2). */
  title?: ReactNode;
  headingLevel?: 2 | 3 | 4;
  /** A line under the title. */
  description?: ReactNode;
  /** Controls at the top right, e.g. a button. */
  actions?: ReactNode;
  /** Drop the inner padding, for tables that run edge to edge. */
  flush?: boolean;
}

export function Card({
  as: As = 'div',
  title,
  headingLevel = 2,
  description,
  actions,
  flush = false,
  className,
  children,
  ...rest
}: CardProps) {
  const Heading = `h${headingLevel}` as const;
  const hasHeader = Boolean(title || description || actions);
  return (
    <As className={cx('rounded-xl border border-line bg-card shadow-sm amber:border-2 amber:shadow-none', className)} {...rest}>
      {hasHeader && (
        <div className={cx('flex flex-wrap items-start justify-between gap-3', flush ? 'px-5 pt-5 pb-3' : 'px-5 pt-5')}>
          <div className="min-w-0">
            {title && <Heading className="text-lg font-semibold text-ink">{title}</Heading>}
            {description && <p className="mt-1 text-sm text-muted">{description}</p>}
          </div>
          {actions && <div className="flex shrink-0 items-center gap-2">{actions}</div>}
        </div>
      )}
      <div className={cx(!flush && 'p-5', !flush && hasHeader && 'pt-3')}>{children}</div>
    </As>
  );
}
