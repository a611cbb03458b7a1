import { useState, type FormEvent } from 'react';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { useAddComment } from '@/features/tickets/api/add-comment';
import { TextAreaField } from '@/features/tickets/components/field-controls';
import { cx } from '@/lib/cx';

/** A public reply, or for staff an internal note that members never see. */
export function CommentBox({ ticketId, canNote }: { ticketId: number; canNote: boolean }) {
  const [body, setBody] = useState('');
  const [internal, setInternal] = useState(false);
  const add = useAddComment(ticketId);

  const submit = (e: FormEvent) => {
    e.preventDefault();
    if (!body.trim()) return;
    add.mutate({ body: body.trim(), internal }, { onSuccess: () => setBody('') });
  };

  return (
    <form
      onSubmit={submit}
      className={cx(
        'flex flex-col gap-3 rounded-xl border p-4 amber:border-2',
        internal ? 'border-2 border-dashed border-control bg-sunken' : 'border-line bg-card',
      )}
    >
      {canNote && (
        <div role="radiogroup" aria-label="Who can read it" className="flex flex-wrap gap-2">
          <Button
            size="md"
            variant={!internal ? 'primary' : 'secondary'}
            role="radio"
            aria-checked={!internal}
            onClick={() => setInternal(false)}
          >
            Reply (everyone)
          </Button>
          <Button
            size="md"
            variant={internal ? 'primary' : 'secondary'}
            role="radio"
            aria-checked={internal}
            onClick={() => setInternal(true)}
          >
            Internal note (staff only)
          </Button>
        </div>
      )}
      <TextAreaField
        label={internal ? 'Internal note' : 'Reply'}
        hint={
          internal
            ? 'Only technicians, managers and admins see this.'
            : 'Everyone who can see this ticket reads it; the reporters get an e-mail.'
        }
        value={body}
        onChange={(e) => setBody(e.target.value)}
        maxLength={4000}
      />
      {add.isError && (
        <Alert tone="danger" live>
          {add.error.message}
        </Alert>
      )}
      <div>
        <Button type="submit" size="lg" busy={add.isPending} disabled={!body.trim()}>
          {internal ? 'Add note' : 'Send reply'}
        </Button>
      </div>
    </form>
  );
}
