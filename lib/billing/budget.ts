import 'server-only';
import type { Knex } from 'knex';
import { db, writeTx } from '@/db/client';
import { claimBudgetAlert, getBilling, listBillingContacts, updateBilling, type BillingDto } from '@/db/billing';
import { createAuditEntry } from '@/db/audit';
import { appUrl } from '@/lib/env';
import { paymentRequired } from '@/lib/errors';
import { log } from '@/lib/log';
import { sendMail } from '@/lib/mail/mailer';
import { budgetAlertMail } from './emails';
import { PLANS, formatUsd } from './plans';
import { usagePeriod } from './usage-summary';

/**
 * The monthly usage budget: the most the per-flight charges of one billing period should come to
 * (the monthly base fee is not part of it). E-mails go to the billing contacts when the period's usage
 * reaches 80 % and 100 % of it, each once per period; with the hard stop on, new billable work that
 * would pass it is refused with a 402. A free trial charges nothing, so no budget applies to it.
 */
export interface BudgetState {
  budgetCents: number | null;
  hardStop: boolean;
  periodStart: string;
  periodEnd: string;
  units: number;
  perFlightCents: number;
  usageChargeCents: number;
  /** Usage charge over budget (0..); null without a budget. */
  usedFraction: number | null;
  /** Billable units left before the budget is reached; null without a budget or in a free period. */
  unitsLeft: number | null;
  freePeriod: boolean;
}

type Trx = Knex | Knex.Transaction;

async function unitsIn(
  scope: { workspaceId: number },
  period: { start: string; end: string },
  trx: Trx,
): Promise<number> {
  const r = (await trx('usage_events')
    .where({ workspace_id: scope.workspaceId })
    .where('occurred_at', '>=', period.start)
    .where('occurred_at', '<', period.end)
    .sum({ n: 'quantity' })) as { n: number | string | null }[];
  return Number(r[0]?.n ?? 0);
}

function stateOf(billing: BillingDto, units: number): BudgetState {
  const period = usagePeriod(billing);
  const perFlightCents = PLANS[billing.planId].perFlightCents;
  const usageChargeCents = units * perFlightCents;
  const budget = billing.usageBudgetCents;
  const freePeriod = billing.status === 'trialing';
  return {
    budgetCents: budget,
    hardStop: billing.budgetHardStop,
    periodStart: period.start,
    periodEnd: period.end,
    units,
    perFlightCents,
    usageChargeCents,
    usedFraction:
      budget === null ? null : budget === 0 ? (usageChargeCents > 0 ? Infinity : 1) : usageChargeCents / budget,
    unitsLeft: budget === null || freePeriod ? null : Math.max(0, Math.floor(budget / perFlightCents) - units),
    freePeriod,
  };
}

export async function getBudgetState(scope: { workspaceId: number }, trx: Trx = db()): Promise<BudgetState | null> {
  const billing = await getBilling(scope, trx);
  if (!billing) return null;
  return stateOf(billing, await unitsIn(scope, usagePeriod(billing), trx));
}

/**
 * With the hard stop on, refuses billable work that would take the period's usage charge past the
 * budget: 402 naming the budget, the usage so far and what the work would add.
 */
export async function assertWithinBudget(scope: { workspaceId: number }, trx: Trx, addingUnits: number): Promise<void> {
  const billing = await getBilling(scope, trx);
  if (!billing || billing.usageBudgetCents === null || !billing.budgetHardStop || billing.status === 'trialing') return;
  const s = stateOf(billing, await unitsIn(scope, usagePeriod(billing), trx));
  if (s.budgetCents === null) return;
  const after = (s.units + addingUnits) * s.perFlightCents;
  if (after <= s.budgetCents) return;
  const what = addingUnits === 1 ? 'this screening' : `these ${addingUnits.toLocaleString('en-GB')} flights`;
  throw paymentRequired(
    `The monthly usage budget of this workspace (${formatUsd(s.budgetCents)}) is reached: ${s.units.toLocaleString('en-GB')} billable units so far this billing period (${formatUsd(s.usageChargeCents)}), and ${what} would take it to ${formatUsd(after)}. ` +
      (s.unitsLeft
        ? `${s.unitsLeft.toLocaleString('en-GB')} more unit${s.unitsLeft === 1 ? '' : 's'} fit in the budget. `
        : '') +
      'An owner or finance admin can raise the budget or turn off the hard stop under Settings → Billing.',
  );
}

