import { MATTER as DEMO_MATTER } from '../../corpus-demo/scenario';
import type { MatterRole } from '../../shared/roles';
import type { AppContext } from '../context';
import { loadDemoCorpus, seedCorpusEnabled } from '../documents/demo-corpus';
import { createMatter } from '../matters/service';
import { insertMember } from '../members/queries';
import { countUsers } from '../users/queries';
import { createAccount } from '../users/service';

export const DEMO_PASSWORD = 'quarry-demo';
export const DEMO_CONTROL_PREFIX = 'BBHM';

/** The demo accounts: the admin has no matter role; outsider has no matter. */
export const DEMO_ACCOUNTS: {
  email: string;
  name: string;
  isAdmin: boolean;
  role: MatterRole | null;
}[] = [
  { email: 'admin@quarry.example', name: 'Ada Admin', isAdmin: true, role: null },
  { email: 'lead@quarry.example', name: 'Leonora Lead', isAdmin: false, role: 'lead' },
  { email: 'attorney@quarry.example', name: 'Arturo Attorney', isAdmin: false, role: 'attorney' },
  { email: 'paralegal@quarry.example', name: 'Pia Paralegal', isAdmin: false, role: 'paralegal' },
  { email: 'reviewer@quarry.example', name: 'Rowan Reviewer', isAdmin: false, role: 'reviewer' },
  { email: 'outsider@quarry.example', name: 'Otto Outsider', isAdmin: false, role: null },
];

export interface SeededDemo {
  matterId: number;
  /** User id by demo e-mail. */
  users: Record<string, string>;
}

/** A step run after the demo accounts and matter exist, e.g. loading the demo corpus. */
export interface PostSeedStep {
  name: string;
  run(ctx: AppContext, seeded: SeededDemo): Promise<void>;
}

/**
 * Steps run, in order, after seedDemo created the accounts and the demo matter.
 * HOOK: the documents feature appends its "load the demo corpus (corpus-demo/)" step here.
 */
export const postSeedSteps: PostSeedStep[] = [
  {
    name: 'load the demo corpus',
    run: async (ctx, seeded) => {
      if (!seedCorpusEnabled()) return;
      await loadDemoCorpus(ctx, seeded.matterId, { id: null, email: 'seed' });
    },
  },
];

/**
 * Seeds the demo accounts and the demo matter when the database has no users;
 * returns null (and changes nothing) otherwise. The matter goes through createMatter,
 * so it gets every matter-created step (e.g. the default code set).
 */
export async function seedDemo(ctx: AppContext): Promise<SeededDemo | null> {
  if ((await countUsers(ctx.db)) > 0) return null;
  const users: Record<string, string> = {};
  for (const account of DEMO_ACCOUNTS) {
    const row = await createAccount(ctx.db, { ...account, password: DEMO_PASSWORD });
    users[account.email] = row.id;
  }
  const admin = { id: users['admin@quarry.example'], email: 'admin@quarry.example', ip: null };
  const matter = await createMatter(
    ctx.db,
    {
      name: DEMO_MATTER.name,
      description: DEMO_MATTER.summary,
      controlPrefix: DEMO_CONTROL_PREFIX,
      lead: users['lead@quarry.example'],
    },
    admin,
  );
  for (const account of DEMO_ACCOUNTS) {
    if (account.role && account.role !== 'lead') {
      await insertMember(ctx.db, {
        matterId: matter.id,
        userId: users[account.email],
        role: account.role,
        grantedBy: users['lead@quarry.example'],
      });
    }
  }
  const seeded = { matterId: matter.id, users };
  for (const step of postSeedSteps) {
    ctx.logger.info({ step: step.name }, 'demo seed step');
    await step.run(ctx, seeded);
  }
  return seeded;
}

/** With demo mode off, creates the first firm admin from QUARRY_ADMIN_EMAIL/PASSWORD on an empty database. */
export async function bootstrapAdmin(ctx: AppContext): Promise<string | null> {
  const admin = ctx.config.bootstrapAdmin;
  if (!admin || (await countUsers(ctx.db)) > 0) return null;
  await createAccount(ctx.db, {
    email: admin.email,
    name: 'Firm administrator',
    password: admin.password,
    isAdmin: true,
  });
  return admin.email;
}
