import { Fragment, useState } from 'react';
import { ROLE_LABELS } from '@shared/roles';
import { Button } from '@/components/ui/button';
import { RelativeTime } from '@/components/ui/relative-time';
import { cx } from '@/lib/cx';
import type { AdminUser } from '@/features/users/api/list-users';
import { AccountStatusBadge, accountStatus } from '@/features/users/components/account-status';
import { UserEditor } from '@/features/users/components/user-editor';

function OnCallMark() {
  return (
    <span className="inline-flex items-center gap-1 font-medium text-ink">
      <svg viewBox="0 0 16 16" className="size-4 shrink-0" aria-hidden="true">
        <path d="M8 1.8a4.3 4.3 0 0 0-4.3 4.3v3L2.3 11.6h11.4l-1.4-2.5v-3A4.3 4.3 0 0 0 8 1.8Z" fill="currentColor" />
        <path d="M6.3 13.2a1.8 1.8 0 0 0 3.4 0" fill="none" stroke="currentColor" strokeWidth="1.5" strokeLinecap="round" />
      </svg>
      On call
    </span>
  );
}

export interface UsersTableProps {
  users: AdminUser[];
  /** The signed-in administrator, whose own role and access cannot be changed here. */
  currentUserId: number;
  onSaved: (message: string) => void;
  caption: string;
}

export function UsersTable({ users, currentUserId, onSaved, caption }: UsersTableProps) {
  const [openId, setOpenId] = useState<number | null>(null);

  return (
    <table className="w-full border-collapse text-left text-sm">
      <caption className="sr-only">{caption}</caption>
      <thead className="border-b border-line text-xs font-semibold tracking-wide text-muted uppercase">
        <tr>
          <th scope="col" className="px-4 py-3">
            Person
          </th>
          <th scope="col" className="hidden px-4 py-3 sm:table-cell">
            Role
          </th>
          <th scope="col" className="hidden px-4 py-3 md:table-cell">
            On call
          </th>
          <th scope="col" className="hidden px-4 py-3 sm:table-cell">
            Status
          </th>
          <th scope="col" className="hidden px-4 py-3 lg:table-cell">
            Last sign-in
          </th>
          <th scope="col" className="px-4 py-3 text-right">
            <span className="sr-only">Actions</span>
          </th>
        </tr>
      </thead>
      <tbody>
        {users.map((user) => {
          const open = openId === user.id;
          const panelId = `user-panel-${user.id}`;
          const isSelf = user.id === currentUserId;
          return (
            <Fragment key={user.id}>
              <tr
                data-testid="user-row"
                data-user-email={user.email}
                className={cx('border-b border-line align-middle', open && 'bg-sunken')}
              >
                <td className="px-4 py-3">
                  <div className="font-semibold text-ink">
                    {user.name}
                    {isSelf && <span className="font-normal text-muted"> (you)</span>}
                  </div>
                  <div className="text-muted [overflow-wrap:anywhere]">{user.email}</div>
                  <AccountStatusBadge status={accountStatus(user)} className="mt-1.5 sm:hidden" />
                  <div className="mt-1 flex flex-wrap items-center gap-x-3 gap-y-1 text-xs text-muted lg:hidden">
                    <span className="sm:hidden">{ROLE_LABELS[user.role]}</span>
                    {user.onCall && (
                      <span className="md:hidden">
                        <OnCallMark />
                      </span>
                    )}
                    <span>{user.lastSignInAt ? <RelativeTime value={user.lastSignInAt} prefix="signed in" /> : 'never signed in'}</span>
                  </div>
                </td>
                <td className="hidden px-4 py-3 sm:table-cell">{ROLE_LABELS[user.role]}</td>
                <td className="hidden px-4 py-3 md:table-cell">{user.onCall ? <OnCallMark /> : <span className="text-muted">No</span>}</td>
                <td className="hidden px-4 py-3 sm:table-cell">
                  <AccountStatusBadge status={accountStatus(user)} />
                </td>
                <td className="hidden px-4 py-3 whitespace-nowrap text-muted lg:table-cell">
                  {user.lastSignInAt ? <RelativeTime value={user.lastSignInAt} /> : 'Never'}
                </td>
                <td className="px-4 py-2 text-right">
                  <Button
                    variant="secondary"
                    aria-expanded={open}
                    aria-controls={open ? panelId : undefined}
                    aria-label={`${open ? 'Close' : 'Edit'} ${user.name}`}
                    onClick={() => setOpenId(open ? null : user.id)}
                  >
                    {open ? 'Close' : 'Edit'}
                  </Button>
                </td>
              </tr>
              {open && (
                <tr id={panelId} className="border-b border-line bg-sunken">
                  <td colSpan={6} className="px-4 pb-4">
                    <UserEditor
                      user={user}
                      onClose={() => setOpenId(null)}
                      onSaved={(message) => {
                        setOpenId(null);
                        onSaved(message);
                      }}
                    />
                  </td>
                </tr>
              )}
            </Fragment>
          );
        })}
      </tbody>
    </table>
  );
}
