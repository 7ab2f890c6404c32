// npm start: the whole product on this machine: PostgreSQL, Redis, the SMTP fake, migrations,
// demo seed, the client build, then server, worker and probe simulator. Ctrl-C stops everything.
//
//   node scripts/start.mjs [--no-simulator] [--http-port N] [--pg-port N] [--redis-port N]
//                          [--smtp-port N] [--mail-api-port N] [--mqtt-port N] [--public-url URL]
//                          [--build | --no-build] [--chromium] [--no-system]
//
// Ports may also be set with GILLWISE_HTTP_PORT, PGPORT (or GILLWISE_PG_PORT), GILLWISE_REDIS_PORT,
// GILLWISE_SMTP_PORT, GILLWISE_MAIL_API_PORT, GILLWISE_MQTT_PORT and GILLWISE_PUBLIC_URL.
import { parseFlags } from './stack/common.mjs';
import { runStack } from './stack/stack.mjs';

const { flags } = parseFlags(process.argv.slice(2));
if (flags.help) {
  console.log(
    [
      'usage: node scripts/start.mjs [options]',
      '  --no-simulator        do not start the probe simulator',
      '  --http-port N         HTTP port (GILLWISE_HTTP_PORT, default 8080)',
      '  --pg-port N           PostgreSQL port (PGPORT / GILLWISE_PG_PORT, default 54329)',
      '  --redis-port N        Redis port (GILLWISE_REDIS_PORT, default 63799)',
      '  --smtp-port N         SMTP fake port (GILLWISE_SMTP_PORT, default 2525)',
      '  --mail-api-port N     SMTP fake HTTP API port (GILLWISE_MAIL_API_PORT, default 2526)',
      '  --mqtt-port N         MQTT broker port (GILLWISE_MQTT_PORT, default 18830)',
      '  --public-url URL      address the app announces (GILLWISE_PUBLIC_URL)',
      '  --https [N]           also serve HTTPS on all interfaces, port N (default 8443), with a self-signed',
      '                        certificate made once in the data folder: phones on the farm network need a',
      '                        secure context for the offline queue (GILLWISE_HTTPS_PORT)',
      '  --build / --no-build  always / never rebuild the client (default: when sources changed)',
      '  --chromium            also install Chromium if missing',
      '  --no-system           skip the system package and npm ci check',
    ].join('\n'),
  );
  process.exit(0);
}
process.exitCode = await runStack('start', flags);
