import type { z } from 'zod';

// Field → reasons, one shape for the server's 422 answers and the forms' own checks before a
// request (pure: client components import it through components/forms/use-api-form).

/** Field → reasons, as returned to forms (`fields.email = ['Enter a valid e-mail address']`). */
export type FieldErrors = Record<string, string[]>;

/** An empty field → reasons map with no prototype, so a field named `__proto__` or `toString` is just a key. */
export function emptyFieldErrors(): FieldErrors {
  return Object.create(null) as FieldErrors;
}

/** Flattens zod issues into { "a.b": ["reason"] }. */
export function fieldErrors(error: z.ZodError): FieldErrors {
  // Keys come from the request (unknown keys are reported by name): a plain `{}` would answer
  // `out.__proto__` or `out.constructor` with Object.prototype's members.
  const out = emptyFieldErrors();
  for (const issue of error.issues) {
    // A key the schema does not accept (a smuggled coopId, role …) is reported under its own name.
    if (issue.code === 'unrecognized_keys') {
      for (const k of issue.keys) (out[[...issue.path, k].join('.')] ??= []).push('This field is not accepted here.');
      continue;
    }
    const key = issue.path.length ? issue.path.join('.') : '_form';
    (out[key] ??= []).push(issue.message);
  }
  return out;
}
