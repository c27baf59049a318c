'use client';

import { useState, useTransition } from 'react';
import type { useForm, UseFormRegisterReturn } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useQueryClient } from '@tanstack/react-query';
import { Button } from '@/components/ui/button';
import { Field, SelectInput, TextInput } from '@/components/ui/field';
import { FormNotice, useActionForm, type FormMessage } from '@/components/ui/use-action-form';
import { CARD_CHOICES, TEST_CARDS, type CardChoice } from '@/lib/billing/cards';
import { PLANS, PLAN_IDS, breakEvenUnits, type PlanId } from '@/lib/billing/plans';
import type { ActionState } from '@/lib/errors';
import { formatMoney } from '@/lib/format';
import {
  billingEmailSchema,
  cardChoiceSchema,
  subscribeSchema,
  type BillingEmailInput,
  type CardChoiceInput,
  type SubscribeInput,
} from '@/lib/validation/billing';
import {
  cancelAtPeriodEndAction,
  changePlanAction,
  payOpenInvoicesAction,
  setCardAction,
  setUsageBudgetAction,
  subscribeAction,
  updateBillingEmailAction,
} from './actions';

type Message = FormMessage | undefined;

function useAfterAction(slug: string) {
  const queryClient = useQueryClient();
  return () => queryClient.invalidateQueries({ queryKey: ['usage', slug] });
}

function messageOf(state: ActionState): Message {
  if (!state) return undefined;
  return state.ok
    ? { tone: 'success', text: state.message ?? 'Saved.' }
    : { tone: 'danger', text: state.error.message };
}

function PlanOptions({
  selected,
  current,
  register,
}: {
  selected: PlanId;
  current: PlanId | null;
  register: ReturnType<typeof useForm<SubscribeInput>>['register'];
}) {
  return (
    <fieldset>
      <legend className="mb-2 text-sm font-medium text-ink">Plan</legend>
      <div className="grid gap-3 sm:grid-cols-2">
        {PLAN_IDS.map((id) => {
          const plan = PLANS[id];
          const checked = selected === id;
          return (
            <label
              key={id}
              className={`block cursor-pointer rounded-card border p-4 focus-within:ring-2 focus-within:ring-accent ${checked ? 'border-accent bg-accent-soft' : 'border-line bg-paper-raised hover:border-line-strong'}`}
            >
              <span className="flex items-center gap-2">
                <input type="radio" value={id} className="accent-accent" {...register('planId')} />
                <span className="font-semibold text-ink">{plan.name}</span>
                {current === id ? (
                  <span className="rounded bg-paper-sunk px-1.5 py-0.5 text-xs text-ink-soft">current</span>
                ) : null}
              </span>
              <span className="figure mt-1 block text-sm text-ink">
                {formatMoney(plan.baseFeeCents)} a month + {formatMoney(plan.perFlightCents)} per screened flight
              </span>
              <span className="mt-1 block text-xs text-ink-soft">{plan.description}</span>
            </label>
          );
        })}
      </div>
      <p className="mt-2 text-xs text-ink-faint">
        {PLANS.fleet.name} costs less than {PLANS.crew.name} from {breakEvenUnits().toLocaleString('en-GB')} screened
        flights in a month.
      </p>
    </fieldset>
  );
}

/** The card on file, one of the local payment service's test cards. */
function CardField({
  id,
  hint,
  error,
  registration,
}: {
  id: string;
  hint: string;
  error?: string;
  registration: UseFormRegisterReturn<'card'>;
}) {
  return (
    <Field id={id} label="Card on file" hint={hint} error={error}>
      <SelectInput id={id} invalid={!!error} {...registration}>
        {CARD_CHOICES.map((c) => (
          <option key={c} value={c}>
            {TEST_CARDS[c].label}
          </option>
        ))}
      </SelectInput>
    </Field>
  );
}