/** Sends the 80 % and 100 % alerts the period's usage has reached and that were not sent this period. Never throws. */
export async function checkBudgetAlerts(scope: { workspaceId: number }): Promise<(80 | 100)[]> {
  const sent: (80 | 100)[] = [];
  try {
    // Most workspaces set no budget: read the billing row first and count units only when there is one.
    const billing = await getBilling(scope);
    if (!billing || billing.usageBudgetCents === null || billing.status === 'trialing') return sent;
    const s = stateOf(billing, await unitsIn(scope, usagePeriod(billing), db()));
    if (s.budgetCents === null || s.usedFraction === null) return sent;
    for (const threshold of [80, 100] as const) {
      if (s.usedFraction < threshold / 100) continue;
      if (!(await claimBudgetAlert(scope, threshold, s.periodStart))) continue;
      const ws = await db()('workspaces').where({ id: scope.workspaceId }).first('slug', 'name');
      if (!ws) return sent;
      const billingUrl = new URL(`/w/${ws.slug}/settings/billing`, appUrl()).toString();
      for (const to of await listBillingContacts(scope)) {
        await sendMail(
          budgetAlertMail(to, {
            workspaceName: String(ws.name),
            threshold,
            budgetCents: s.budgetCents,
            usageChargeCents: s.usageChargeCents,
            units: s.units,
            periodEnd: s.periodEnd,
            hardStop: s.hardStop,
            billingUrl,
          }),
        );
      }
      sent.push(threshold);
    }
  } catch (err) {
    log.error(
      { event: 'billing.budget_alert_failed', workspaceId: scope.workspaceId, err },
      'could not check or send the usage budget alerts',
    );
  }
  return sent;
}

/** Sets or clears the budget and its hard stop; audited. */
export async function setUsageBudget(
  scope: { workspaceId: number },
  actor: { userId: number; email: string },
  input: { budgetCents: number | null; hardStop: boolean },
): Promise<BudgetState> {
  await writeTx(async (trx) => {
    await updateBilling(
      scope,
      { usageBudgetCents: input.budgetCents, budgetHardStop: input.budgetCents === null ? false : input.hardStop },
      trx,
    );
    await createAuditEntry(
      {
        workspaceId: scope.workspaceId,
        userId: actor.userId,
        actor: actor.email,
        action: 'billing.budget_set',
        target: `workspace:${scope.workspaceId}`,
        detail: input,
      },
      trx,
    );
  });
  const s = await getBudgetState(scope);
  if (!s) throw new Error('workspace has no billing row');
  // A budget set below what is already used alerts now rather than at the next unit.
  await checkBudgetAlerts(scope);
  return s;
}

export interface ImportEstimate {
  /** One billable unit per flight screened: the file's rows, if every flight screens. */
  billableUnits: number;
  perFlightCents: number;
  /** What these units add to the period's charge (0 in a free trial), in cents. */
  estimatedChargeCents: number;
  freePeriod: boolean;
  budget: {
    budgetCents: number;
    usageChargeCents: number;
    afterImportCents: number;
    hardStop: boolean;
    wouldExceed: boolean;
  } | null;
}

/** The cost of importing `rows` flights now, for the confirmation asked before an import is saved. */
export async function estimateImport(scope: { workspaceId: number }, rows: number): Promise<ImportEstimate> {
  const s = await getBudgetState(scope);
  const perFlightCents = s?.perFlightCents ?? 0;
  const freePeriod = s?.freePeriod ?? true;
  const estimatedChargeCents = freePeriod ? 0 : rows * perFlightCents;
  const budget =
    s && s.budgetCents !== null && !freePeriod
      ? {
          budgetCents: s.budgetCents,
          usageChargeCents: s.usageChargeCents,
          afterImportCents: s.usageChargeCents + estimatedChargeCents,
          hardStop: s.hardStop,
          wouldExceed: s.usageChargeCents + estimatedChargeCents > s.budgetCents,
        }
      : null;
  return { billableUnits: rows, perFlightCents, estimatedChargeCents, freePeriod, budget };
}
