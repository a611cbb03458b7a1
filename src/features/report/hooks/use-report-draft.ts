import { useCallback, useEffect, useRef, useState } from 'react';
import type { Hazard, Impact, TicketCategory } from '@shared/report-options';
import type { WaferRecoverable } from '@shared/schemas/tickets';
import { clearDraftPhotos, deleteDraftPhoto, loadDraftPhotos, saveDraftPhoto } from '@/features/report/hooks/photo-store';

/** Everything typed into the report form; kept in localStorage while the report is unsent. */
export interface ReportDraft {
  /** Made once per draft; lets the server recognise a resend of the same report. */
  clientKey: string;
  toolId: number | null;
  toolCode: string | null;
  toolName: string | null;
  moduleId: number | null;
  /** Set when the report is added to an open ticket ("I see it too") instead of opening one. */
  addToTicketId: number | null;
  category: TicketCategory | '';
  description: string;
  alarmText: string;
  impact: Impact | '';
  hazards: Hazard[];
  wafersCount: number;
  wafersOwner: string;
  wafersRecoverable: WaferRecoverable | '';
  /** The user pressed Send and it could not go through yet: send again when possible. */
  pending: boolean;
  updatedAt: number;
}

export interface DraftPhoto {
  id: string;
  name: string;
  blob: Blob;
  url: string;
}

export const newDraftKey = () =>
  crypto.randomUUID ? crypto.randomUUID() : `${Date.now().toString(36)}-${Math.random().toString(36).slice(2, 14)}`;

export function emptyDraft(): ReportDraft {
  return {
    clientKey: newDraftKey(),
    toolId: null,
    toolCode: null,
    toolName: null,
    moduleId: null,
    addToTicketId: null,
    category: '',
    description: '',
    alarmText: '',
    impact: '',
    hazards: [],
    wafersCount: 0,
    wafersOwner: '',
    wafersRecoverable: '',
    pending: false,
    updatedAt: Date.now(),
  };
}

export const draftKey = (userId: number) => `faultline.report-draft.v1.${userId}`;

function readDraft(userId: number): ReportDraft | null {
  try {
    const raw = localStorage.getItem(draftKey(userId));
    if (!raw) return null;
    return { ...emptyDraft(), ...(JSON.parse(raw) as Partial<ReportDraft>) };
  } catch {
    return null;
  }
}

/** Whether anything worth keeping has been entered. */
export function draftHasContent(d: ReportDraft, photos: number) {
  return Boolean(d.description.trim() || d.alarmText.trim() || d.category || d.impact || d.hazards.length || d.wafersCount || photos);
}

/**
 * The report being written, saved as it is typed: the text in localStorage, the photos in
 * IndexedDB. It survives a reload, a closed tab and a lost connection.
 */
export function useReportDraft(userId: number) {
  const [draft, setDraft] = useState<ReportDraft>(() => readDraft(userId) ?? emptyDraft());
  const [restored] = useState(() => readDraft(userId) !== null);
  const [photos, setPhotos] = useState<DraftPhoto[]>([]);
  const [photoStore, setPhotoStore] = useState<'loading' | 'ready' | 'unavailable'>('loading');
  const urls = useRef<string[]>([]);

  useEffect(() => {
    let cancelled = false;
    loadDraftPhotos(userId)
      .then((stored) => {
        if (cancelled) return;
        const loaded = stored.map((p) => ({ id: p.id, name: p.name, blob: p.blob, url: URL.createObjectURL(p.blob) }));
        urls.current.push(...loaded.map((p) => p.url));
        setPhotos(loaded);
        setPhotoStore('ready');
      })
      .catch(() => !cancelled && setPhotoStore('unavailable'));
    return () => {
      cancelled = true;
    };
  }, [userId]);

  useEffect(() => () => urls.current.forEach((u) => URL.revokeObjectURL(u)), []);

  // Written on every change; a report is small and typing speed is no concern for localStorage.
  useEffect(() => {
    try {
      localStorage.setItem(draftKey(userId), JSON.stringify(draft));
    } catch {
      // Storage full or blocked: the form still works, it just will not survive a reload.
    }
  }, [draft, userId]);

  // Another tab of the same browser editing the draft: take its newer version, so both tabs
  // show the same words and neither overwrites the other's with an older copy.
  // When that tab sends or discards the draft, this one says so instead of going blank.
  const [endedElsewhere, setEndedElsewhere] = useState(false);
  const current = useRef(draft);
  current.current = draft;
  useEffect(() => {
    const onStorage = (e: StorageEvent) => {
      if (e.key !== draftKey(userId)) return;
      if (e.newValue === null) {
        // Sent or discarded over there: the words were the same here, so start afresh and say so.
        const had = draftHasContent(current.current, 0);
        setEndedElsewhere(had);
        if (had) setDraft(emptyDraft());
        return;
      }
      try {
        const theirs = { ...emptyDraft(), ...(JSON.parse(e.newValue) as Partial<ReportDraft>) };
        const mine = current.current;
        if (theirs.updatedAt <= mine.updatedAt) return;
        if (theirs.clientKey !== mine.clientKey && draftHasContent(mine, 0)) setEndedElsewhere(true);
        setDraft(theirs);
      } catch {
        // A malformed value from elsewhere is ignored; this tab keeps its own draft.
      }
    };
    window.addEventListener('storage', onStorage);
    return () => window.removeEventListener('storage', onStorage);
  }, [userId]);

  const update = useCallback((change: Partial<ReportDraft>) => {
    setEndedElsewhere(false);
    setDraft((d) => ({ ...d, ...change, updatedAt: Date.now() }));
  }, []);

  const addPhotos = useCallback(
    async (files: File[]) => {
      const added = files.map((f) => ({ id: newDraftKey(), name: f.name || 'photo.jpg', blob: f as Blob, url: URL.createObjectURL(f) }));
      urls.current.push(...added.map((p) => p.url));
      setPhotos((old) => [...old, ...added]);
      await Promise.all(added.map((p) => saveDraftPhoto(userId, p).catch(() => setPhotoStore('unavailable'))));
    },
    [userId],
  );

  const removePhoto = useCallback(
    async (id: string) => {
      setPhotos((old) => old.filter((p) => p.id !== id));
      await deleteDraftPhoto(userId, id).catch(() => undefined);
    },
    [userId],
  );

  const discard = useCallback(async () => {
    localStorage.removeItem(draftKey(userId));
    setDraft(emptyDraft());
    setPhotos([]);
    await clearDraftPhotos(userId).catch(() => undefined);
  }, [userId]);

  return { draft, update, photos, addPhotos, removePhoto, discard, restored, photoStore, endedElsewhere };
}
