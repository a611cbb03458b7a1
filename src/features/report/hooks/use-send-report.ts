import { useCallback, useEffect, useRef, useState } from 'react';
import { addReportInputSchema, reportInputSchema, type AddReportInput, type ReportInput } from '@shared/schemas/tickets';
import { isApiError } from '@/lib/api-client';
import { addReport, createReport, type SentReport } from '@/features/report/api/send-report';
import { newDraftKey, type DraftPhoto, type ReportDraft } from '@/features/report/hooks/use-report-draft';

export type SendState = 'idle' | 'sending' | 'waiting' | 'failed';

/** Answers that mean "try again later" rather than "this report is wrong". */
export function isRetryable(error: unknown) {
  return isApiError(error) && (error.status === 0 || error.status === 502 || error.status === 503 || error.status === 504);
}

const RETRY_MS = 20_000;

function toInput(d: ReportDraft): { kind: 'new'; input: ReportInput } | { kind: 'add'; ticketId: number; input: AddReportInput } {
  const common = {
    description: d.description,
    alarmText: d.alarmText || null,
    hazards: d.hazards,
    wafersCount: d.wafersCount,
    wafersOwner: d.wafersCount > 0 ? d.wafersOwner || null : null,
    wafersRecoverable: d.wafersCount > 0 && d.wafersRecoverable ? d.wafersRecoverable : null,
    clientKey: d.clientKey,
  };
  if (d.addToTicketId) return { kind: 'add', ticketId: d.addToTicketId, input: { ...common, impact: d.impact || null } };
  return {
    kind: 'new',
    input: {
      ...common,
      toolId: d.toolId ?? 0,
      moduleId: d.moduleId,
      category: (d.category || undefined) as ReportInput['category'],
      impact: (d.impact || undefined) as ReportInput['impact'],
    },
  };
}

function fieldErrors(issues: { path: PropertyKey[]; message: string }[]) {
  const fields: Record<string, string[]> = {};
  for (const i of issues) (fields[String(i.path[0] ?? '')] ??= []).push(i.message);
  return fields;
}

/**
 * Sends the draft with its photos and upload progress. When the network or the server is
 * away, the draft is marked pending and goes out by itself when the browser is back online
 * (and every 20 s meanwhile, for a server that answered 503).
 */
export function useSendReport(opts: {
  draft: ReportDraft;
  photos: DraftPhoto[];
  update: (c: Partial<ReportDraft>) => void;
  onSent: (r: SentReport, kind: 'new' | 'add') => void;
}) {
  const { draft, photos, update, onSent } = opts;
  const [state, setState] = useState<SendState>(draft.pending ? 'waiting' : 'idle');
  const [progress, setProgress] = useState<number | null>(null);
  const [fields, setFields] = useState<Record<string, string[]>>({});
  const [message, setMessage] = useState<string | null>(null);
  const inFlight = useRef(false);
  const latest = useRef({ draft, photos, onSent });
  latest.current = { draft, photos, onSent };

  const send = useCallback(async () => {
    if (inFlight.current) return;
    const { draft: d, photos: p, onSent: done } = latest.current;
    const target = toInput(d);
    const parsed = target.kind === 'new' ? reportInputSchema.safeParse(target.input) : addReportInputSchema.safeParse(target.input);
    if (!parsed.success) {
      setFields(fieldErrors(parsed.error.issues));
      setMessage('Some answers are missing. They are marked below.');
      setState('failed');
      update({ pending: false });
      return;
    }
    setFields({});
    setMessage(null);
    if (typeof navigator !== 'undefined' && navigator.onLine === false) {
      setState('waiting');
      update({ pending: true });
      return;
    }
    inFlight.current = true;
    setState('sending');
    setProgress(0);
    try {
      const files = p.map((x) => ({ blob: x.blob, name: x.name }));
      const result =
        target.kind === 'new'
          ? await createReport(target.input, files, setProgress)
          : await addReport(target.ticketId, target.input, files, setProgress);
      setState('idle');
      done(result, target.kind);
    } catch (error) {
      if (isRetryable(error)) {
        setState('waiting');
        update({ pending: true });
      } else {
        setState('failed');
        // Another tab sent this draft with other words: these words become a draft of their own.
        update(
          isApiError(error) && error.code === 'draft_sent_elsewhere' ? { pending: false, clientKey: newDraftKey() } : { pending: false },
        );
        setMessage(error instanceof Error ? error.message : 'The report could not be sent.');
        if (isApiError(error) && error.fields) setFields(error.fields);
      }
    } finally {
      inFlight.current = false;
      setProgress(null);
    }
  }, [update]);

  useEffect(() => {
    if (!draft.pending) return;
    const retry = () => void send();
    window.addEventListener('online', retry);
    const timer = setInterval(() => {
      if (navigator.onLine) retry();
    }, RETRY_MS);
    return () => {
      window.removeEventListener('online', retry);
      clearInterval(timer);
    };
  }, [draft.pending, send]);

  return { send, state: draft.pending && state !== 'sending' ? 'waiting' : state, progress, fields, message };
}
