import 'server-only';
import type { Knex } from 'knex';
import { writeTx } from '@/db/client';
import { getBilling, insertTrialBilling, type BillingDto } from '@/db/billing';
import { getWorkspaceById } from '@/db/workspaces';
import { DEFAULT_PLAN_ID, TRIAL_DAYS } from './plans';

/** The end of a trial that started at `startIso`: TRIAL_DAYS later. */
export function trialEnd(startIso: string): string {
  return new Date(Date.parse(startIso) + TRIAL_DAYS * 86_400_000).toISOString();
}

/** Every new workspace starts a free trial of the default plan, written in the transaction that creates it. */
export async function startTrial(workspace: { id: number; createdAt: string }, trx: Knex.Transaction): Promise<void> {
  await insertTrialBilling(trx, {
    workspaceId: workspace.id,
    planId: DEFAULT_PLAN_ID,
    trialEndsAt: trialEnd(workspace.createdAt),
  });
}

/**
 * The workspace's billing state; a workspace made before billing existed gets the trial it would have
 * had, counted from its creation.
 */
export async function ensureBilling(scope: { workspaceId: number }): Promise<BillingDto> {
  const existing = await getBilling(scope);
  if (existing) return existing;
  return writeTx(async (trx) => {
    const workspace = await getWorkspaceById(scope.workspaceId, trx);
    if (workspace) await startTrial(workspace, trx);
    const row = await getBilling(scope, trx);
    if (!row) throw new Error(`workspace ${scope.workspaceId} has no billing row`);
    return row;
  });
}
