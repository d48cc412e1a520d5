/**
 * The invented demo school of the product brief, seeded when the database is empty.
 * Every name, address and figure here is invented, for the demo only.
 */
import { sql } from 'drizzle-orm';
import type { Db, Tx } from '../db/client.js';
import { schools, users } from '../db/schema/index.js';
import { hashPassword } from '../auth/passwords.js';
import type { Role } from '../../shared/schemas/common.js';

/** Demo only: printed by the start command and in the README. */
export const DEMO_PASSWORD = 'trayplan-demo';

export const DEMO_ACCOUNTS: {
  email: string;
  name: string;
  role: Role;
  school: 'kestrel' | 'banksia';
}[] = [
  { email: 'admin@kestrel-ridge.example', name: 'Avery Quill', role: 'admin', school: 'kestrel' },
  { email: 'lead@kestrel-ridge.example', name: 'Morgan Ellery', role: 'lead', school: 'kestrel' },
  {
    email: 'teacher@kestrel-ridge.example',
    name: 'Sam Kowhai',
    role: 'teacher',
    school: 'kestrel',
  },
  {
    email: 'partner@kestrel-ridge.example',
    name: 'Jordan Pereira',
    role: 'teacher',
    school: 'kestrel',
  },
  { email: 'relief@kestrel-ridge.example', name: 'Robin Tally', role: 'relief', school: 'kestrel' },
  { email: 'admin@banksia-flat.example', name: 'Casey Wren', role: 'admin', school: 'banksia' },
];

export interface SeededSchools {
  kestrelId: string;
  banksiaId: string;
}

/** Extra seed steps later capabilities add (planning data), run in the same transaction. */
export type SeedStep = (
  tx: Tx,
  ids: SeededSchools & { userIds: Record<string, string> },
) => Promise<void>;
const steps: SeedStep[] = [];
export function addSeedStep(step: SeedStep): void {
  steps.push(step);
}

/** Seeds the demo when no school exists yet; returns whether it did. Never duplicates. */
export async function seedDemo(db: Db): Promise<boolean> {
  const hash = await hashPassword(DEMO_PASSWORD);
  return db.transaction(async (tx) => {
    // One seeder at a time, and none once any school exists.
    await tx.execute(sql`SELECT pg_advisory_xact_lock(7262001)`);
    const [{ n }] = (await tx.execute<{ n: number }>(sql`SELECT count(*)::int AS n FROM schools`))
      .rows as [{ n: number }];
    if (n > 0) return false;
    const [kestrel] = await tx
      .insert(schools)
      .values({
        name: 'Kestrel Ridge Primary School',
        timezone: 'Australia/Adelaide',
        paperSize: 'A4',
      })
      .returning();
    const [banksia] = await tx
      .insert(schools)
      .values({ name: 'Banksia Flat School', timezone: 'Australia/Perth', paperSize: 'A4' })
      .returning();
    const userIds: Record<string, string> = {};
    for (const a of DEMO_ACCOUNTS) {
      const [u] = await tx
        .insert(users)
        .values({
          schoolId: a.school === 'kestrel' ? kestrel!.id : banksia!.id,
          email: a.email,
          name: a.name,
          role: a.role,
          status: 'active',
          passwordHash: hash,
        })
        .returning({ id: users.id });
      userIds[a.email] = u!.id;
    }
    const ids = { kestrelId: kestrel!.id, banksiaId: banksia!.id, userIds };
    for (const step of steps) await step(tx, ids);
    return true;
  });
}
