import { useState, type FormEvent } from 'react';
import { areaCreateSchema } from '@shared/schemas/facility';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Spinner } from '@/components/ui/spinner';
import { TextField } from '@/components/ui/text-field';
import { isApiError, type FieldErrors } from '@/lib/api-client';
import type { AdminArea } from '@/features/facility-admin/api/admin-keys';
import { useAdminAreas } from '@/features/facility-admin/api/get-admin-areas';
import { useCreateArea } from '@/features/facility-admin/api/create-area';
import { useUpdateArea } from '@/features/facility-admin/api/update-area';

function issues(error: { issues: { path: PropertyKey[]; message: string }[] }): FieldErrors {
  const out: FieldErrors = {};
  for (const i of error.issues) (out[i.path.map(String).join('.')] ??= []).push(i.message);
  return out;
}

function AreaForm({ area, onDone }: { area?: AdminArea; onDone: () => void }) {
  const create = useCreateArea();
  const update = useUpdateArea();
  const [name, setName] = useState(area?.name ?? '');
  const [code, setCode] = useState(area?.code ?? '');
  const [sortOrder, setSortOrder] = useState(String(area?.sortOrder ?? 0));
  const [description, setDescription] = useState(area?.description ?? '');
  const [errors, setErrors] = useState<FieldErrors>({});
  const busy = create.isPending || update.isPending;
  const failure = create.error ?? update.error;

  const submit = (e: FormEvent) => {
    e.preventDefault();
    const input = { name, code, sortOrder: Number(sortOrder) || 0, description: description.trim() || null };
    const checked = areaCreateSchema.safeParse(input);
    if (!checked.success) return setErrors(issues(checked.error));
    setErrors({});
    const onError = (error: Error) => isApiError(error) && error.fields && setErrors(error.fields);
    if (area) update.mutate({ id: area.id, input: checked.data }, { onSuccess: onDone, onError });
    else create.mutate(checked.data, { onSuccess: onDone, onError });
  };

  return (
    <form onSubmit={submit} noValidate className="grid gap-3 rounded-lg border border-line bg-sunken p-4 sm:grid-cols-2">
      <TextField label="Name" required value={name} onChange={(e) => setName(e.target.value)} errors={errors.name} maxLength={120} />
      <TextField
        label="Code"
        required
        hint="Short, in capitals, e.g. LITHO"
        value={code}
        onChange={(e) => setCode(e.target.value)}
        errors={errors.code}
        maxLength={24}
        inputClassName="font-mono uppercase"
      />
      <TextField
        label="Order on the board"
        type="number"
        value={sortOrder}
        onChange={(e) => setSortOrder(e.target.value)}
        errors={errors.sortOrder}
      />
      <TextField
        label="Description (optional)"
        value={description}
        onChange={(e) => setDescription(e.target.value)}
        errors={errors.description}
      />
      {failure && (
        <Alert tone="danger" live className="sm:col-span-2">
          {failure.message}
        </Alert>
      )}
      <div className="flex gap-2 sm:col-span-2">
        <Button type="submit" busy={busy}>
          {area ? 'Save area' : 'Add area'}
        </Button>
        <Button variant="secondary" onClick={onDone}>
          Cancel
        </Button>
      </div>
    </form>
  );
}

/** Areas (bays, rooms): add, rename, reorder, retire. An area with active tools cannot retire. */
export function AreasPanel() {
  const [showRetired, setShowRetired] = useState(false);
  const [editing, setEditing] = useState<number | 'new' | null>(null);
  const areas = useAdminAreas(showRetired);
  const update = useUpdateArea();

  return (
    <div className="flex flex-col gap-4">
      <div className="flex flex-wrap items-center gap-3">
        <Button onClick={() => setEditing('new')} disabled={editing === 'new'}>
          Add an area
        </Button>
        <label className="inline-flex min-h-11 items-center gap-2 text-sm text-ink">
          <input type="checkbox" className="size-5" checked={showRetired} onChange={(e) => setShowRetired(e.target.checked)} />
          Show retired areas
        </label>
      </div>
      {editing === 'new' && <AreaForm onDone={() => setEditing(null)} />}
      {update.isError && (
        <Alert tone="danger" live>
          {update.error.message}
        </Alert>
      )}
      {areas.isPending && <Spinner label="Loading areas…" showLabel />}
      {areas.isError && <Alert tone="danger">{areas.error.message}</Alert>}
      {areas.data && (
        <ul className="divide-y divide-line rounded-lg border border-line">
          {areas.data.items.map((a) => (
            <li key={a.id} className="flex flex-col gap-3 p-3">
              <div className="flex flex-wrap items-center gap-3">
                <div className="min-w-0 flex-1">
                  <p className="font-semibold text-ink">
                    {a.name} <span className="font-mono text-xs text-muted">{a.code}</span>
                    {a.retiredAt && <span className="ml-2 text-xs font-semibold text-muted uppercase">Retired</span>}
                  </p>
                  {a.description && <p className="text-sm text-muted">{a.description}</p>}
                </div>
                <Button variant="secondary" onClick={() => setEditing(a.id)}>
                  Edit
                </Button>
                <Button
                  variant="secondary"
                  busy={update.isPending && update.variables?.id === a.id}
                  onClick={() => update.mutate({ id: a.id, input: { retired: !a.retiredAt } })}
                >
                  {a.retiredAt ? 'Restore' : 'Retire'}
                </Button>
              </div>
              {editing === a.id && <AreaForm area={a} onDone={() => setEditing(null)} />}
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
