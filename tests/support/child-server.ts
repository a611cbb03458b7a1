// A test server in a child process, so a test can kill it with SIGKILL mid-request, as a crash
// would. Started by tests with fork(); the first argument is the upload folder, or a JSON object
// of settings (a photo store's). It sends its URL to the parent once it listens.
import { startTestServer } from './server';

const arg = process.argv[2] ?? '';
const overrides: Record<string, string> = arg.startsWith('{') ? JSON.parse(arg) : { UPLOAD_DIR: arg };
const server = await startTestServer(overrides, { outboxWorker: false });
process.send?.({ url: server.url });