/** Subscribe from a trial or after a cancellation: plan and card together. */
export function SubscribeForm({
  slug,
  planId,
  card,
  trialLeft,
}: {
  slug: string;
  planId: PlanId;
  card: CardChoice | null;
  trialLeft: boolean;
}) {
  const after = useAfterAction(slug);
  const {
    form,
    errors,
    pending: isSubmitting,
    message,
    onSubmit,
  } = useActionForm({
    resolver: zodResolver(subscribeSchema),
    defaultValues: { planId, card: card ?? 'succeeds' },
    fields: ['planId', 'card'],
    action: (values: SubscribeInput) => subscribeAction(slug, values),
    onSettled: after,
  });
  const selected = form.watch('planId');
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      <FormNotice message={message} />
      <PlanOptions selected={selected} current={null} register={form.register} />
      {errors.planId ? (
        <p role="alert" className="text-xs font-medium text-danger">
          {errors.planId.message}
        </p>
      ) : null}
      <CardField
        id="subscribe-card"
        hint="A test card of the local payment service, shown by its label only."
        error={errors.card?.message}
        registration={form.register('card')}
      />
      <div className="flex flex-wrap items-center gap-3">
        <Button type="submit" disabled={isSubmitting}>
          {isSubmitting ? 'Subscribing…' : `Subscribe to ${PLANS[selected].name}`}
        </Button>
        <span className="text-xs text-ink-soft">
          {trialLeft
            ? 'The rest of the free trial stays free; the first paid period starts when it ends.'
            : 'The first period starts today and is invoiced when it closes.'}
        </span>
      </div>
    </form>
  );
}

/** Switch plan on a running subscription (or choose the plan a trial will subscribe to). */
export function ChangePlanForm({ slug, planId, subscribed }: { slug: string; planId: PlanId; subscribed: boolean }) {
  const after = useAfterAction(slug);
  const { form, message, onSubmit } = useActionForm<SubscribeInput, SubscribeInput, unknown>({
    defaultValues: { planId, card: 'succeeds' },
    fields: [],
    action: (values) => changePlanAction(slug, { planId: values.planId }),
    onSettled: after,
  });
  const selected = form.watch('planId');
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      <FormNotice message={message} />
      <PlanOptions selected={selected} current={planId} register={form.register} />
      <div className="flex flex-wrap items-center gap-3">
        <Button type="submit" disabled={form.formState.isSubmitting || selected === planId}>
          {form.formState.isSubmitting
            ? 'Changing…'
            : selected === planId
              ? `On ${PLANS[planId].name}`
              : `Change to ${PLANS[selected].name}`}
        </Button>
        {subscribed ? (
          <span className="text-xs text-ink-soft">No proration: the new prices apply to the whole current period.</span>
        ) : null}
      </div>
    </form>
  );
}

export function CancelResume({
  slug,
  cancelAtPeriodEnd,
  periodEnd,
}: {
  slug: string;
  cancelAtPeriodEnd: boolean;
  periodEnd: string | null;
}) {
  const [pending, start] = useTransition();
  const [message, setMessage] = useState<Message>();
  const after = useAfterAction(slug);
  const run = (cancel: boolean) =>
    start(async () => {
      setMessage(undefined);
      setMessage(messageOf(await cancelAtPeriodEndAction(slug, { cancel })));
      await after();
    });
  return (
    <div className="space-y-3">
      <FormNotice message={message} />
      {cancelAtPeriodEnd ? (
        <Button variant="primary" disabled={pending} onClick={() => run(false)}>
          Resume the subscription
        </Button>
      ) : (
        <Button
          variant="secondary"
          disabled={pending}
          onClick={() => {
            if (
              confirm(
                `Cancel at the end of the period${periodEnd ? ` (${periodEnd.slice(0, 10)})` : ''}? Screening continues until then.`,
              )
            )
              run(true);
          }}
        >
          Cancel at period end
        </Button>
      )}
    </div>
  );
}

