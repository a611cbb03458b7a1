import { useState, type FormEvent } from 'react';
import { CRITICALITIES, toolCreateSchema, type ToolCreateInput } from '@shared/schemas/facility';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Spinner } from '@/components/ui/spinner';
import { TextField } from '@/components/ui/text-field';
import { isApiError, type FieldErrors } from '@/lib/api-client';
import type { AdminToolDetail } from '@/features/facility-admin/api/admin-keys';
import { useAdminAreas } from '@/features/facility-admin/api/get-admin-areas';
import { useAdminTool } from '@/features/facility-admin/api/get-admin-tool';
import { useCreateTool } from '@/features/facility-admin/api/create-tool';
import { useUpdateTool } from '@/features/facility-admin/api/update-tool';
import { useEngineers } from '@/features/facility-admin/api/get-engineers';
import { FieldSelect } from '@/features/facility-admin/components/field-select';
import { ModulesEditor } from '@/features/facility-admin/components/modules-editor';

const CRITICALITY_WORDS: Record<(typeof CRITICALITIES)[number], string> = {
  high: 'High — many users depend on it',
  normal: 'Normal',
  low: 'Low — alternatives exist',
};

function toFields(issues: { path: PropertyKey[]; message: string }[]): FieldErrors {
  const out: FieldErrors = {};
  for (const i of issues) (out[i.path.map(String).join('.')] ??= []).push(i.message);
  return out;
}

interface ToolFormProps {
  tool?: AdminToolDetail;
  onDone: (message: string) => void;
  onCancel: () => void;
}

function ToolForm({ tool, onDone, onCancel }: ToolFormProps) {
  const areas = useAdminAreas(false);
  const engineers = useEngineers();
  const create = useCreateTool();
  const update = useUpdateTool();
  const [name, setName] = useState(tool?.name ?? '');
  const [code, setCode] = useState(tool?.code ?? '');
  const [areaId, setAreaId] = useState(tool ? String(tool.areaId) : '');
  const [description, setDescription] = useState(tool?.description ?? '');
  const [criticality, setCriticality] = useState<(typeof CRITICALITIES)[number]>(tool?.criticality ?? 'normal');
  const [primary, setPrimary] = useState(tool?.primaryEngineerId ? String(tool.primaryEngineerId) : '');
  const [backup, setBackup] = useState(tool?.backupEngineerId ? String(tool.backupEngineerId) : '');
  const [modules, setModules] = useState<{ name: string; code: string }[]>([]);
  const [errors, setErrors] = useState<FieldErrors>({});
  const failure = create.error ?? update.error;

  const submit = (e: FormEvent) => {
    e.preventDefault();
    const input: ToolCreateInput = {
      name,
      code,
      areaId: Number(areaId),
      description: description.trim() || null,
      criticality,
      primaryEngineerId: primary ? Number(primary) : null,
      backupEngineerId: backup ? Number(backup) : null,
      modules: tool ? undefined : modules.filter((m) => m.name || m.code),
    };
    const checked = toolCreateSchema.safeParse(input);
    if (!checked.success) return setErrors(toFields(checked.error.issues));
    setErrors({});
    const onError = (error: Error) => isApiError(error) && error.fields && setErrors(error.fields);
    if (tool) {
      const { modules: _m, ...fields } = checked.data;
      update.mutate(
        { id: tool.id, input: { ...fields, version: tool.version } },
        { onSuccess: () => onDone(`Saved ${fields.name}.`), onError },
      );
    } else {
      create.mutate(checked.data, { onSuccess: (t) => onDone(`Added ${t.name} (${t.code}). It starts as Running (standby).`), onError });
    }
  };

  // The same people can be primary or backup engineer.
  const engineerChoices = (
    <>
      <option value="">Nobody yet</option>
      {engineers.data?.items.map((u) => (
        <option key={u.id} value={u.id}>
          {u.name}
        </option>
      ))}
    </>
  );

  return (
    <form onSubmit={submit} noValidate className="grid gap-4 sm:grid-cols-2" aria-label={tool ? `Edit ${tool.name}` : 'New tool'}>
      <TextField
        label="Name"
        required
        value={name}
        onChange={(e) => setName(e.target.value)}
        errors={errors.name}
        maxLength={120}
        hint="A plain description, e.g. “ICP etcher 2”."
      />
      <TextField
        label="Code"
        required
        value={code}
        onChange={(e) => setCode(e.target.value)}
        errors={errors.code}
        maxLength={32}
        hint={
          tool
            ? 'Used in addresses and on labels: changing it means printing its label again.'
            : 'Used in addresses and on labels, e.g. ICP-2.'
        }
        inputClassName="font-mono uppercase"
      />
      <FieldSelect label="Area" value={areaId} onChange={(e) => setAreaId(e.target.value)} errors={errors.areaId}>
        <option value="">Choose an area</option>
        {areas.data?.items.map((a) => (
          <option key={a.id} value={a.id}>
            {a.name}
          </option>
        ))}
      </FieldSelect>
      <FieldSelect
        label="Criticality"
        value={criticality}
        onChange={(e) => setCriticality(e.target.value as typeof criticality)}
        errors={errors.criticality}
      >
        {CRITICALITIES.map((c) => (
          <option key={c} value={c}>
            {CRITICALITY_WORDS[c]}
          </option>
        ))}
      </FieldSelect>
      <FieldSelect label="Primary engineer" value={primary} onChange={(e) => setPrimary(e.target.value)} errors={errors.primaryEngineerId}>
        {engineerChoices}
      </FieldSelect>
      <FieldSelect label="Backup engineer" value={backup} onChange={(e) => setBackup(e.target.value)} errors={errors.backupEngineerId}>
        {engineerChoices}
      </FieldSelect>
      <TextField
        label="Description (optional)"
        value={description}
        onChange={(e) => setDescription(e.target.value)}
        errors={errors.description}
        className="sm:col-span-2"
      />

      {!tool && (
        <fieldset className="flex flex-col gap-2 sm:col-span-2">
          <legend className="mb-1 text-sm font-semibold text-ink">Modules (optional): chambers, bowls, tubes, stations</legend>
          {modules.map((m, i) => (
            <div key={i} className="flex flex-wrap items-end gap-2">
              <TextField
                label={`Module ${i + 1} name`}
                value={m.name}
                onChange={(e) => setModules(modules.map((x, j) => (j === i ? { ...x, name: e.target.value } : x)))}
                errors={errors[`modules.${i}.name`]}
                className="flex-1"
              />
              <TextField
                label="Code"
                value={m.code}
                onChange={(e) => setModules(modules.map((x, j) => (j === i ? { ...x, code: e.target.value } : x)))}
                errors={errors[`modules.${i}.code`]}
                className="w-32"
                inputClassName="font-mono uppercase"
              />
              <Button
                variant="secondary"
                onClick={() => setModules(modules.filter((_, j) => j !== i))}
                aria-label={`Remove module ${i + 1}`}
              >
                Remove
              </Button>
            </div>
          ))}
          {errors.modules && <p className="text-sm font-medium text-alert-danger-ink">{errors.modules.join(' ')}</p>}
          <div>
            <Button variant="secondary" onClick={() => setModules([...modules, { name: '', code: '' }])}>
              Add a module
            </Button>
          </div>
        </fieldset>
      )}

      {failure && (
        <Alert tone="danger" live className="sm:col-span-2">
          {failure.message}
        </Alert>
      )}
      <div className="flex flex-wrap gap-2 sm:col-span-2">
        <Button type="submit" busy={create.isPending || update.isPending}>
          {tool ? 'Save tool' : 'Add tool'}
        </Button>
        <Button variant="secondary" onClick={onCancel}>
          Cancel
        </Button>
      </div>
    </form>
  );
}

