import type { Role } from '@shared/roles';

export interface HomeCard {
  title: string;
  text: string;
  /** The page the card leads to; it becomes a link once that page is ready (see nav-items). */
  to: string;
  linkLabel: string;
}

export interface HomeSection {
  role: Role;
  heading: string;
  cards: HomeCard[];
}

// What each role can do here, in the words of the floor rather than of the software.
export const HOME_SECTIONS: readonly HomeSection[] = [
  {
    role: 'admin',
    heading: 'Setting up the facility',
    cards: [
      {
        title: 'Users and roles',
        text: 'Invite people, set who is a member, technician, manager or administrator, and disable accounts of people who have left.',
        to: '/admin',
        linkLabel: 'Manage users',
      },
      {
        title: 'Areas, tools and modules',
        text: 'Keep the list of bays, tools and their chambers or stations current, with the problem categories and the keys that let tools report their own alarms.',
        to: '/admin',
        linkLabel: 'Manage tools',
      },
      {
        title: 'Display links',
        text: 'Create links for the full-screen status display on the screen at the cleanroom entrance, and withdraw them when a screen is replaced.',
        to: '/admin',
        linkLabel: 'Manage displays',
      },
      {
        title: 'Caught mail',
        text: 'While the demo’s local mail catcher runs, read every e-mail Faultline has sent: invitations, password resets and notices.',
        to: '/admin/mail',
        linkLabel: 'Read caught mail',
      },
    ],
  },
  {
    role: 'manager',
    heading: 'Seeing the trends',
    cards: [
      {
        title: 'Downtime and reliability',
        text: 'Availability, failures and assists, mean time between failures with its confidence bounds, and mean times to acknowledge and to repair, for one tool, an area or the whole facility.',
        to: '/analytics',
        linkLabel: 'Open analytics',
      },
      {
        title: 'Where the hours go',
        text: 'Which kinds of failure cost the most downtime, and which tools are failing more often than they used to. Export the figures or print a report.',
        to: '/analytics',
        linkLabel: 'See downtime by cause',
      },
    ],
  },
  {
    role: 'technician',
    heading: 'Keeping the tools running',
    cards: [
      {
        title: 'Triage queue',
        text: 'New reports sorted by priority and age, with timers that warn before a service target is missed. Acknowledge, assign, or fold a duplicate into the first report.',
        to: '/queue',
        linkLabel: 'Open the queue',
      },
      {
        title: 'Set tool states',
        text: 'Put a tool or a single module Down, Limited or in Maintenance with a reason and an expected return time. The board and everyone following the tool learn at once.',
        to: '/board',
        linkLabel: 'Go to the board',
      },
      {
        title: 'Record repairs',
        text: 'Mark a ticket fixed as a failure or an assist, note the cause, what was done, parts and hands-on time, then requalify the tool and return it to service.',
        to: '/queue',
        linkLabel: 'Open the queue',
      },
    ],
  },
  {
    role: 'member',
    heading: 'At the tools',
    cards: [
      {
        title: 'Report a fault',
        text: 'Scan the QR label on the tool with your phone, or pick the tool on the status board. Say what happened, copy the alarm text, add a photo of the screen. If the tool stopped, everyone sees it as Down straight away.',
        to: '/report',
        linkLabel: 'Report a fault',
      },
      {
        title: 'See what is running',
        text: 'The status board shows every tool by area: running, limited, down or in maintenance, since when, why, and when it should be back.',
        to: '/board',
        linkLabel: 'Open the status board',
      },
      {
        title: 'Be told when it is back',
        text: 'Follow a tool that is down. You get an e-mail and a notice here whenever its state changes, so you suit up only when it is worth it.',
        to: '/board',
        linkLabel: 'Choose tools to follow',
      },
      {
        title: 'Your reports',
        text: 'See what became of each problem you reported: who picked it up, replies from staff, and when it was fixed. Add to your report if the problem comes back.',
        to: '/my-reports',
        linkLabel: 'See your reports',
      },
    ],
  },
];
