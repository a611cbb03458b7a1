import { useSearchParams } from 'react-router';
import { PageHeader } from '@/components/layout/page-header';
import { useSession } from '@/features/auth/api/get-session';
import { ReportForm } from '@/features/report/components/report-form';

/** /report?tool=<code>[&to=<ticket id>] — the QR label on each tool points here. */
export function ReportPage() {
  const { data } = useSession();
  const [params] = useSearchParams();
  const user = data?.user;
  if (!user) return null;
  const to = Number(params.get('to'));
  return (
    <>
      <title>Report a fault · Faultline</title>
      <PageHeader
        title="Report a fault"
        description="Tell the technicians what is wrong with a tool. Your answers are kept on this device until the report is sent."
      />
      <ReportForm key={user.id} userId={user.id} toolCode={params.get('tool')} addTo={to > 0 ? to : null} />
    </>
  );
}

export { ReportPage as Component };
