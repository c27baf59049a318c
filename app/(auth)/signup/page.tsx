import Link from 'next/link';
import { SignUpForm } from './sign-up-form';

export const metadata = { title: 'Create an account' };

export default function SignUpPage() {
  return (
    <>
      <h1 className="text-xl font-semibold">Create your Tropopass account</h1>
      <p className="mt-1 text-sm text-ink-soft">
        Already have one?{' '}
        <Link className="text-accent underline" href="/signin">
          Sign in
        </Link>
      </p>
      <SignUpForm />
    </>
  );
}
