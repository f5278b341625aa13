import { startTestServer } from './tests/setup/app-server';
import { demoEmails, signedInAt } from './tests/setup/http-client';
const server = await startTestServer({ seed: true, logName: 'page-cost.log' });
try {
  for (const who of ['designer', 'reviewer'] as const) {
    const client = await signedInAt(server.baseUrl, demoEmails[who]);
    for (const path of ['/studies/study-riverbend-members-2027', '/studies/study-riverbend-members-2027/decisions', '/audits/audit-riverbend-pilot-1', '/studies/study-riverbend-members-2027/review']) {
      for (let i = 0; i < 30; i++) await (await client.get(path)).arrayBuffer();
      const t = performance.now(); let bytes = 0;
      for (let i = 0; i < 150; i++) bytes = (await (await client.get(path)).arrayBuffer()).byteLength;
      console.log(who, path, ((performance.now() - t) / 150).toFixed(2), 'ms', bytes, 'bytes');
    }
  }
} finally { await server.stop?.(); }
process.exit(0);
