import { ButtonLink } from '@/components/ui/button';

export default function HomePage() {
  return (
    <main id="main" className="mx-auto flex min-h-screen max-w-3xl flex-col justify-center px-6 py-16">
      <p className="text-sm font-semibold uppercase tracking-widest text-strato">Tropopass</p>
      <h1 className="mt-3 text-4xl font-semibold tracking-tight">How much of your NOx lands above the tropopause?</h1>
      <p className="mt-4 text-lg text-ink-soft">
        Screen routes and cruise levels for the nitrogen oxides they inject into the lower stratosphere, where they stay
        for months and can run the catalytic ozone cycle. Compare levels, import schedules, report fleets.
      </p>
      <div className="mt-8 flex gap-3">
        <ButtonLink href="/signin">Sign in</ButtonLink>
        <ButtonLink href="/signup" variant="secondary">
          Create an account
        </ButtonLink>
      </div>
      <p className="mt-10 text-xs text-ink-faint">
        Screening estimates for planning and reporting support; not a certified emissions inventory or a regulatory
        method.
      </p>
    </main>
  );
}
