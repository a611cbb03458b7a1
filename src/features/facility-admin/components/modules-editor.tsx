import { useState, type FormEvent } from 'react';
import { moduleCreateSchema } from '@shared/schemas/facility';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/text-field';
import { isApiError, type FieldErrors } from '@/lib/api-client';
import type { AdminModule, AdminToolDetail } from '@/features/facility-admin/api/admin-keys';
import { useCreateModule } from '@/features/facility-admin/api/create-module';
import { useUpdateModule } from '@/features/facility-admin/api/update-module';

function ModuleRow({ module: m }: { module: AdminModule }) {
  const update = useUpdateModule();
  const [editing, setEditing] = useState(false);
  const [name, setName] = useState(m.name);
  const [code, setCode] = useState(m.code);
  const [errors, setErrors] = useState<FieldErrors>({});
  const save = (e: FormEvent) => {
    e.preventDefault();
    update.mutate(
      { id: m.id, input: { name, code } },
      { onSuccess: () => setEditing(false), onError: (err) => isApiError(err) && err.fields && setErrors(err.fields) },
    );
  };
  return (
    <li className="flex flex-col gap-2 py-2">
      {editing ? (
        <form onSubmit={save} noValidate className="flex flex-wrap items-end gap-2">
          <TextField label="Name" value={name} onChange={(e) => setName(e.target.value)} errors={errors.name} className="flex-1" />
          <TextField
            label="Code"
            value={code}
            onChange={(e) => setCode(e.target.value)}
            errors={errors.code}
            className="w-32"
            inputClassName="font-mono uppercase"
          />
          <Button type="submit" busy={update.isPending}>
            Save
          </Button>
          <Button variant="secondary" onClick={() => setEditing(false)}>
            Cancel
          </Button>
        </form>
      ) : (
        <div className="flex flex-wrap items-center gap-2">
          <span className="min-w-0 flex-1 text-ink">
            {m.name} <span className="font-mono text-xs text-muted">{m.code}</span>
            {m.retiredAt && <span className="ml-2 text-xs font-semibold text-muted uppercase">Retired</span>}
          </span>
          <Button variant="secondary" onClick={() => setEditing(true)}>
            Rename
          </Button>
          <Button variant="secondary" busy={update.isPending} onClick={() => update.mutate({ id: m.id, input: { retired: !m.retiredAt } })}>
            {m.retiredAt ? 'Restore' : 'Retire'}
          </Button>
        </div>
      )}
      {update.isError && !editing && <Alert tone="danger">{update.error.message}</Alert>}
    </li>
  );
}

/** A tool's modules: add, rename, retire (a retired module no longer counts in the roll-up). */
export function ModulesEditor({ tool }: { tool: AdminToolDetail }) {
  const create = useCreateModule();
  const [name, setName] = useState('');
  const [code, setCode] = useState('');
  const [errors, setErrors] = useState<FieldErrors>({});
  const add = (e: FormEvent) => {
    e.preventDefault();
    const checked = moduleCreateSchema.safeParse({ name, code });
    if (!checked.success) {
      const out: FieldErrors = {};
      for (const i of checked.error.issues) (out[i.path.map(String).join('.')] ??= []).push(i.message);
      return setErrors(out);
    }
    setErrors({});
    create.mutate(
      { toolId: tool.id, input: checked.data },
      {
        onSuccess: () => {
          setName('');
          setCode('');
        },
        onError: (err) => isApiError(err) && err.fields && setErrors(err.fields),
      },
    );
  };
  return (
    <div className="flex flex-col gap-3">
      {tool.modules.length === 0 ? (
        <p className="text-sm text-muted">No modules.</p>
      ) : (
        <ul className="divide-y divide-line">
          {tool.modules.map((m) => (
            <ModuleRow key={`${m.id}-${m.name}-${m.code}-${m.retiredAt}`} module={m} />
          ))}
        </ul>
      )}
      {!tool.retiredAt && (
        <form onSubmit={add} noValidate className="flex flex-wrap items-end gap-2">
          <TextField
            label="New module name"
            value={name}
            onChange={(e) => setName(e.target.value)}
            errors={errors.name}
            className="flex-1"
          />
          <TextField
            label="Code"
            value={code}
            onChange={(e) => setCode(e.target.value)}
            errors={errors.code}
            className="w-32"
            inputClassName="font-mono uppercase"
          />
          <Button type="submit" variant="secondary" busy={create.isPending}>
            Add module
          </Button>
        </form>
      )}
      {create.isError && <Alert tone="danger">{create.error.message}</Alert>}
    </div>
  );
}
