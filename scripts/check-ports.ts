// Before `npm start` or `npm run dev` does anything slow: every port the server will listen on
// must be free, or we say which one is taken and how to pick another, and exit non-zero.
//   node --import tsx scripts/check-ports.ts PORT=3000 SMTP_PORT=2525
import net from 'node:net';

const host = process.env.HOST ?? '127.0.0.1';

function isFree(port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const probe = net.createServer();
    probe.once('error', () => resolve(false));
    probe.listen({ port, host, exclusive: true }, () => probe.close(() => resolve(true)));
  });
}

let busy = 0;
for (const arg of process.argv.slice(2)) {
  const [name, value] = arg.split('=');
  const port = Number(value);
  if (!name || !Number.isInteger(port) || port <= 0) continue;
  if (!(await isFree(port))) {
    busy++;
    console.error(
      `Port ${port} (${name}) on ${host} is already in use — another Faultline or another program is listening there.\n` +
        `Stop it, or choose another port, e.g. ${name}=${port + 100} npm start`,
    );
  }
}
process.exit(busy > 0 ? 1 : 0);
