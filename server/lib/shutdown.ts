import type { Logger } from './logger';

type Step = { name: string; run: () => Promise<unknown> | unknown };

/** Runs shutdown steps in reverse order of registration on SIGINT/SIGTERM, once, with a deadline. */
export function createShutdown(logger: Logger, deadlineMs = 10_000) {
  const steps: Step[] = [];
  let started = false;
  const run = async (signal: string) => {
    if (started) return;
    started = true;
    logger.info({ signal }, 'shutting down');
    const timer = setTimeout(() => {
      logger.error('shutdown deadline passed; exiting');
      process.exit(1);
    }, deadlineMs);
    timer.unref();
    for (const step of [...steps].reverse()) {
      try {
        await step.run();
      } catch (err) {
        logger.warn({ err, step: step.name }, 'shutdown step failed');
      }
    }
    clearTimeout(timer);
    process.exit(0);
  };
  process.once('SIGINT', () => void run('SIGINT'));
  process.once('SIGTERM', () => void run('SIGTERM'));
  return { add: (name: string, fn: Step['run']) => steps.push({ name, run: fn }), run };
}
