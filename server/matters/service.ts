import { permissionsOf, type MatterRole } from '../../shared/roles';
import type { AdminMatter } from '../../shared/schemas/admin';
import type {
  CreateMatterReq,
  MatterHomeResponse,
  MattersResponse,
} from '../../shared/schemas/matters';
import { recordAudit } from '../audit/record';
import type { Db } from '../db/database';
import { conflict, matterNotFound, validationError } from '../http/errors';
import { findUserByRef } from '../users/queries';
import { userRowToPerson } from '../users/service';
import { matterCreatedSteps } from './hooks';
import {
  countDocuments,
  countMembers,
  findMatterById,
  findMatterByNameOrPrefix,
  insertMatter,
  listAllMatters,
  listLeads,
  listMattersOfUser,
} from './queries';

export interface Actor {
  id: string | null;
  email: string | null;
  ip: string | null;
}

const auditActor = (actor: Actor) => ({ actorId: actor.id, actorEmail: actor.email, ip: actor.ip });

export async function listMyMatters(db: Db, userId: string): Promise<MattersResponse> {
  const rows = await listMattersOfUser(db, userId);
  return {
    matters: rows.map((m) => ({
      id: m.id,
      name: m.name,
      description: m.description,
      controlPrefix: m.control_prefix,
      createdAt: m.created_at,
      role: m.role as MatterRole,
      permissions: permissionsOf(m.role as MatterRole),
    })),
  };
}

export async function readMatterHome(
  db: Db,
  matterId: number,
  role: MatterRole,
): Promise<MatterHomeResponse> {
  const matter = await findMatterById(db, matterId);
  if (!matter) throw matterNotFound();
  const leads = await listLeads(db, [matterId]);
  return {
    matter: {
      id: matter.id,
      name: matter.name,
      description: matter.description,
      controlPrefix: matter.control_prefix,
      createdAt: matter.created_at,
    },
    role,
    permissions: permissionsOf(role),
    leads: leads.map(userRowToPerson),
    memberCount: await countMembers(db, matterId),
    documentCount: await countDocuments(db, matterId),
  };
}

/** Every matter with its leads and member count (firm admin view). */
export async function listAdminMatters(db: Db, onlyId?: number): Promise<AdminMatter[]> {
  const matters = (await listAllMatters(db)).filter((m) => onlyId === undefined || m.id === onlyId);
  const leads = await listLeads(
    db,
    matters.map((m) => m.id),
  );
  return matters.map((m) => ({
    id: m.id,
    name: m.name,
    description: m.description,
    controlPrefix: m.control_prefix,
    createdAt: m.created_at,
    leads: leads.filter((lead) => lead.matter_id === m.id).map(userRowToPerson),
    memberCount: Number(m.member_count),
  }));
}

async function adminMatter(db: Db, matterId: number): Promise<AdminMatter> {
  const [matter] = await listAdminMatters(db, matterId);
  if (!matter) throw matterNotFound();
  return matter;
}

/**
 * Creates a matter with its first lead, runs the matter-created steps (hooks.ts) in the
 * same transaction, and records matter.created and matter.lead_appointed.
 */
export async function createMatter(
  db: Db,
  input: CreateMatterReq,
  actor: Actor,
): Promise<AdminMatter> {
  const matterId = await db.transaction().execute(async (trx) => {
    const clash = await findMatterByNameOrPrefix(trx, input.name, input.controlPrefix);
    if (clash) {
      const byName = clash.name.toLowerCase() === input.name.toLowerCase();
      throw byName
        ? conflict('A matter with this name already exists.', 'name')
        : conflict(
            `Control prefix ${input.controlPrefix} is used by another matter.`,
            'controlPrefix',
          );
    }
    const lead = await findUserByRef(trx, input.lead);
    if (!lead) throw validationError('lead', 'no account has this id or e-mail');
    const id = await insertMatter(trx, {
      name: input.name,
      description: input.description,
      controlPrefix: input.controlPrefix,
      createdBy: actor.id,
    });
    await trx
      .insertInto('matter_members')
      .values({
        matter_id: id,
        user_id: lead.id,
        role: 'lead',
        granted_by: actor.id,
        granted_at: new Date().toISOString(),
      })
      .execute();
    for (const step of matterCreatedSteps) await step(trx, id);
    await recordAudit(trx, {
      ...auditActor(actor),
      matterId: id,
      action: 'matter.created',
      targetType: 'matter',
      targetId: id,
      detail: { name: input.name, controlPrefix: input.controlPrefix },
    });
    await recordAudit(trx, {
      ...auditActor(actor),
      matterId: id,
      action: 'matter.lead_appointed',
      targetType: 'user',
      targetId: lead.id,
      detail: { email: lead.email },
    });
    return id;
  });
  return adminMatter(db, matterId);
}

/** Makes an existing account a lead of the matter (adding or promoting them). */
export async function appointLead(
  db: Db,
  matterId: number,
  leadRef: string,
  actor: Actor,
): Promise<AdminMatter> {
  await db.transaction().execute(async (trx) => {
    if (!(await findMatterById(trx, matterId))) throw matterNotFound();
    const lead = await findUserByRef(trx, leadRef);
    if (!lead) throw validationError('lead', 'no account has this id or e-mail');
    const now = new Date().toISOString();
    const existing = await trx
      .selectFrom('matter_members')
      .select('role')
      .where('matter_id', '=', matterId)
      .where('user_id', '=', lead.id)
      .executeTakeFirst();
    if (existing?.role === 'lead')
      throw conflict(`${lead.email} is already a lead of this matter.`, 'lead');
    await trx
      .insertInto('matter_members')
      .values({
        matter_id: matterId,
        user_id: lead.id,
        role: 'lead',
        granted_by: actor.id,
        granted_at: now,
      })
      .onConflict((oc) => oc.columns(['matter_id', 'user_id']).doUpdateSet({ role: 'lead' }))
      .execute();
    await recordAudit(trx, {
      ...auditActor(actor),
      matterId,
      action: 'matter.lead_appointed',
      targetType: 'user',
      targetId: lead.id,
      detail: { email: lead.email, previousRole: existing?.role ?? null },
    });
  });
  return adminMatter(db, matterId);
}
