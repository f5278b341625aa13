// auth-astro 4.2.0 ships raw TypeScript; one line of src/integration.ts fails strict null
// checks (`astroConfig.adapter.name`). Patch it in place, idempotently, after every install.
import { readFileSync, writeFileSync, existsSync } from 'node:fs';

const file = new URL('../node_modules/auth-astro/src/integration.ts', import.meta.url);
if (existsSync(file)) {
  const text = readFileSync(file, 'utf8');
  const patched = text.replace(/astroConfig\.adapter\.name(?!\s*\?\?)/g, "(astroConfig.adapter?.name ?? '')");
  if (patched !== text) writeFileSync(file, patched);
}
