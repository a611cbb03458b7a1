import { PageHeader } from '@/components/layout/page-header';
import { ServiceTargetsEditor } from '@/features/tickets/components/service-targets-editor';

/** /admin/service-targets — managers set how fast each priority should be answered and fixed. */
export function ServiceTargetsPage() {
  return (
    <>
      <title>Service targets · Faultline</title>
      <PageHeader
        title="Service targets"
        description="How soon a ticket of each priority should be acknowledged, and how soon the tool should be running again."
      />
      <div className="max-w-3xl">
        <ServiceTargetsEditor />
      </div>
    </>
  );
}

export { ServiceTargetsPage as Component };
