import { PageHeader } from '@/components/layout/page-header';
import { Card } from '@/components/ui/card';
import { AreasPanel } from '@/features/facility-admin/components/areas-panel';
import { ToolsPanel } from '@/features/facility-admin/components/tools-panel';

export function FacilityAdminPage() {
  return (
    <div className="flex flex-col gap-6">
      <title>Tools and areas · Faultline</title>
      <PageHeader
        title="Tools and areas"
        description="The bays and rooms of the facility, the tools in them, their modules and who looks after each tool."
      />
      <Card as="section" title="Tools">
        <ToolsPanel />
      </Card>
      <Card as="section" title="Areas">
        <AreasPanel />
      </Card>
    </div>
  );
}

export { FacilityAdminPage as Component };
