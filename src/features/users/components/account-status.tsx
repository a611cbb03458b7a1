import { cx } from '@/lib/cx';
import type { AdminUser } from '@/features/users/api/list-users';

export type AccountStatus = 'active' | 'invited' | 'disabled';

/** Disabled wins over invited: a disabled invitee cannot sign in even with a password. */
export function accountStatus(user: Pick<AdminUser, 'active' | 'invited'>): AccountStatus {
  if (!user.active) return 'disabled';
  return user.invited ? 'invited' : 'active';
}

export const ACCOUNT_STATUS_LABELS: Record<AccountStatus, string> = {
  active: 'Active',
  invited: 'Invited',
  disabled: 'Disabled',
};

const LOOK: Record<AccountStatus, string> = {
  active: 'bg-alert-success-tint text-alert-success-ink border-alert-success-ink/40',
  invited: 'bg-alert-info-tint text-alert-info-ink border-alert-info-ink/40',
  disabled: 'bg-sunken text-muted border-control border-dashed',
};

function StatusMark({ status }: { status: AccountStatus }) {
  const common = { viewBox: '0 0 16 16', className: 'size-3.5 shrink-0', 'aria-hidden': true } as const;
  if (status === 'active') {
    return (
      <svg {...common}>
        <circle cx="8" cy="8" r="7" fill="currentColor" />
        <path
          d="m4.7 8.2 2.2 2.2 4.4-4.7"
          fill="none"
          stroke="var(--color-card)"
          strokeWidth="1.8"
          strokeLinecap="round"
          strokeLinejoin="round"
        />
      </svg>
    );
  }
  if (status === 'invited') {
    // An envelope: the person has a link in their mailbox and has not used it yet.
    return (
      <svg {...common}>
        <rect x="1.5" y="3.5" width="13" height="9" rx="1.2" fill="none" stroke="currentColor" strokeWidth="1.5" />
        <path d="m2 4.2 6 4.6 6-4.6" fill="none" stroke="currentColor" strokeWidth="1.5" strokeLinejoin="round" />
      </svg>
    );
  }
  return (
    <svg {...common}>
      <circle cx="8" cy="8" r="6.2" fill="none" stroke="currentColor" strokeWidth="1.6" />
      <path d="m3.7 12.3 8.6-8.6" stroke="currentColor" strokeWidth="1.6" strokeLinecap="round" />
    </svg>
  );
}

/** An account's status in word, mark and tint, so it reads without colour too. */
export function AccountStatusBadge({ status, className }: { status: AccountStatus; className?: string }) {
  return (
    <span
      data-account-status={status}
      className={cx(
        'inline-flex h-6 items-center gap-1 rounded-md border px-2 text-xs font-semibold whitespace-nowrap amber:border-2',
        LOOK[status],
        className,
      )}
    >
      <StatusMark status={status} />
      {ACCOUNT_STATUS_LABELS[status]}
    </span>
  );
}
