import { startTestServer } from './tests/setup/app-server';
import { demoEmails, signedInAt } from './tests/setup/http-client';
const server = await startTestServer({ seed: true, logName: 'page-cost.log' });
const client = await signedInAt(server.baseUrl, demoEmails.designer);
const path = '/studies/study-riverbend-members-2027';
for (let i = 0; i < 400; i++) await (await client.get(path)).arrayBuffer();
await server.stop();
process.exit(0);
