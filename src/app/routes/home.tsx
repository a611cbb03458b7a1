import { ROLE_LABELS } from '@shared/roles';
import { PageHeader } from '@/components/layout/page-header';
import { Alert } from '@/components/ui/alert';
import { Card } from '@/components/ui/card';
import { useSession } from '@/features/auth/api/get-session';
import { RoleOverview } from '@/features/home/components/role-overview';
import { StateLegend } from '@/features/home/components/state-legend';

function greeting(hour: number): string {
  if (hour < 5) return 'Good evening';
  if (hour < 12) return 'Good morning';
  if (hour < 18) return 'Good afternoon';
  return 'Good evening';
}

export function HomePage() {
  const { data } = useSession();
  const user = data?.user;
  // The protected layout renders pages only with a user; this keeps the types honest.
  if (!user) return null;

  const firstName = user.name.trim().split(/\s+/)[0] || user.name;

  return (
    <div data-testid={`home-${user.role}`} className="flex flex-col gap-8">
      <title>Home · Faultline</title>
      <PageHeader
        className="mb-0"
        title={`${greeting(new Date().getHours())}, ${firstName}`}
        description={
          <>
            You are signed in as <strong className="font-semibold text-ink">{ROLE_LABELS[user.role].toLowerCase()}</strong>. Here is what
            you can do in Faultline.
          </>
        }
      />

      <Alert tone="warning" title="In an emergency, the facility alarm comes first">
        Faultline records problems and tells the right people. It is not an alarm system. For fire, gas, a major spill or an injury, leave
        the area, raise the facility alarm and follow the emergency procedures first; report here afterwards. Use a tool&rsquo;s emergency
        stop only in an emergency, and do not handle unknown chemicals.
      </Alert>

      <RoleOverview role={user.role} />

      <Card
        as="section"
        title="Reading a tool’s state"
        description="Every state is shown three ways — colour, shape and word — so it reads under the yellow light of the lithography bays too."
      >
        <StateLegend />
      </Card>
    </div>
  );
}

export { HomePage as Component };
