import { useState, type FormEvent } from 'react';

/** The state of a form that sends itself and leaves the page when it succeeds. */
export interface FormSubmit {
  /** True from submitting until a problem is shown (it stays true while the page navigates away). */
  busy: boolean;
  /** The problem to show, or '' when there is none. */
  error: string;
  /** The form's onSubmit handler. */
  onSubmit: (event: FormEvent<HTMLFormElement>) => Promise<void>;
}

/**
 * Submit, pending and error handling shared by the forms that navigate on success (first-run
 * setup, accepting an invitation, creating a study): the default submission is prevented, the
 * form is marked busy and its error cleared, and `send` runs with the form's fields.
 * @param send the form's work; it returns the message to show when something is wrong (the form
 *   is then usable again), or nothing once it has sent the browser elsewhere.
 * @returns busy, error and the onSubmit handler.
 */
export function useFormSubmit(send: (form: FormData) => Promise<string | void>): FormSubmit {
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState('');

  async function onSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    setBusy(true);
    setError('');
    const problem = await send(form);
    if (problem) {
      setBusy(false);
      setError(problem);
    }
  }

  return { busy, error, onSubmit };
}
