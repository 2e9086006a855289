'use client';

import { signOutTo } from '@/components/auth/credentials';

export function SignOutButton({ className = '' }: { className?: string }) {
  return (
    <button type="button" className={className} onClick={() => void signOutTo('/')}>
      Sign out
    </button>
  );
}
