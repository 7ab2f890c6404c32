// `npm run simulate`: the demo farm's probes as a stand-alone MQTT client (docs/simulator.md).
import { helpText, parseConfig } from './config';
import { createLogger } from './log';
import { startSimulator } from './run';

const result = parseConfig(process.argv.slice(2), process.env);
if (!result.ok) {
  for (const error of result.errors) process.stderr.write(`simulator: ${error}\n`);
  process.stderr.write('simulator: see --help\n');
  process.exit(2);
}
const config = result.config;
if (config.help) {
  process.stdout.write(helpText());
  process.exit(0);
}

const log = createLogger({ level: config.logLevel });
const simulator = startSimulator(config, { log });

let stopping = false;
const stop = (signal: string): void => {
  if (stopping) return;
  stopping = true;
  log.info(`${signal}: flushing buffered samples (up to 3 s) and closing connections`);
  void simulator.stop();
};
process.on('SIGINT', () => stop('SIGINT'));
process.on('SIGTERM', () => stop('SIGTERM'));
process.on('SIGHUP', () => {
  log.info('SIGHUP: re-reading the credential file');
  void simulator.reload();
});

const code = await simulator.done;
process.exit(code);
