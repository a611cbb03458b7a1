import { useState } from 'react';
import { FormProvider } from 'react-hook-form';
import {
  facilitySettingsSchema,
  MEMBER_TICKET_VISIBILITY,
  MEMBER_TICKET_VISIBILITY_LABELS,
  type FacilitySettings,
} from '@shared/schemas/facility-settings';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { FormRadioGroup, FormTextArea, FormTextField } from '@/components/ui/form/form-fields';
import { showServerErrors, useZodForm } from '@/components/ui/form/use-zod-form';
import { useSaveFacilitySettings } from '@/features/facility-settings/api/save-facility-settings';

const FIELDS = Object.keys(facilitySettingsSchema.shape);

const VISIBILITY_HELP = {
  all: 'Fits an open facility: anyone signed in can read any ticket, with reporter names and photos.',
  own: 'For facilities with paying outside users: members read the tickets they reported or added to; the board still shows every tool.',
} as const;

/** Admin → Facility settings: one form, checked by the same schema the server uses. */
export function FacilitySettingsForm({ current }: { current: FacilitySettings }) {
  const form = useZodForm(facilitySettingsSchema, current);
  const save = useSaveFacilitySettings();
  const [message, setMessage] = useState<string | null>(null);
  const [saved, setSaved] = useState(false);

  const onSubmit = form.handleSubmit((values) => {
    setMessage(null);
    setSaved(false);
    save.mutate(values, {
      onSuccess: (next) => {
        form.reset(next);
        setSaved(true);
      },
      onError: (error) => setMessage(showServerErrors(form, error, FIELDS)),
    });
  });

  return (
    <FormProvider {...form}>
      <form onSubmit={onSubmit} noValidate className="flex max-w-2xl flex-col gap-5" aria-label="Facility settings">
        <FormTextField<FacilitySettings> name="facilityName" label="Facility name" required maxLength={120} />
        <FormTextField<FacilitySettings>
          name="timeZone"
          label="Time zone"
          hint="An IANA name such as Europe/Berlin. The board, lobby displays and e-mails show times in it."
          required
          maxLength={64}
        />
        <FormTextField<FacilitySettings>
          name="emergencyNumber"
          label="Emergency number"
          hint="Shown first with every hazard caution, as a number people can tap to call."
          inputMode="tel"
          maxLength={40}
        />
        <FormTextArea<FacilitySettings>
          name="localProcedure"
          label="Local procedure for hazards"
          hint="A few short lines of your own: where the alarm points and assembly point are, who to call after the emergency number. Shown with every hazard caution."
          maxLength={1000}
        />
        <FormRadioGroup<FacilitySettings>
          name="memberTicketVisibility"
          legend="Who may read tickets"
          choices={MEMBER_TICKET_VISIBILITY.map((v) => ({ value: v, label: MEMBER_TICKET_VISIBILITY_LABELS[v], help: VISIBILITY_HELP[v] }))}
        />
        {message && (
          <Alert tone="danger" live title="Not saved">
            {message}
          </Alert>
        )}
        {saved && !form.formState.isDirty && (
          <Alert tone="success" live title="Saved">
            The new settings apply at once.
          </Alert>
        )}
        <div>
          <Button type="submit" size="lg" busy={save.isPending}>
            Save settings
          </Button>
        </div>
      </form>
    </FormProvider>
  );
}
