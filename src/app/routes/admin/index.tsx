import { Link } from 'react-router';
import { PageHeader } from '@/components/layout/page-header';
import { Card } from '@/components/ui/card';

interface AdminPage {
  to: string;
  title: string;
  text: string;
}

// One line per admin page.
const ADMIN_PAGES: readonly AdminPage[] = [
  {
    to: '/admin/settings',
    title: 'Facility settings',
    text: 'Name, time zone, emergency number and local procedure shown with hazard cautions, and who may read tickets.',
  },
  { to: '/admin/users', title: 'Users', text: 'Invite people, set roles and on-call duty, disable accounts.' },
  {
    to: '/admin/facility',
    title: 'Tools and areas',
    text: 'Bays and rooms, the tools in them, their modules and who looks after each tool.',
  },
  {
    to: '/admin/displays',
    title: 'Lobby displays',
    text: 'Links that show the live board full screen on a screen at the cleanroom entrance.',
  },
  {
    to: '/admin/service-targets',
    title: 'Service targets',
    text: 'How fast each priority should be acknowledged and restored.',
  },
  {
    to: '/labels',
    title: 'QR labels',
    text: 'A printable sheet of QR labels, one per tool, that open the tool’s page on a phone.',
  },
  {
    to: '/admin/mail',
    title: 'Mail',
    text: 'E-mail that has not gone out yet (send it again), and what the demo’s local mail catcher caught.',
  },
];

export function AdminHomePage() {
  return (
    <>
      <title>Admin · Faultline</title>
      <PageHeader title="Admin" description="Setting up the facility in Faultline: people, and the places and tools they report on." />
      <ul className="grid gap-4 sm:grid-cols-2 xl:grid-cols-3">
        {ADMIN_PAGES.map((page) => (
          <Card as="li" key={page.to} title={page.title} className="flex flex-col" data-testid="admin-card">
            <p className="text-sm leading-relaxed text-muted">{page.text}</p>
            <Link to={page.to} className="mt-3 inline-flex min-h-11 items-center font-semibold">
              Open {page.title.toLowerCase()}
              <span aria-hidden="true">&nbsp;→</span>
            </Link>
          </Card>
        ))}
      </ul>
    </>
  );
}

export { AdminHomePage as Component };
