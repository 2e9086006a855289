#!/usr/bin/env node
// `npm run user:create -- <email> <name…>`: the operator's way in to a new installation (there is
// no public sign-up). Makes the account when there is none and prints a single-use link, valid for
// an hour, to choose its password (lib/account/first-person.ts); nothing is e-mailed. The person
// then signs in and creates their co-op, becoming its first admin. Run again for a fresh link.
// Needs DATABASE_URL and APP_URL (the links' origin). Exit code 0, or 1 with the reason.
import { pathToFileURL } from 'node:url';
import { buildWorker } from './lib/worker-build.mjs';

const [email = '', ...name] = process.argv.slice(2);
for (const v of ['DATABASE_URL', 'APP_URL']) {
  if (!process.env[v]) {
    console.error(`[user-create] ${v} is not set.`);
    process.exit(1);
  }
}
const bundle = await buildWorker({ log: (m) => console.error('[user-create]', m) });
const { accountSetupLink } = await import(pathToFileURL(bundle).href);
try {
  const r = await accountSetupLink({ email, name: name.join(' ') });
  console.error(
    `[user-create] ${r.created ? 'account made' : 'account exists'}; link valid until ${r.expiresAt.toISOString()}:`,
  );
  console.log(r.link);
  process.exit(0);
} catch (e) {
  const fields = e?.fields
    ? Object.entries(e.fields).map(([k, v]) => `${k}: ${v.join(' ')}`)
    : [e?.message ?? String(e)];
  for (const f of fields) console.error(`[user-create] ${f}`);
  console.error('[user-create] usage: npm run user:create -- <email> <name…>');
  process.exit(1);
}
