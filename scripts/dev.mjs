// npm run dev: PostgreSQL, Redis and the SMTP fake as for npm start, then migrations and seed,
// then the Vite dev server (http://127.0.0.1:5173, proxying /api) with server and worker under
// `tsx watch`. Pass --simulator to run the probe simulator too. Options as for scripts/start.mjs.
import { parseFlags } from './stack/common.mjs';
import { runStack } from './stack/stack.mjs';

const { flags } = parseFlags(process.argv.slice(2));
process.exitCode = await runStack('dev', flags);
