import { randomUUID } from 'node:crypto';
import type { ApiUser } from '../../shared/schemas/auth';
import type { PersonRef } from '../../shared/schemas/common';
import { hashPassword } from '../auth/password';
import type { Db } from '../db/database';
import type { UserRow } from '../db/schema';
import { conflict } from '../http/errors';
import { findUserByEmail, insertUser } from './queries';

export function userRowToApiUser(
  row: Pick<UserRow, 'id' | 'email' | 'name' | 'is_admin'>,
): ApiUser {
  return { id: row.id, email: row.email, name: row.name, isAdmin: row.is_admin === 1 };
}

export function userRowToPerson(row: Pick<UserRow, 'id' | 'email' | 'name'>): PersonRef {
  return { id: row.id, email: row.email, name: row.name };
}

export interface NewAccount {
  email: string;
  name: string;
  password: string;
  isAdmin?: boolean;
  /** A temporary password a firm admin set: must be changed at first sign-in, expires then. */
  temporaryUntil?: string;
}

/** Creates an account (Argon2id hash); 409 when the e-mail is taken. Returns the new row. */
export async function createAccount(db: Db, account: NewAccount): Promise<UserRow> {
  const email = account.email.trim().toLowerCase();
  if (await findUserByEmail(db, email))
    throw conflict('An account with this e-mail already exists.', 'email');
  const now = new Date().toISOString();
  const row: UserRow = {
    id: randomUUID(),
    email,
    name: account.name.trim(),
    password_hash: await hashPassword(account.password),
    is_admin: account.isAdmin ? 1 : 0,
    disabled_at: null,
    password_changed_at: now,
    created_at: now,
    password_must_change: account.temporaryUntil ? 1 : 0,
    password_expires_at: account.temporaryUntil ?? null,
  };
  await insertUser(db, row);
  return row;
}
