import { DEMO_SIGN_INS } from '../server/db/seed/users';

const url = process.env.PUBLIC_URL ?? 'http://localhost:3000';
const lines = [
  '',
  `  Faultline is running: ${url}`,
  '',
  '  Demo sign-ins (invented people of a fictional facility):',
  ...DEMO_SIGN_INS.map((u) => `    ${u.role.padEnd(11)} ${u.email.padEnd(34)} ${u.password}`),
  '',
  `  Mail is caught locally (SMTP 127.0.0.1:${process.env.SMTP_PORT ?? 2525}); admins read it under "Caught mail".`,
  '  Stop with Ctrl+C; `npm run db:stop` stops the database.',
  '',
];
console.log(lines.join('\n'));
