import { useEffect, useId, useRef, type FormEvent } from 'react';
import type { Hazard } from '@shared/report-options';
import { HazardCautions } from '@/components/hazard-cautions';
import { useNavigate } from 'react-router';
import { CATEGORY_LABELS, HAZARDS, HAZARD_LABELS, IMPACTS, IMPACT_HELP, IMPACT_LABELS, TICKET_CATEGORIES } from '@shared/report-options';
import { WAFER_RECOVERABLE, WAFER_RECOVERABLE_LABELS, type ToolChoice } from '@shared/schemas/tickets';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/text-field';
import { Spinner } from '@/components/ui/spinner';
import { cx } from '@/lib/cx';
import { useToolChoices } from '@/features/report/api/get-tool-choices';
import { useOpenTickets } from '@/features/report/api/get-open-tickets';
import { draftHasContent, useReportDraft } from '@/features/report/hooks/use-report-draft';
import { useSendReport } from '@/features/report/hooks/use-send-report';
import { CheckCards, RadioCards } from '@/features/report/components/choice-cards';
import { ToolPicker } from '@/features/report/components/tool-picker';
import { PhotoPicker } from '@/features/report/components/photo-picker';
import { DuplicateList } from '@/features/report/components/duplicate-list';

function WaferStepper({ value, onChange }: { value: number; onChange: (n: number) => void }) {
  const id = useId();
  return (
    <div className="flex flex-col gap-2">
      <label htmlFor={id} className="text-base font-semibold text-ink">
        Wafers left in the tool
      </label>
      <div className="flex items-center gap-2">
        <Button
          size="lg"
          variant="secondary"
          aria-label="One wafer fewer"
          disabled={value <= 0}
          onClick={() => onChange(Math.max(0, value - 1))}
          className="w-14 text-2xl"
        >
          −
        </Button>
        <input
          id={id}
          type="number"
          inputMode="numeric"
          min={0}
          max={1000}
          value={value}
          onChange={(e) => onChange(Math.max(0, Math.min(1000, Number(e.target.value) || 0)))}
          className="min-h-13 w-24 rounded-xl border border-control bg-card text-center text-xl font-semibold tabular-nums amber:border-2"
        />
        <Button
          size="lg"
          variant="secondary"
          aria-label="One wafer more"
          onClick={() => onChange(Math.min(1000, value + 1))}
          className="w-14 text-2xl"
        >
          +
        </Button>
      </div>
    </div>
  );
}

function ChosenTool({ tool, onChange }: { tool: { name: string; code: string; areaName?: string | null }; onChange?: () => void }) {
  return (
    <div className="flex flex-wrap items-center gap-3 rounded-xl border-2 border-ink bg-card p-4" data-testid="chosen-tool">
      <div className="min-w-0 flex-1">
        <p className="text-xs font-semibold tracking-wide text-muted uppercase">Tool</p>
        <p className="text-lg font-bold text-ink">{tool.name}</p>
        <p className="text-sm text-muted">
          <span className="font-mono">{tool.code}</span>
          {tool.areaName ? ` · ${tool.areaName}` : ''}
        </p>
      </div>
      {onChange && (
        <Button variant="secondary" size="lg" onClick={onChange}>
          Change tool
        </Button>
      )}
    </div>
  );
}

/**
 * The fault report, phone first: big targets, one column, every answer kept as a draft while
 * it is typed. "Tool stopped" puts the tool Down on arrival; a hazard shows the cautions here
 * and alerts the on-call staff.
 */
