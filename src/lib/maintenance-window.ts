// "Tue 08:00–12:00": how a booked maintenance window reads on the board, the tool page and
// the maintenance pages, in the viewer's time zone.

const day = new Intl.DateTimeFormat('en-GB', { weekday: 'short', day: 'numeric', month: 'short' });
const time = new Intl.DateTimeFormat('en-GB', { hour: '2-digit', minute: '2-digit' });

export function formatWindow(startsAt: string, endsAt: string): string {
  const s = new Date(startsAt);
  const e = new Date(endsAt);
  const sameDay = s.toDateString() === e.toDateString();
  return `${day.format(s)} ${time.format(s)}–${sameDay ? '' : `${day.format(e)} `}${time.format(e)}`;
}
