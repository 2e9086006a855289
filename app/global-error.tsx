'use client';

import './globals.css';
import { ErrorState } from '@/components/errors/error-state';

/** Replaces the root layout when it fails itself, so it brings its own html and body. */
export default function GlobalError({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <html lang="en">
      <body className="min-h-screen font-sans">
        <ErrorState error={error} reset={reset} />
      </body>
    </html>
  );
}
