import { Link, useParams } from 'react-router';
import { hasRole } from '@shared/roles';
import { useSession } from '@/features/auth/api/get-session';
import { PageHeader } from '@/components/layout/page-header';
import { Alert } from '@/components/ui/alert';
import { Button, buttonClasses } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { PageSpinner } from '@/components/ui/spinner';
import { isApiError } from '@/lib/api-client';
import { useTool } from '@/features/tools/api/get-tool';
import { AvailabilityPanel } from '@/features/tools/components/availability-panel';
import { ChangeStateForm } from '@/features/tools/components/change-state-form';
import { Engineers } from '@/features/tools/components/engineers';
import { FollowButton } from '@/features/tools/components/follow-button';
import { PushToggle } from '@/features/push/components/push-toggle';
import { ModuleStates } from '@/features/tools/components/module-states';
import { StateHistory } from '@/features/tools/components/state-history';
import { ToolStatusPanel } from '@/features/tools/components/tool-status-panel';
import { ToolTickets } from '@/features/tickets/components/tool-tickets';
import { ToolReliability } from '@/features/analytics/components/tool-reliability';
import { ToolAlarmsPanel } from '@/features/alarms/components/tool-alarms-panel';
import { ToolKeysPanel } from '@/features/alarms/components/tool-keys-panel';
import { RequalCharts } from '@/features/maintenance/components/requal-charts';
import { ToolFeedLink } from '@/features/maintenance/components/tool-feed-link';
import { formatWindow } from '@/lib/maintenance-window';

export function ToolPage() {
  const { code = '' } = useParams();
  const tool = useTool(code.toUpperCase());
  const { data: session } = useSession();
  const staff = session?.user ? hasRole(session.user.role, 'technician') : false;
  const admin = session?.user ? hasRole(session.user.role, 'admin') : false;

  if (tool.isPending) return <PageSpinner label="Loading the tool…" />;
  if (tool.isError) {
    const missing = isApiError(tool.error) && (tool.error.status === 404 || tool.error.status === 400);
    return (
      <>
        <title>Tool not found · Faultline</title>
        <PageHeader title={missing ? 'There is no tool with that code' : 'The tool could not be loaded'} />
        <Alert
          tone={missing ? 'info' : 'danger'}
          actions={
            !missing && (
              <Button variant="secondary" onClick={() => void tool.refetch()}>
                Try again
              </Button>
            )
          }
        >
          {missing ? (
            <>
              No tool has the code <code className="font-mono">{code}</code>. Find it on the <Link to="/board">status board</Link>.
            </>
          ) : (
            tool.error.message
          )}
        </Alert>
      </>
    );
  }

  const t = tool.data;
  const retired = Boolean(t.retiredAt);
  return (
    <div className="flex flex-col gap-6">
      <title>{`${t.name} · Faultline`}</title>
      <PageHeader
        title={t.name}
        description={
          <>
            <span className="font-mono">{t.code}</span> · {t.area.name}
            {retired && ' · retired from service'}
          </>
        }
        actions={
          !retired && (
            <Link
              to={`/report?tool=${encodeURIComponent(t.code)}`}
              className={buttonClasses({ variant: 'danger', size: 'lg' })}
              data-testid="report-fault"
            >
              Report a fault
            </Link>
          )
        }
      />

      <div className="grid grid-cols-1 gap-6 lg:grid-cols-3">
        <div className="flex min-w-0 flex-col gap-6 lg:col-span-2">
          <Card as="section" title="Current state">
            <ToolStatusPanel tool={t} />
          </Card>

          {t.plannedMaintenance && (
            <Alert tone="info" title="Maintenance planned">
              <span data-testid="tool-planned-maintenance">
                {formatWindow(t.plannedMaintenance.startsAt, t.plannedMaintenance.endsAt)}: the tool is in scheduled downtime for preventive
                maintenance then.
              </span>
            </Alert>
          )}

          {/* First on a phone too: following is what most people at the tool came to do. */}
          {!retired && (
            <Card as="section" title="Tell me when it changes">
              <FollowButton toolId={t.id} code={t.code} following={t.following} />
              {t.following && <PushToggle />}
            </Card>
          )}

          {t.modules.length > 0 && (
            <Card as="section" title="Modules" description="Some modules down make the tool Limited; all of them down make it Down.">
              <ModuleStates modules={t.modules} />
            </Card>
          )}

          <ToolTickets toolId={t.id} />

          <ToolAlarmsPanel code={t.code} staff={staff} />

          <StateHistory toolId={t.id} />

          <RequalCharts toolId={t.id} />
        </div>

        <div className="flex min-w-0 flex-col gap-6">
          {t.allowedActions.includes('change_state') && (
            <Card as="section" title="Change the state">
              <ChangeStateForm toolId={t.id} modules={t.modules} />
            </Card>
          )}

          {!retired && (
            <Card as="section" title="Maintenance calendar">
              <ToolFeedLink toolId={t.id} />
            </Card>
          )}

          <Card as="section" title="Availability, last 30 days">
            <AvailabilityPanel figure={t.availability30d} />
          </Card>

          <Card as="section" title="Reliability">
            <ToolReliability toolId={t.id} />
          </Card>

          {admin && !retired && <ToolKeysPanel code={t.code} />}

          <Card as="section" title="Who looks after it">
            <Engineers primary={t.primaryEngineer} backup={t.backupEngineer} />
          </Card>

          {t.description && (
            <Card as="section" title="About this tool">
              <p className="text-sm whitespace-pre-line text-ink">{t.description}</p>
            </Card>
          )}
        </div>
      </div>
    </div>
  );
}

export { ToolPage as Component };
