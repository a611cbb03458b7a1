import { useState, type FormEvent } from 'react';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { RelativeTime } from '@/components/ui/relative-time';
import { Spinner } from '@/components/ui/spinner';
import { TextField } from '@/components/ui/text-field';
import { useCreateDisplayLink, type NewDisplayLink } from '@/features/facility-admin/api/create-display-link';
import { useDisplayLinks } from '@/features/facility-admin/api/get-display-links';
import { useRevokeDisplayLink } from '@/features/facility-admin/api/revoke-display-link';

function NewLinkNotice({ link }: { link: NewDisplayLink }) {
  const [copied, setCopied] = useState(false);
  return (
    <Alert
      tone="success"
      live
      title={`Display link “${link.name}” created`}
      actions={
        <Button
          variant="secondary"
          onClick={() => {
            void navigator.clipboard?.writeText(link.url).then(() => setCopied(true));
          }}
        >
          {copied ? 'Copied' : 'Copy the link'}
        </Button>
      }
    >
      <p>Open this address on the lobby screen. It is shown only now: Faultline keeps no copy of the key.</p>
      <p className="mt-2 rounded border border-line bg-card p-2 font-mono text-xs break-all text-ink" data-testid="new-display-url">
        {link.url}
      </p>
      <p className="mt-2" data-testid="display-bays-help">
        To show only some bays (a screen that hangs in one bay), add their area codes to the address:{' '}
        <code className="font-mono">{link.url}?areas=LITHO,ETCH</code>. When the bays do not fit on the screen, the display pages through
        them by itself.
      </p>
    </Alert>
  );
}

/** Lobby display links: create (the key is shown once) and revoke (screens go blank at once). */
export function DisplayLinksPanel() {
  const [name, setName] = useState('');
  const [showRevoked, setShowRevoked] = useState(false);
  const [confirming, setConfirming] = useState<number | null>(null);
  const create = useCreateDisplayLink();
  const revoke = useRevokeDisplayLink();
  const links = useDisplayLinks(showRevoked);

  const submit = (e: FormEvent) => {
    e.preventDefault();
    if (!name.trim()) return;
    create.mutate(name.trim(), { onSuccess: () => setName('') });
  };

  return (
    <div className="flex flex-col gap-5">
      <form onSubmit={submit} className="flex flex-wrap items-end gap-3">
        <TextField
          label="Name of the screen"
          hint="Where it hangs, e.g. “Gowning room entrance”."
          value={name}
          onChange={(e) => setName(e.target.value)}
          maxLength={120}
          className="w-full sm:w-80"
          required
        />
        <Button type="submit" busy={create.isPending} disabled={!name.trim()}>
          Create display link
        </Button>
      </form>
      {create.isError && (
        <Alert tone="danger" live>
          {create.error.message}
        </Alert>
      )}
      {create.data && <NewLinkNotice link={create.data} />}

      <label className="inline-flex min-h-11 items-center gap-2 text-sm text-ink">
        <input type="checkbox" className="size-5" checked={showRevoked} onChange={(e) => setShowRevoked(e.target.checked)} />
        Show revoked links
      </label>
      {revoke.isError && (
        <Alert tone="danger" live>
          {revoke.error.message}
        </Alert>
      )}
      {links.isPending && <Spinner label="Loading display links…" showLabel />}
      {links.isError && <Alert tone="danger">{links.error.message}</Alert>}
      {links.data && links.data.items.length === 0 && <p className="text-sm text-muted">No display links yet.</p>}
      {links.data && links.data.items.length > 0 && (
        <ul className="divide-y divide-line rounded-lg border border-line">
          {links.data.items.map((l) => (
            <li key={l.id} className="flex flex-wrap items-center gap-3 p-3" data-testid={`display-link-${l.id}`}>
              <div className="min-w-0 flex-1">
                <p className="font-semibold text-ink">
                  {l.name}
                  {l.revokedAt && <span className="ml-2 text-xs font-semibold text-muted uppercase">Revoked</span>}
                </p>
                <p className="text-xs text-muted">
                  Created <RelativeTime value={l.createdAt} />
                  {l.createdBy && ` by ${l.createdBy}`} ·{' '}
                  {l.lastSeenAt ? (
                    <>
                      last seen <RelativeTime value={l.lastSeenAt} />
                    </>
                  ) : (
                    'not opened yet'
                  )}
                </p>
              </div>
              {!l.revokedAt && confirming !== l.id && (
                <Button variant="secondary" onClick={() => setConfirming(l.id)}>
                  Revoke…
                </Button>
              )}
              {!l.revokedAt && confirming === l.id && (
                <>
                  <Button
                    variant="danger"
                    busy={revoke.isPending}
                    onClick={() => revoke.mutate(l.id, { onSettled: () => setConfirming(null) })}
                  >
                    Yes, revoke
                  </Button>
                  <Button variant="secondary" onClick={() => setConfirming(null)}>
                    Keep
                  </Button>
                </>
              )}
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
