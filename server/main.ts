import type { Server } from 'node:http';
import { createApp } from './app';
import { ConfigError, loadConfig } from './config';
import { createContext } from './context';
import { bootstrapAdmin, DEMO_ACCOUNTS, DEMO_PASSWORD, seedDemo } from './seed/index';
import { countUsers } from './users/queries';

// `npm start` (after `vite build`) and `npm run dev` (QUARRY_DEV=1, API on QUARRY_API_PORT).
async function main(): Promise<void> {
  let config;
  try {
    config = loadConfig();
  } catch (error) {
    if (error instanceof ConfigError) {
      console.error(`Quarry cannot start: ${error.message}`);
      process.exit(1);
    }
    throw error;
  }
  const ctx = await createContext(config);
  if (config.demoMode) {
    const seeded = await seedDemo(ctx);
    if (seeded)
      ctx.logger.info({ matterId: seeded.matterId }, 'seeded the demo accounts and matter');
  } else {
    const created = await bootstrapAdmin(ctx);
    if (created) ctx.logger.info({ email: created }, 'created the first firm admin');
    else if ((await countUsers(ctx.db)) === 0) {
      console.warn(
        'The database has no accounts: set QUARRY_ADMIN_EMAIL and QUARRY_ADMIN_PASSWORD to create the first firm admin.',
      );
    }
  }

  const app = createApp(ctx);
  const server: Server = await new Promise((resolve, reject) => {
    const listening = app.listen(config.port, () => resolve(listening));
    listening.once('error', reject);
  });
  const sweep = setInterval(
    () => void ctx.auth.deleteExpiredSessions().catch(() => undefined),
    60 * 60 * 1000,
  );
  sweep.unref();

  const address = server.address();
  const port = typeof address === 'object' && address ? address.port : config.port;
  const url = `http://localhost:${port}`;
  console.log(
    `\nQuarry is running on ${url}${config.devMode ? ' (API for the Vite dev server on http://localhost:5173)' : ''}`,
  );
  console.log(`Data folder: ${config.dataDir}`);
  if (config.demoMode) {
    console.log(`\nDemo sign-ins (password: ${DEMO_PASSWORD}):`);
    for (const account of DEMO_ACCOUNTS) {
      console.log(
        `  ${account.email.padEnd(28)} ${account.isAdmin ? 'firm admin' : (account.role ?? 'no matter role')}`,
      );
    }
    console.log(
      'WARNING: these are demo accounts with a published password. Change the passwords (My account)',
    );
    console.log('or run with QUARRY_DEMO=0 before putting real documents in Quarry.');
    if (ctx.mail.fake)
      console.log(
        `Mail is not delivered (SMTP_URL unset): read it on ${url}/dev/mail${config.devMode ? '' : ' (signed in as a firm admin)'}`,
      );
  }

  let stopping = false;
  const stop = (signal: string) => {
    if (stopping) return;
    stopping = true;
    console.log(`\n${signal}: shutting down`);
    clearInterval(sweep);
    const force = setTimeout(() => process.exit(1), 10_000);
    force.unref();
    server.close(() => {
      void ctx.close().then(() => process.exit(0));
    });
    server.closeIdleConnections();
  };
  process.on('SIGINT', () => stop('SIGINT'));
  process.on('SIGTERM', () => stop('SIGTERM'));
}

main().catch((error: unknown) => {
  console.error(error);
  process.exit(1);
});
