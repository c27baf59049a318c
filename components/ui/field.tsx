import type { InputHTMLAttributes, ReactNode, SelectHTMLAttributes, TextareaHTMLAttributes } from 'react';
import { forwardRef } from 'react';

export const inputClass =
  'block w-full rounded-md border border-line-strong bg-paper-raised px-3 py-2 text-sm text-ink placeholder:text-ink-faint focus:border-accent focus:outline-none aria-[invalid=true]:border-danger';

interface FieldProps {
  id: string;
  label: ReactNode;
  hint?: ReactNode;
  error?: string;
  children: ReactNode;
  className?: string;
}

/** A labelled control with its hint and its error message right beside it. */
export function Field({ id, label, hint, error, children, className = '' }: FieldProps) {
  return (
    <div className={`space-y-1 ${className}`}>
      <label htmlFor={id} className="block text-sm font-medium text-ink">
        {label}
      </label>
      {children}
      {hint && !error ? (
        <p id={`${id}-hint`} className="text-xs text-ink-faint">
          {hint}
        </p>
      ) : null}
      {error ? (
        <p id={`${id}-error`} role="alert" className="text-xs font-medium text-danger">
          {error}
        </p>
      ) : null}
    </div>
  );
}

/**
 * The state attributes of a control: invalid, and described by its error (or, where the control
 * shows a hint, by its hint while it is valid).
 */
function stateOf(id: string | undefined, invalid: boolean | undefined, describedByHint: boolean) {
  return {
    'aria-invalid': invalid || undefined,
    'aria-describedby': id && invalid ? `${id}-error` : id && describedByHint ? `${id}-hint` : undefined,
  };
}

type Control<A> = A & { invalid?: boolean };

export const TextInput = forwardRef<HTMLInputElement, Control<InputHTMLAttributes<HTMLInputElement>>>(
  function TextInput({ invalid, className = '', id, ...rest }, ref) {
    return (
      <input ref={ref} id={id} {...stateOf(id, invalid, true)} {...rest} className={`${inputClass} ${className}`} />
    );
  },
);

export const SelectInput = forwardRef<HTMLSelectElement, Control<SelectHTMLAttributes<HTMLSelectElement>>>(
  function SelectInput({ invalid, className = '', id, ...rest }, ref) {
    return (
      <select ref={ref} id={id} {...stateOf(id, invalid, false)} {...rest} className={`${inputClass} ${className}`} />
    );
  },
);

export const TextArea = forwardRef<HTMLTextAreaElement, Control<TextareaHTMLAttributes<HTMLTextAreaElement>>>(
  function TextArea({ invalid, className = '', id, ...rest }, ref) {
    return (
      <textarea ref={ref} id={id} {...stateOf(id, invalid, false)} {...rest} className={`${inputClass} ${className}`} />
    );
  },
);

/**
 * A Field holding a TextInput with the same id, marked invalid while it has an error; `fieldClassName`
 * goes on the Field, `className` on the input.
 */
export const InputField = forwardRef<
  HTMLInputElement,
  Omit<InputHTMLAttributes<HTMLInputElement>, 'id'> & {
    id: string;
    label: ReactNode;
    hint?: ReactNode;
    error?: string;
    fieldClassName?: string;
  }
>(function InputField({ id, label, hint, error, fieldClassName, ...input }, ref) {
  return (
    <Field id={id} label={label} hint={hint} error={error} className={fieldClassName}>
      <TextInput ref={ref} id={id} invalid={!!error} {...input} />
    </Field>
  );
});
