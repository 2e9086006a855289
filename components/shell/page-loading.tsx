/** What a section shows while its page loads (each section's `loading.tsx`). */
export function PageLoading() {
  return (
    <div role="status" aria-live="polite" className="flex items-center gap-3 py-10 text-stone-600">
      <span className="h-5 w-5 animate-spin rounded-full border-2 border-fir-300 border-t-fir-700" aria-hidden="true" />
      Loading…
    </div>
  );
}
