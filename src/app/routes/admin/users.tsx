import { useEffect, useRef, useState } from 'react';
import { useSearchParams } from 'react-router';
import type { Role } from '@shared/roles';
import { PageHeader } from '@/components/layout/page-header';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { PageSpinner } from '@/components/ui/spinner';
import { useSession } from '@/features/auth/api/get-session';
import { useUsers } from '@/features/users/api/list-users';
import { InviteUserForm } from '@/features/users/components/invite-user-form';
import { Pager } from '@/features/users/components/pager';
import { isRole } from '@/features/users/components/role-options';
import { UsersFilters } from '@/features/users/components/users-filters';
import { UsersTable } from '@/features/users/components/users-table';

const PAGE_SIZE = 25;
// Typing "ander" should cost one request, not five.
const SEARCH_DELAY_MS = 300;

/** Filters live in the address, so the back button and a shared link keep them. */
function useUserFilters() {
  const [params, setParams] = useSearchParams();
  const q = params.get('q') ?? '';
  const roleParam = params.get('role') ?? '';
  const role = isRole(roleParam) ? roleParam : undefined;
  const page = Math.max(1, Math.floor(Number(params.get('page')) || 1));

  const update = (changes: Record<string, string | null>, replace = false) => {
    setParams(
      (current) => {
        const next = new URLSearchParams(current);
        for (const [key, value] of Object.entries(changes)) {
          if (value) next.set(key, value);
          else next.delete(key);
        }
        return next;
      },
      { replace },
    );
  };
  return { q, role, page, update };
}

export function AdminUsersPage() {
  const session = useSession();
  const filters = useUserFilters();
  const [search, setSearch] = useState(filters.q);
  const searchTimer = useRef<ReturnType<typeof setTimeout> | undefined>(undefined);
  const [inviting, setInviting] = useState(false);
  const [notice, setNotice] = useState<string | null>(null);

  useEffect(() => () => clearTimeout(searchTimer.current), []);

  const offset = (filters.page - 1) * PAGE_SIZE;
  const users = useUsers({ q: filters.q || undefined, role: filters.role, limit: PAGE_SIZE, offset });
  const currentUserId = session.data?.user?.id ?? 0;

  const onSearchChange = (value: string) => {
    setSearch(value);
    clearTimeout(searchTimer.current);
    // Each keystroke replaces the history entry; a new search starts at page one.
    searchTimer.current = setTimeout(() => filters.update({ q: value.trim() || null, page: null }, true), SEARCH_DELAY_MS);
  };

  const onRoleChange = (role: Role | undefined) => filters.update({ role: role ?? null, page: null });
  const onOffsetChange = (nextOffset: number) => filters.update({ page: nextOffset > 0 ? String(nextOffset / PAGE_SIZE + 1) : null });

  const list = users.data;
  const filtered = Boolean(filters.q || filters.role);

  return (
    <div className="flex flex-col gap-6">
      <title>Users · Faultline</title>
      <PageHeader
        className="mb-0"
        title="Users"
        description="Invite people, set their role and on-call duty, and disable accounts that should no longer sign in."
        actions={
          !inviting && (
            <Button
              onClick={() => {
                setInviting(true);
                setNotice(null);
              }}
            >
              Invite a person
            </Button>
          )
        }
      />

      {notice && (
        <Alert
          tone="success"
          live
          title="Done"
          actions={
            <Button variant="secondary" onClick={() => setNotice(null)}>
              Dismiss
            </Button>
          }
        >
          {notice}
        </Alert>
      )}

      {inviting && (
        <Card
          as="section"
          title="Invite a person"
          description="They get an e-mail with a link to choose their password. Until then they are listed as Invited."
        >
          <InviteUserForm
            onCancel={() => setInviting(false)}
            onInvited={(user) => {
              setInviting(false);
              setNotice(`Invitation sent to ${user.email}. ${user.name} is listed as Invited until they choose a password.`);
            }}
          />
        </Card>
      )}

      <Card>
        <UsersFilters search={search} role={filters.role} onSearchChange={onSearchChange} onRoleChange={onRoleChange} />
      </Card>

      {users.isPending && <PageSpinner label="Loading people…" />}

      {users.isError && (
        <Alert
          tone="danger"
          live
          title="The list of people could not be loaded"
          actions={
            <Button variant="secondary" onClick={() => void users.refetch()}>
              Try again
            </Button>
          }
        >
          {users.error.message}
        </Alert>
      )}

      {list && list.items.length === 0 && (
        <Alert
          tone="info"
          title={offset > 0 && list.total > 0 ? 'Nobody on this page' : filtered ? 'Nobody matches' : 'No people yet'}
          actions={
            offset > 0 && list.total > 0 ? (
              <Button variant="secondary" onClick={() => onOffsetChange(0)}>
                Go to the first page
              </Button>
            ) : undefined
          }
        >
          {filtered ? 'Try part of the name or address only, or show all roles.' : 'Invite the first person with the button above.'}
        </Alert>
      )}

      {list && list.items.length > 0 && (
        <Card flush aria-busy={users.isPlaceholderData || undefined}>
          <UsersTable
            users={list.items}
            currentUserId={currentUserId}
            caption="People with a Faultline account, by name. Choose Edit to change a role, on-call duty or access."
            onSaved={setNotice}
          />
          <Pager
            offset={offset}
            shown={list.items.length}
            total={list.total}
            pageSize={PAGE_SIZE}
            onOffsetChange={onOffsetChange}
            busy={users.isPlaceholderData}
          />
        </Card>
      )}
    </div>
  );
}

export { AdminUsersPage as Component };
