import { useState, type FormEvent } from 'react';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { RelativeTime } from '@/components/ui/relative-time';
import { TextField } from '@/components/ui/text-field';
import { useCreateToolKey, useRevokeToolKey, useToolKeys } from '@/features/alarms/api/tool-keys-api';

/** Admins: the tool's keys for its computer (or the log forwarder). A new key is shown once. */
export function ToolKeysPanel({ code }: { code: string }) {
  const keys = useToolKeys(code);
  const create = useCreateToolKey(code);
  const revoke = useRevokeToolKey(code);
  const [label, setLabel] = useState('Host computer');
  const fresh = create.data;

  const submit = (e: FormEvent) => {
    e.preventDefault();
    create.mutate(label);
  };
  return (
    <Card
      as="section"
      title="Tool connection"
      description="Keys let the tool’s computer (or the log forwarder) post alarms and counters. See the ingest API guide."
    >
      {fresh && (
        <Alert tone="success" title="Copy the key now: it is shown only this once" className="mb-3">
          <code className="block break-all font-mono text-sm" data-testid="new-tool-key">
            {fresh.key}
          </code>
        </Alert>
      )}
      {create.isError && (
        <Alert tone="danger" live className="mb-3">
          {create.error.message}
        </Alert>
      )}
      <form onSubmit={submit} className="flex flex-wrap items-end gap-2">
        <TextField label="Name of the new key" value={label} onChange={(e) => setLabel(e.target.value)} maxLength={80} />
        <Button type="submit" busy={create.isPending}>
          Make a key
        </Button>
      </form>
      <ul className="mt-3 text-sm">
        {keys.data?.items.map((k) => (
          <li key={k.id} className="flex flex-wrap items-center justify-between gap-2 border-b border-line py-2 last:border-0">
            <span>
              <span className="font-mono">{k.hint}…</span> {k.label}
              <span className="block text-xs text-muted">
                {k.revokedAt ? (
                  <>
                    revoked <RelativeTime value={k.revokedAt} />
                  </>
                ) : k.lastUsedAt ? (
                  <>
                    last used <RelativeTime value={k.lastUsedAt} />
                  </>
                ) : (
                  'not used yet'
                )}
              </span>
            </span>
            {!k.revokedAt && (
              <Button variant="danger" busy={revoke.isPending && revoke.variables === k.id} onClick={() => revoke.mutate(k.id)}>
                Revoke
              </Button>
            )}
          </li>
        ))}
      </ul>
    </Card>
  );
}
