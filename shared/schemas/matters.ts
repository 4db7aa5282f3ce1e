import { z } from 'zod';
import { CONTROL_PREFIX_PATTERN, MATTER_NAME_MAX_LENGTH } from '../limits';
import type { MatterPermission, MatterRole } from '../roles';
import { text, type PersonRef } from './common';
import { userRefSchema, type AdminMatter } from './admin';

/** POST /api/matters (firm admin): the matter and its first lead (user id or e-mail). */
export const createMatterSchema = z.object({
  name: text()
    .trim()
    .min(1, 'is required')
    .max(MATTER_NAME_MAX_LENGTH, `must be at most ${MATTER_NAME_MAX_LENGTH} characters`),
  description: text().trim().max(2000, 'must be at most 2000 characters').default(''),
  controlPrefix: text()
    .trim()
    .toUpperCase()
    .regex(
      CONTROL_PREFIX_PATTERN,
      'must be 2-8 capital letters or digits, starting with a letter (e.g. HGM)',
    ),
  lead: userRefSchema,
});
export type CreateMatterReq = z.infer<typeof createMatterSchema>;

export interface CreateMatterResponse {
  matter: AdminMatter;
}

/** One of my matters in GET /api/matters. */
export interface MatterSummary {
  id: number;
  name: string;
  description: string;
  controlPrefix: string;
  createdAt: string;
  role: MatterRole;
  permissions: MatterPermission[];
}

export interface MattersResponse {
  matters: MatterSummary[];
}

/** GET /api/matters/:matterId: the matter's home page. */
export interface MatterHomeResponse {
  matter: {
    id: number;
    name: string;
    description: string;
    controlPrefix: string;
    createdAt: string;
  };
  role: MatterRole;
  permissions: MatterPermission[];
  leads: PersonRef[];
  memberCount: number;
  documentCount: number;
}
