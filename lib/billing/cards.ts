/**
 * The two test cards a workspace can put on file with the local payment service, shown by label only.
 * Pure data, safe for client components.
 */
export const CARD_CHOICES = ['succeeds', 'declined'] as const;
export type CardChoice = (typeof CARD_CHOICES)[number];

export const TEST_CARDS: Readonly<Record<CardChoice, { label: string; paymentMethod: string }>> = {
  succeeds: { label: 'Test card that succeeds', paymentMethod: 'pm_card_visa' },
  declined: { label: 'Test card that is declined', paymentMethod: 'pm_card_chargeDeclined' },
};

export function cardChoiceForLabel(label: string | null | undefined): CardChoice | null {
  for (const choice of CARD_CHOICES) if (TEST_CARDS[choice].label === label) return choice;
  return null;
}
