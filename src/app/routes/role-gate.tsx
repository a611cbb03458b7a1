import { Link, Outlet } from 'react-router';
import { hasRole, ROLE_LABELS, type Role } from '@shared/roles';
import { PageHeader } from '@/components/layout/page-header';
import { useSession } from '@/features/auth/api/get-session';

/**
 * A layout route around pages meant for `minimum` and above. The server refuses their data
 * to anyone else anyway; this only saves people from a page of errors.
 */
export function RoleGate({ minimum }: { minimum: Role }) {
  const { data } = useSession();
  const role = data?.user?.role;
  if (role && hasRole(role, minimum)) return <Outlet />;
  return (
    <>
      <title>Not available · Faultline</title>
      <PageHeader
        title="This page is not for your account"
        description={`It is open to the role “${ROLE_LABELS[minimum]}” and above. If you need it for your work, ask a facility administrator.`}
      />
      <Link to="/" className="inline-flex min-h-11 items-center font-semibold">
        Back to the start page
      </Link>
    </>
  );
}
