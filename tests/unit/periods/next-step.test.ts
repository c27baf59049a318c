import { describe, expect, it } from 'vitest';
import { periodNextStepNote } from '@/components/periods/next-step';

describe("a period's next step, for members who cannot take it", () => {
  it.each([
    ['open', 'viewer', 'An owner or a sustainability analyst moves it to review.'],
    ['open', 'planner', 'An owner or a sustainability analyst moves it to review.'],
    ['review', 'analyst', 'An owner signs it.'],
    ['review', 'viewer', 'An owner signs it.'],
  ] as const)('%s, %s: %s', (state, role, note) => {
    expect(periodNextStepNote(state, role)).toBe(note);
  });

  it('says nothing to a member who can take the step, or once the period is signed', () => {
    expect(periodNextStepNote('open', 'analyst')).toBeNull();
    expect(periodNextStepNote('open', 'owner')).toBeNull();
    expect(periodNextStepNote('review', 'owner')).toBeNull();
    expect(periodNextStepNote('signed', 'viewer')).toBeNull();
  });
});
