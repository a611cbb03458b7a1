import { useCallback } from 'react';
import { useParams, useSearchParams } from 'react-router';
import { useQueryClient } from '@tanstack/react-query';
import { FaultlineGlyph } from '@/components/layout/wordmark';
import { Spinner } from '@/components/ui/spinner';
import { isApiError } from '@/lib/api-client';
import { useDisplayBoard } from '@/features/display/api/get-display-board';
import { useDisplayLink } from '@/features/display/api/get-display-link';
import { DisplayBoard } from '@/features/display/components/display-board';
import { displayKeys } from '@/features/display/api/display-keys';
import { useRealtimeStatus } from '@/lib/socket';
import { useRealtime } from '@/app/realtime';
import { useFacilitySettings } from '@/lib/facility-settings';

function Message({ title, text }: { title: string; text: string }) {
  return (
    <div className="flex min-h-dvh flex-col items-center justify-center gap-6 bg-page p-8 text-center" data-testid="display-message">
      <FaultlineGlyph className="size-16" />
      <h1 className="text-[clamp(2rem,4vw,4rem)] font-bold text-ink">{title}</h1>
      <p className="max-w-3xl text-[clamp(1.25rem,2vw,2rem)] text-muted">{text}</p>
    </div>
  );
}

/** The lobby display: opened by its link, no sign-in, no controls. */
export function DisplayPage() {
  const { key = '' } = useParams();
  // ?areas=LITHO,ETCH puts one bay's tools on the screen that hangs in that bay.
  const [params] = useSearchParams();
  const areaCodes = (params.get('areas') ?? '')
    .split(',')
    .map((c) => c.trim())
    .filter(Boolean);
  const link = useDisplayLink(key);
  const refused = isApiError(link.error) && (link.error.status === 401 || link.error.status === 400);
  const allowed = Boolean(link.data) && !refused;
  const board = useDisplayBoard(key, allowed);
  const queryClient = useQueryClient();
  // Cut off or refused: re-check the key, which shows "not valid any more" once it is revoked.
  const recheck = useCallback(() => void queryClient.invalidateQueries({ queryKey: displayKeys.all }), [queryClient]);
  useRealtime({ displayKey: key, onRefused: recheck, enabled: allowed });
  const status = useRealtimeStatus();
  const settings = useFacilitySettings(allowed ? key : undefined);

  if (refused || (isApiError(board.error) && board.error.status === 401)) {
    return (
      <Message
        title="This display link is not valid any more"
        text="It was revoked or mistyped. Ask a Faultline administrator for a new display link."
      />
    );
  }
  if (!link.data || !board.data) {
    if (link.isError || board.isError)
      return <Message title="The board cannot be reached" text="Faultline is not answering. This screen keeps trying." />;
    return (
      <div className="flex min-h-dvh items-center justify-center bg-page">
        <Spinner size="lg" label="Loading the board…" showLabel />
      </div>
    );
  }
  return (
    <>
      <title>{`${link.data.name} · Faultline`}</title>
      <DisplayBoard name={link.data.name} data={board.data} status={status} areaCodes={areaCodes} timeZone={settings.data?.timeZone} />
    </>
  );
}

export { DisplayPage as Component };