export function PaymentCardForm({ slug, card, pastDue }: { slug: string; card: CardChoice | null; pastDue: boolean }) {
  const [paying, startPaying] = useTransition();
  const after = useAfterAction(slug);
  const {
    form,
    errors,
    pending: isSubmitting,
    message,
    setMessage,
    onSubmit,
  } = useActionForm({
    resolver: zodResolver(cardChoiceSchema),
    defaultValues: { card: card ?? 'succeeds' },
    fields: ['card'],
    action: (values: CardChoiceInput) => setCardAction(slug, values),
    onSettled: after,
  });
  return (
    <div className="space-y-4">
      <FormNotice message={message} />
      <form onSubmit={onSubmit} noValidate className="space-y-4">
        <CardField
          id="card-choice"
          hint="Used for every invoice from now on."
          error={errors.card?.message}
          registration={form.register('card')}
        />
        <Button type="submit" variant="secondary" disabled={isSubmitting}>
          Save card
        </Button>
      </form>
      {pastDue ? (
        <div className="border-t border-line pt-4">
          <p className="mb-2 text-sm text-ink-soft">
            Once a card that works is on file, pay the open invoice to reopen screening.
          </p>
          <Button
            disabled={paying}
            onClick={() =>
              startPaying(async () => {
                setMessage(undefined);
                setMessage(messageOf(await payOpenInvoicesAction(slug)));
                await after();
              })
            }
          >
            {paying ? 'Paying…' : 'Pay the open invoice'}
          </Button>
        </div>
      ) : null}
    </div>
  );
}

export function BillingEmailForm({ slug, billingEmail }: { slug: string; billingEmail: string | null }) {
  const {
    form,
    errors,
    pending: isSubmitting,
    message,
    onSubmit,
  } = useActionForm({
    resolver: zodResolver(billingEmailSchema),
    defaultValues: { billingEmail: billingEmail ?? '' },
    fields: ['billingEmail'],
    action: (values: BillingEmailInput) => updateBillingEmailAction(slug, values),
  });
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      <FormNotice message={message} />
      <Field
        id="billing-email"
        label="Billing e-mail"
        hint="Invoices are addressed here, and payment problems are sent here as well as to owners and finance admins. Leave empty to use only them."
        error={errors.billingEmail?.message}
      >
        <TextInput
          id="billing-email"
          type="email"
          autoComplete="email"
          invalid={!!errors.billingEmail}
          {...form.register('billingEmail')}
        />
      </Field>
      <Button type="submit" variant="secondary" disabled={isSubmitting}>
        Save e-mail
      </Button>
    </form>
  );
}

/** The monthly usage budget in dollars (empty for none) and whether reaching it stops new billable work. */
export function UsageBudgetForm({
  slug,
  budgetCents,
  hardStop,
}: {
  slug: string;
  budgetCents: number | null;
  hardStop: boolean;
}) {
  const [message, setMessage] = useState<Message>();
  const [amount, setAmount] = useState(budgetCents === null ? '' : (budgetCents / 100).toFixed(2));
  const [stop, setStop] = useState(hardStop);
  const [error, setError] = useState<string>();
  const [pending, start] = useTransition();
  const after = useAfterAction(slug);
  return (
    <form
      noValidate
      className="space-y-4"
      onSubmit={(e) => {
        e.preventDefault();
        setMessage(undefined);
        setError(undefined);
        const text = amount.trim().replace(/^\$/, '').replace(/,/g, '');
        const dollars = text === '' ? null : Number(text);
        if (dollars !== null && (!Number.isFinite(dollars) || dollars < 0)) {
          setError('Give the budget in dollars, such as 2500 or 2500.00, or leave it empty for no budget.');
          return;
        }
        start(async () => {
          const state = await setUsageBudgetAction(slug, {
            budgetCents: dollars === null ? null : Math.round(dollars * 100),
            hardStop: stop,
          });
          if (state && !state.ok) setError(state.error.fields?.[0]?.message ?? state.error.message);
          setMessage(messageOf(state));
          await after();
        });
      }}
    >
      <FormNotice message={message} />
      <Field
        id="usage-budget"
        label="Monthly usage budget (USD)"
        hint="Per-flight charges of one billing period, before the monthly fee. Leave empty for no budget."
        error={error}
      >
        <TextInput
          id="usage-budget"
          inputMode="decimal"
          value={amount}
          invalid={!!error}
          onChange={(e) => setAmount(e.target.value)}
        />
      </Field>
      <label className="flex items-start gap-2 text-sm text-ink">
        <input
          type="checkbox"
          className="mt-0.5 accent-accent"
          checked={stop}
          onChange={(e) => setStop(e.target.checked)}
        />
        <span>
          Hard stop: refuse new screenings and imports that would pass the budget (they answer “payment required” until
          the next period or a higher budget).
        </span>
      </label>
      <Button type="submit" variant="secondary" disabled={pending}>
        {pending ? 'Saving…' : 'Save budget'}
      </Button>
    </form>
  );
}