export function ReportForm({ userId, toolCode, addTo }: { userId: number; toolCode: string | null; addTo: number | null }) {
  const navigate = useNavigate();
  const { draft, update, photos, addPhotos, removePhoto, discard, restored, photoStore, endedElsewhere } = useReportDraft(userId);
  const code = toolCode?.trim().toUpperCase() || null;
  const hasContent = draftHasContent(draft, photos.length);
  const otherToolDraft = Boolean(code && draft.toolCode && draft.toolCode !== code && hasContent);

  // A tool from the QR label (or a link) fills the form, unless it would replace someone's unsent words.
  const byCode = useToolChoices({ code: code ?? undefined }, Boolean(code) && draft.toolCode !== code);
  const applyTool = (tool: ToolChoice, keep = true) =>
    update({ toolId: tool.id, toolCode: tool.code, toolName: tool.name, moduleId: null, addToTicketId: keep ? draft.addToTicketId : null });
  // Only a tool whose code was in the address may fill the form: the lookup's cache entry (and its
  // placeholder) is shared with the search list, so without this check the first tool of any
  // list would be picked by itself.
  const lookedUp = code ? byCode.data?.items.find((t) => t.code.toUpperCase() === code) : undefined;
  useEffect(() => {
    if (lookedUp && !otherToolDraft && draft.toolId !== lookedUp.id)
      update({ toolId: lookedUp.id, toolCode: lookedUp.code, toolName: lookedUp.name, moduleId: null });
  }, [lookedUp, otherToolDraft, draft.toolId, update]);
  useEffect(() => {
    if (addTo && !draft.addToTicketId && !otherToolDraft) update({ addToTicketId: addTo });
  }, [addTo, draft.addToTicketId, otherToolDraft, update]);

  const toolInfo = useToolChoices({ id: draft.toolId ?? undefined }, draft.toolId !== null);
  const tool = toolInfo.data?.items.find((t) => t.id === draft.toolId) ?? null;
  const open = useOpenTickets(draft.toolId);
  const addTarget = open.data?.items.find((t) => t.id === draft.addToTicketId) ?? null;

  const { send, state, progress, fields, message } = useSendReport({
    draft,
    photos,
    update,
    onSent: (result, kind) => {
      void discard();
      navigate(`/tickets/${result.id}`, { state: { justReported: kind } });
    },
  });

  // A draft left pending goes out once its photos are back from IndexedDB.
  const triedOnLoad = useRef(false);
  useEffect(() => {
    if (triedOnLoad.current || !draft.pending || photoStore === 'loading') return;
    triedOnLoad.current = true;
    void send();
  }, [draft.pending, photoStore, send]);

  // A newly ticked hazard brings its cautions into view at once: on a phone they would
  // otherwise sit below the fold, under the boxes just tapped.
  const cautionsRef = useRef<HTMLDivElement>(null);
  const revealCautions = useRef(false);
  const tickHazards = (next: Hazard[]) => {
    revealCautions.current = next.some((h) => !draft.hazards.includes(h));
    update({ hazards: next });
  };
  useEffect(() => {
    const el = cautionsRef.current;
    if (!revealCautions.current || !el) return;
    revealCautions.current = false;
    const top = el.getBoundingClientRect().top;
    // Leave the last boxes in sight above the cautions, so a second tick stays one tap away.
    if (top < 0 || top > window.innerHeight * 0.45) window.scrollBy({ top: top - window.innerHeight * 0.3 });
  }, [draft.hazards]);

  const busy = state === 'sending';
  const adding = draft.addToTicketId !== null;
  const submit = (e: FormEvent) => {
    e.preventDefault();
    void send();
  };

  return (
    <form
      onSubmit={submit}
      noValidate
      className="mx-auto flex max-w-2xl flex-col gap-6"
      aria-label="Report a fault"
      data-testid="report-form"
    >
      <p className="text-sm text-muted">In an emergency, leave the area and raise the facility alarm first. Report here afterwards.</p>

      {state === 'waiting' && (
        <Alert
          tone="warning"
          live
          title="Saved as draft — will send when back online"
          actions={
            <Button variant="secondary" onClick={() => void send()}>
              Try to send now
            </Button>
          }
        >
          Faultline could not be reached. Your report and photos are kept on this device and go out by themselves as soon as the connection
          is back. You can close this page.
        </Alert>
      )}
      {endedElsewhere && (
        <Alert
          tone="info"
          live
          title="This draft was sent or discarded in another tab"
          actions={
            <Button variant="secondary" onClick={() => navigate('/my-reports')}>
              See my reports
            </Button>
          }
        >
          Both tabs showed the same words, so nothing you typed here was lost. The form is empty for a new report.
        </Alert>
      )}
      {restored && hasContent && state !== 'waiting' && !otherToolDraft && !endedElsewhere && (
        <Alert
          tone="info"
          title="Your unsent report is back"
          actions={
            <Button variant="ghost" onClick={() => void discard()}>
              Start over
            </Button>
          }
        >
          It was saved on this device while you wrote it.
        </Alert>
      )}
      {otherToolDraft && (
        <Alert
          tone="warning"
          title={`You have an unsent report about ${draft.toolName ?? draft.toolCode}`}
          actions={
            <>
              <Button variant="secondary" onClick={() => navigate('/report', { replace: true })}>
                Finish that report
              </Button>
              <Button
                variant="secondary"
                onClick={() =>
                  void discard().then(() => {
                    if (lookedUp) applyTool(lookedUp, false);
                  })
                }
              >
                Discard it and report {code}
              </Button>
            </>
          }
        >
          This page was opened for {code}. Only one report can be drafted at a time.
        </Alert>
      )}

      {draft.toolId && (tool || draft.toolName) ? (
        <ChosenTool
          tool={tool ?? { name: draft.toolName ?? '', code: draft.toolCode ?? '' }}
          onChange={
            adding
              ? undefined
              : () => {
                  update({ toolId: null, toolCode: null, toolName: null, moduleId: null });
                  // Drop ?tool= too, or the QR code would put the same tool straight back.
                  if (code) navigate('/report', { replace: true });
                }
          }
        />
      ) : code && byCode.isPending ? (
        <Spinner label={`Finding ${code}…`} showLabel />
      ) : (
        <>
          {code && byCode.data && byCode.data.items.length === 0 && (
            <Alert tone="warning" title={`No tool with the code ${code}`}>
              The label may be old. Find the tool by name instead.
            </Alert>
          )}
          <ToolPicker onPick={(t) => applyTool(t, false)} errors={fields.toolId} />
        </>
      )}

      {adding ? (
        <Alert
          tone="info"
          title={`Adding your report to #${draft.addToTicketId}${addTarget ? `: ${addTarget.title}` : ''}`}
          actions={
            <Button variant="secondary" onClick={() => update({ addToTicketId: null })}>
              No, it is a different problem
            </Button>
          }
        >
          Your text, photos and answers are added to that ticket under your name, and you will hear when it is fixed.
        </Alert>
      ) : (
        draft.toolId &&
        open.data && (
          <DuplicateList
            items={open.data.items}
            typed={`${draft.description} ${draft.alarmText}`}
            onAddTo={(t) => update({ addToTicketId: t.id })}
          />
        )
      )}

      <CheckCards
        legend="Is anyone or anything in danger?"
        hint="Tick what applies. Staff on call are alerted at once."
        tone="danger"
        choices={HAZARDS.map((h) => ({ value: h, label: HAZARD_LABELS[h] }))}
        values={draft.hazards}
        onChange={tickHazards}
      />
      {draft.hazards.length > 0 && <HazardCautions ref={cautionsRef} hazards={draft.hazards} live className="scroll-mt-20" />}

      <TextAreaBig
        label="What happened?"
        required
        value={draft.description}
        onChange={(v) => update({ description: v })}
        errors={fields.description}
        hint="What you were doing, what you saw or heard."
      />

      <TextField
        label="Alarm text on the tool's screen"
        hint="Copy it exactly, with any number."
        value={draft.alarmText}
        onChange={(e) => update({ alarmText: e.target.value })}
        maxLength={1000}
        inputClassName="min-h-13 font-mono text-lg"
        autoCapitalize="characters"
        errors={fields.alarmText}
      />

      <RadioCards
        name="impact"
        legend={<>Can the tool still be used?{!adding && <span className="font-normal text-muted"> (required)</span>}</>}
        hint={adding ? 'Only if it changed since the first report.' : undefined}
        choices={IMPACTS.map((i) => ({
          value: i,
          label: IMPACT_LABELS[i],
          help:
            i === 'tool_stopped'
              ? `${IMPACT_HELP[i]} It will show as Down on the board at once.`
              : i === 'tool_limited'
                ? `${IMPACT_HELP[i]} It will show as Limited on the board at once.`
                : IMPACT_HELP[i],
        }))}
        value={draft.impact}
        onChange={(v) => update({ impact: v })}
        errors={fields.impact}
      />

      {!adding && tool && tool.modules.length > 0 && (
        <RadioCards
          name="module"
          legend="Which part of the tool?"
          columns={2}
          choices={[
            { value: 'tool', label: 'The whole tool / not sure' },
            ...tool.modules.map((m) => ({ value: String(m.id), label: m.name, help: m.code })),
          ]}
          value={draft.moduleId ? String(draft.moduleId) : 'tool'}
          onChange={(v) => update({ moduleId: v === 'tool' ? null : Number(v) })}
          errors={fields.moduleId}
        />
      )}

      {!adding && (
        <RadioCards
          name="category"
          legend={
            <>
              What kind of problem? <span className="font-normal text-muted">(required)</span>
            </>
          }
          columns={2}
          choices={TICKET_CATEGORIES.map((c) => ({ value: c, label: CATEGORY_LABELS[c] }))}
          value={draft.category}
          onChange={(v) => update({ category: v })}
          errors={fields.category}
        />
      )}

      <div className="flex flex-col gap-4 rounded-xl border border-line bg-card p-4 amber:border-2">
        <WaferStepper value={draft.wafersCount} onChange={(n) => update({ wafersCount: n })} />
        {draft.wafersCount > 0 && (
          <>
            <TextField
              label="Whose wafers?"
              hint="A name or group, so the right person is told."
              value={draft.wafersOwner}
              onChange={(e) => update({ wafersOwner: e.target.value })}
              maxLength={120}
              inputClassName="min-h-13"
            />
            <RadioCards
              name="recoverable"
              legend="Can they be recovered?"
              choices={WAFER_RECOVERABLE.map((r) => ({ value: r, label: WAFER_RECOVERABLE_LABELS[r] }))}
              value={draft.wafersRecoverable}
              onChange={(v) => update({ wafersRecoverable: v })}
            />
          </>
        )}
      </div>

      <PhotoPicker
        photos={photos}
        onAdd={(f) => void addPhotos(f)}
        onRemove={(id) => void removePhoto(id)}
        disabled={busy}
        stored={photoStore}
      />

      <div className="sticky bottom-0 -mx-4 flex flex-col gap-3 border-t border-line bg-page/95 px-4 py-4 backdrop-blur sm:static sm:mx-0 sm:border-0 sm:bg-transparent sm:p-0">
        {message && (
          <Alert tone="danger" live title="Not sent yet">
            {message}
          </Alert>
        )}
        {progress !== null && (
          <div className="flex flex-col gap-1" data-testid="upload-progress">
            <progress
              max={1}
              value={progress}
              aria-label="Sending the report"
              className="h-3 w-full overflow-hidden rounded-full [&::-webkit-progress-bar]:bg-sunken [&::-webkit-progress-value]:bg-accent"
            />
            <p className="text-sm text-muted" aria-live="polite">
              {photos.length
                ? `Uploading ${photos.length} photo${photos.length === 1 ? '' : 's'}… ${Math.round(progress * 100)} %`
                : 'Sending…'}
            </p>
          </div>
        )}
        <Button type="submit" size="lg" busy={busy} className="w-full" disabled={otherToolDraft}>
          {adding ? `Add my report to #${draft.addToTicketId}` : 'Send report'}
        </Button>
        {hasContent && !busy && (
          <Button variant="ghost" onClick={() => void discard()}>
            Discard this draft
          </Button>
        )}
      </div>
    </form>
  );
}

function TextAreaBig({
  label,
  hint,
  value,
  onChange,
  errors,
  required,
}: {
  label: string;
  hint?: string;
  value: string;
  onChange: (v: string) => void;
  errors?: string[];
  required?: boolean;
}) {
  const id = useId();
  return (
    <div className="flex flex-col gap-1.5">
      <label htmlFor={id} className="text-base font-semibold text-ink">
        {label}
        {required && <span className="font-normal text-muted"> (required)</span>}
      </label>
      {hint && <p className="text-sm text-muted">{hint}</p>}
      <textarea
        id={id}
        rows={4}
        value={value}
        maxLength={4000}
        onChange={(e) => onChange(e.target.value)}
        aria-invalid={errors?.length ? true : undefined}
        className={cx(
          'w-full rounded-xl border bg-card px-4 py-3 text-lg text-ink amber:border-2',
          errors?.length ? 'border-2 border-state-down-fill' : 'border-control',
        )}
      />
      {errors?.map((e) => (
        <p key={e} className="text-sm font-medium text-alert-danger-ink">
          {e}
        </p>
      ))}
    </div>
  );
}
