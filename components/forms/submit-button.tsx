'use client';

import { useSyncExternalStore, type ComponentProps } from 'react';
import { Button } from '@/components/ui/button';

const noSubscription = () => () => {};

/** True once the page's script runs; false in the server's HTML and while the page comes alive. */
function useHydrated() {
  return useSyncExternalStore(
    noSubscription,
    () => true,
    () => false,
  );
}

/**
 * The submit button of a form the page's script sends. Until that script runs it is disabled
 * (and so is pressing Enter in a field): the browser would otherwise send the form itself, as a
 * GET with every field, a password among them, in the address.
 */
export function SubmitButton({ disabled, ...props }: Omit<ComponentProps<typeof Button>, 'type'>) {
  const waiting = !useHydrated();
  return <Button {...props} type="submit" disabled={waiting || disabled} data-waiting={waiting ? '' : undefined} />;
}
