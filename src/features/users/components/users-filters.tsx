import type { Role } from '@shared/roles';
import { TextField } from '@/components/ui/text-field';
import { SelectField } from '@/features/users/components/form-controls';
import { isRole, ROLE_OPTIONS } from '@/features/users/components/role-options';

const ALL = '';

export interface UsersFiltersProps {
  search: string;
  role: Role | undefined;
  onSearchChange: (search: string) => void;
  onRoleChange: (role: Role | undefined) => void;
}

export function UsersFilters({ search, role, onSearchChange, onRoleChange }: UsersFiltersProps) {
  return (
    <div role="search" className="grid gap-4 sm:grid-cols-[minmax(0,2fr)_minmax(0,1fr)]">
      <TextField
        label="Search"
        hint="Part of a name or an e-mail address"
        type="search"
        name="q"
        autoComplete="off"
        autoCapitalize="none"
        spellCheck={false}
        maxLength={120}
        value={search}
        onChange={(event) => onSearchChange(event.target.value)}
      />
      <SelectField
        label="Role"
        hint="Show one role only"
        name="role"
        options={[{ value: ALL, label: 'All roles' }, ...ROLE_OPTIONS]}
        value={role ?? ALL}
        onChange={(event) => onRoleChange(isRole(event.target.value) ? event.target.value : undefined)}
      />
    </div>
  );
}