/** Create a tool, or edit one (fields, modules, retire). Editing checks the version saved. */
export function ToolEditor({ toolId, onClose }: { toolId: number | null; onClose: (message?: string) => void }) {
  const tool = useAdminTool(toolId);
  const update = useUpdateTool();
  const [confirmRetire, setConfirmRetire] = useState(false);

  if (toolId === null) return <ToolForm onDone={(m) => onClose(m)} onCancel={() => onClose()} />;
  if (tool.isPending) return <Spinner label="Loading the tool…" showLabel />;
  if (tool.isError) return <Alert tone="danger">{tool.error.message}</Alert>;
  const t = tool.data;
  const retired = Boolean(t.retiredAt);
  return (
    <div className="flex flex-col gap-6">
      {retired && (
        <Alert tone="info" title="Retired">
          This tool is retired: it is off the board and its state can no longer change. Its history stays.
        </Alert>
      )}
      <ToolForm key={t.version} tool={t} onDone={(m) => onClose(m)} onCancel={() => onClose()} />
      <section className="flex flex-col gap-3">
        <h3 className="font-semibold text-ink">Modules</h3>
        <ModulesEditor tool={t} />
      </section>
      <section className="flex flex-col gap-2 border-t border-line pt-4">
        <h3 className="font-semibold text-ink">{retired ? 'Bring back into service' : 'Retire this tool'}</h3>
        <p className="text-sm text-muted">
          {retired
            ? 'It returns to the board as Offline until a technician sets its state.'
            : 'It goes Offline and leaves the board; its history, tickets and page stay.'}
        </p>
        {update.isError && (
          <Alert tone="danger" live>
            {update.error.message}
          </Alert>
        )}
        <div className="flex flex-wrap gap-2">
          {!retired && !confirmRetire && (
            <Button variant="danger" onClick={() => setConfirmRetire(true)}>
              Retire…
            </Button>
          )}
          {!retired && confirmRetire && (
            <>
              <Button
                variant="danger"
                busy={update.isPending}
                onClick={() =>
                  update.mutate(
                    { id: t.id, input: { version: t.version, retired: true } },
                    { onSuccess: () => onClose(`Retired ${t.name}.`) },
                  )
                }
              >
                Yes, retire {t.code}
              </Button>
              <Button variant="secondary" onClick={() => setConfirmRetire(false)}>
                Keep it
              </Button>
            </>
          )}
          {retired && (
            <Button
              variant="secondary"
              busy={update.isPending}
              onClick={() =>
                update.mutate(
                  { id: t.id, input: { version: t.version, retired: false } },
                  { onSuccess: () => onClose(`${t.name} is back in service.`) },
                )
              }
            >
              Bring back
            </Button>
          )}
        </div>
      </section>
    </div>
  );
}
