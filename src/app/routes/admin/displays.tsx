import { PageHeader } from '@/components/layout/page-header';
import { Card } from '@/components/ui/card';
import { DisplayLinksPanel } from '@/features/facility-admin/components/display-links-panel';

export function DisplaysAdminPage() {
  return (
    <div className="flex flex-col gap-6">
      <title>Lobby displays · Faultline</title>
      <PageHeader
        title="Lobby displays"
        description="A display link shows the live board full screen, without signing in, on a screen at the cleanroom entrance."
      />
      <Card as="section">
        <DisplayLinksPanel />
      </Card>
    </div>
  );
}

export { DisplaysAdminPage as Component };
