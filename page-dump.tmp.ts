import { writeFileSync } from 'node:fs';
import { startTestServer } from './tests/setup/app-server';
import { demoEmails, signedInAt } from './tests/setup/http-client';
const server = await startTestServer({ seed: true, logName: 'page-cost.log' });
const client = await signedInAt(server.baseUrl, demoEmails.designer);
writeFileSync('/tmp/study.html', await (await client.get('/studies/study-riverbend-members-2027')).text());
process.exit(0);
