import { ConfigError, loadConfig } from './config/config.js';
import { DEMO_ACCOUNTS, DEMO_LAB_NAME } from './db/seed-demo.js';
import { ATTACHMENTS, startServer } from './server.js';
import { createLogger } from './log/logger.js';

/** Entry point of `npm start`: provision → migrate → seed demo when empty → listen → print. */
async function main(): Promise<void> {
  const config = loadConfig();
  const demo = config.mode === 'demo' || config.mode === 'development';
  const server = await startServer({
    config,
    seedDemo: demo,
    attachments: ATTACHMENTS,
  });
  console.log(`\nKneepoint is serving ${server.url}`);
  if (demo) {
    console.log(`\n${DEMO_LAB_NAME} demo accounts${server.demoSeeded ? ' (just created)' : ''}, password "${config.demoPassword}" unless changed:`);
    for (const account of DEMO_ACCOUNTS) console.log(`  ${account.role.padEnd(10)} ${account.email}`);
  }
  console.log('\nPress Ctrl-C to stop (the app then stops its MariaDB).');

  let stopping = false;
  const stop = async (signal: string) => {
    if (stopping) return;
    stopping = true;
    console.log(`\n${signal}: stopping…`);
    try {
      await server.close();
      process.exit(0);
    } catch (error) {
      createLogger('server').error('Error while stopping', error);
      process.exit(1);
    }
  };
  process.on('SIGINT', () => void stop('SIGINT'));
  process.on('SIGTERM', () => void stop('SIGTERM'));
}

main().catch((error: unknown) => {
  console.error(error instanceof ConfigError || error instanceof Error ? `\n${error.message}\n` : error);
  process.exit(1);
});
