import { useId, useState } from 'react';
import { MAX_PHOTOS, MAX_PHOTO_BYTES, PHOTO_ACCEPT } from '@shared/schemas/tickets';
import type { DraftPhoto } from '@/features/report/hooks/use-report-draft';

/**
 * Photos straight from the camera (capture="environment" opens the rear camera on phones;
 * desktops get a file chooser). Checks here only save a wasted upload: the server decides.
 */
export function PhotoPicker({
  photos,
  onAdd,
  onRemove,
  disabled,
  stored,
}: {
  photos: DraftPhoto[];
  onAdd: (files: File[]) => void;
  onRemove: (id: string) => void;
  disabled?: boolean;
  stored: 'loading' | 'ready' | 'unavailable';
}) {
  const id = useId();
  const [notes, setNotes] = useState<string[]>([]);
  const room = MAX_PHOTOS - photos.length;

  const pick = (list: FileList | null) => {
    if (!list) return;
    const files = [...list];
    const problems: string[] = [];
    const ok = files.filter((f) => {
      if (f.type && !f.type.startsWith('image/')) return (problems.push(`${f.name} is not a picture.`), false);
      if (f.size > MAX_PHOTO_BYTES) return (problems.push(`${f.name} is larger than ${MAX_PHOTO_BYTES / 1024 / 1024} MB.`), false);
      return true;
    });
    if (ok.length > room) problems.push(`Only ${MAX_PHOTOS} photos fit in one report; the last ${ok.length - room} were left out.`);
    setNotes(problems);
    if (ok.length) onAdd(ok.slice(0, Math.max(0, room)));
  };

  return (
    <div className="flex flex-col gap-2">
      <p className="text-base font-semibold text-ink">
        Photos <span className="font-normal text-muted">(optional, up to {MAX_PHOTOS})</span>
      </p>
      <p className="-mt-1 text-sm text-muted">
        The alarm screen, the damage, the wafer. Location data in the photo is removed when it is saved.
      </p>
      {photos.length > 0 && (
        <ul className="grid grid-cols-3 gap-2 sm:grid-cols-6" aria-label="Photos to send">
          {photos.map((p, i) => (
            <li key={p.id} className="relative">
              <img src={p.url} alt={`Photo ${i + 1}`} className="aspect-square w-full rounded-lg border border-line object-cover" />
              <button
                type="button"
                onClick={() => onRemove(p.id)}
                disabled={disabled}
                aria-label={`Remove photo ${i + 1}`}
                className="absolute top-1 right-1 inline-flex size-11 items-center justify-center rounded-full bg-ink/80 text-card"
              >
                <svg viewBox="0 0 16 16" className="size-4" aria-hidden="true">
                  <path d="M4 4l8 8M12 4l-8 8" stroke="currentColor" strokeWidth="2" strokeLinecap="round" />
                </svg>
              </button>
            </li>
          ))}
        </ul>
      )}
      {room > 0 && (
        <label
          htmlFor={id}
          className="inline-flex min-h-13 cursor-pointer items-center justify-center gap-2 rounded-xl border-2 border-dashed border-control bg-card px-4 text-base font-semibold text-ink has-[:focus-visible]:outline-3 has-[:focus-visible]:outline-focus has-[:disabled]:opacity-60"
        >
          <svg viewBox="0 0 20 20" className="size-5" aria-hidden="true">
            <path d="M3 6.5h3l1.5-2h5L14 6.5h3V16H3Z" fill="none" stroke="currentColor" strokeWidth="1.6" strokeLinejoin="round" />
            <circle cx="10" cy="11" r="3" fill="none" stroke="currentColor" strokeWidth="1.6" />
          </svg>
          {photos.length ? 'Add another photo' : 'Take or add photos'}
          <input
            id={id}
            type="file"
            accept={PHOTO_ACCEPT}
            capture="environment"
            multiple
            disabled={disabled}
            className="sr-only"
            onChange={(e) => {
              pick(e.target.files);
              e.target.value = '';
            }}
          />
        </label>
      )}
      {notes.map((n) => (
        <p key={n} className="text-sm font-medium text-alert-danger-ink">
          {n}
        </p>
      ))}
      {stored === 'unavailable' && photos.length > 0 && (
        <p className="text-sm text-muted">
          This browser cannot keep photos in a draft; if the page is closed before sending, add them again.
        </p>
      )}
    </div>
  );
}
