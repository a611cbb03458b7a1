// A test server in a child process, so a test can kill it with SIGKILL mid-request, as a crash
// would. Started by tests with fork(); the first argument is the upload folder. It sends its
// URL to the parent once it listens.
import { startTestServer } from './server';

const server = await startTestServer({ UPLOAD_DIR: process.argv[2] }, { outboxWorker: false });
process.send?.({ url: server.url });
