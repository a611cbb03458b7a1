import { PageHeader } from '@/components/layout/page-header';
import { PageSpinner } from '@/components/ui/spinner';
import { Alert } from '@/components/ui/alert';
import { useFacilitySettings } from '@/lib/facility-settings';
import { FacilitySettingsForm } from '@/features/facility-settings/components/facility-settings-form';

/** /admin/settings — the facility's name, time zone, emergency number, local procedure and ticket visibility. */
export function FacilitySettingsPage() {
  const settings = useFacilitySettings();
  return (
    <>
      <title>Facility settings · Faultline</title>
      <PageHeader
        title="Facility settings"
        description="Your facility's name and time zone, what people see with a hazard report, and who may read tickets."
      />
      {settings.isPending ? (
        <PageSpinner />
      ) : settings.error ? (
        <Alert tone="danger" title="The settings could not be loaded">
          {settings.error.message}
        </Alert>
      ) : (
        <FacilitySettingsForm current={settings.data} />
      )}
    </>
  );
}

export { FacilitySettingsPage as Component };
