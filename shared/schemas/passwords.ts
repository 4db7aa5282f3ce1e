import { z } from 'zod';
import { idSchema, text } from './common';

// The matter password list (for encrypted files). Passwords go in, labels come out: no
// answer ever carries a password.

export const passwordParams = z.object({ matterId: idSchema, passwordId: idSchema });

/** POST /api/matters/:matterId/passwords */
export const addPasswordSchema = z.object({
  label: text().trim().max(200, 'must be at most 200 characters').default(''),
  password: text().min(1, 'is required').max(1024, 'must be at most 1024 characters'),
});
export type AddPasswordReq = z.infer<typeof addPasswordSchema>;

export interface MatterPassword {
  id: number;
  label: string;
  createdAt: string;
}

/** GET /api/matters/:matterId/passwords */
export interface MatterPasswordsResponse {
  passwords: MatterPassword[];
}
