import { DEMO_SIGN_INS } from '../server/db/seed/users';
import { DEMO_KEY_TOOLS, demoToolKey } from '../server/db/seed/alarms';

const url = process.env.PUBLIC_URL ?? 'http://localhost:3000';
const lines = [
  '',
  `  Faultline is running: ${url}`,
  '',
  '  Demo sign-ins (invented people of a fictional facility):',
  ...DEMO_SIGN_INS.map((u) => `    ${u.role.padEnd(11)} ${u.email.padEnd(34)} ${u.password}`),
  '',
  '  Demo tool keys for the ingest API (public demo keys; a real facility makes its own):',
  ...DEMO_KEY_TOOLS.map((code) => `    ${code.padEnd(11)} ${demoToolKey(code)}`),
  `  Play alarms from a tool: npm run tool-sim -- --tool ${DEMO_KEY_TOOLS[0]}   (add --fast for a quick run)`,
  '',
  `  Mail is caught locally (SMTP 127.0.0.1:${process.env.SMTP_PORT ?? 2525}); admins read it under "Caught mail".`,
  '  Stop with Ctrl+C; `npm run db:stop` stops the database.',
  '',
];
console.log(lines.join('\n'));
