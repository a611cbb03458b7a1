import type { ReactNode } from 'react';
import { Wordmark } from '@/components/layout/wordmark';

export interface PublicPageProps {
  /** The document title's first part, before "· Faultline". */
  documentTitle: string;
  /** The card's h1. */
  heading: string;
  children: ReactNode;
  /** Small print under the card. */
  footer?: ReactNode;
}

/**
 * The frame of the pages people see before they are signed in (the same look as sign-in):
 * the wordmark, one card, small print, and the emergency reminder that belongs on every page.
 */
export function PublicPage({ documentTitle, heading, children, footer }: PublicPageProps) {
  return (
    <div className="flex min-h-dvh flex-col items-center bg-page px-4 py-10 sm:justify-center sm:py-16">
      <title>{`${documentTitle} · Faultline`}</title>
      <main id="main" className="w-full max-w-sm">
        <div className="mb-8 flex flex-col items-center gap-3 text-center">
          <Wordmark className="scale-125" />
          <p className="text-sm text-muted">Fault reports and tool status for the cleanroom</p>
        </div>
        <div className="rounded-xl border border-line bg-card p-6 shadow-sm sm:p-8 amber:border-2 amber:shadow-none">
          <h1 className="mb-6 text-xl font-bold text-ink">{heading}</h1>
          {children}
        </div>
        {footer}
        <p className="mt-3 text-center text-xs leading-relaxed text-muted">
          For fire, gas, a major spill or an injury, raise the facility alarm and follow the emergency procedures first.
        </p>
      </main>
    </div>
  );
}
