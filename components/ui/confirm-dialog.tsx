'use client';

import { useEffect, useId, useRef, useState, type ReactNode } from 'react';
import { useAnnounce } from '@/components/shell/announcer';
import { Button } from './button';
import { Notice } from './notice';
import { SubmitButton } from '@/components/forms/submit-button';

/** What a confirmed action answers: nothing or `{ok}` on success, or what went wrong. */
export type ConfirmOutcome =
  { ok: true; message?: string } | { ok: false; error: string; fields?: Record<string, string[]> };

/**
 * The one confirmation for consequential actions (release, reject, suspend, remove, role change,
 * close month, reverse a draw, refund, cancel): a button that opens a modal dialog saying what
 * will happen, with any fields the action needs (a reason, an amount). Errors stay inside the
 * dialog beside their fields; on success the dialog closes and the result is said by the shell's
 * Announcer, which takes keyboard focus — so focus never falls to the page body.
 *
 * `children` may be a function of the field errors, to wire them beside the fields; fields are
 * read from the dialog's form as FormData. Use `fieldId(name)` for unique ids in per-row dialogs.
 */
export function ConfirmDialog({
  trigger,
  triggerLabel,
  triggerVariant = 'secondary',
  triggerClassName,
  title,
  children,
  confirmLabel,
  busyLabel = 'Working…',
  dismissLabel = 'Cancel',
  tone = 'danger',
  disabled,
  beforeOpen,
  onConfirm,
}: {
  trigger: ReactNode;
  /** Accessible name of the trigger when its text alone is ambiguous in a list ("Suspend Ana"). */
  triggerLabel?: string;
  triggerVariant?: 'primary' | 'secondary' | 'danger' | 'ghost';
  triggerClassName?: string;
  title: string;
  children: ReactNode | ((fields: Record<string, string[]>, fieldId: (name: string) => string) => ReactNode);
  confirmLabel: string;
  busyLabel?: string;
  /** The button that closes the dialog without acting ("Keep it" where the action is itself a cancel). */
  dismissLabel?: string;
  tone?: 'danger' | 'primary';
  disabled?: boolean;
  /** Runs before the dialog opens; false keeps it shut (e.g. unsaved values could not be saved). */
  beforeOpen?: () => Promise<boolean> | boolean;
  onConfirm: (data: FormData) => Promise<ConfirmOutcome>;
}) {
  const dialog = useRef<HTMLDialogElement>(null);
  const uid = useId();
  const announce = useAnnounce();
  // The dialog's content exists only while it is open, so a row's text searches and copy find
  // the row, not the sentences of a dialog nobody opened.
  const [isOpen, setIsOpen] = useState(false);
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const [fields, setFields] = useState<Record<string, string[]>>({});
  const fieldId = (name: string) => `${uid}-${name}`;

  async function open() {
    if (beforeOpen && !(await beforeOpen())) return;
    setError(null);
    setFields({});
    setIsOpen(true);
  }
  useEffect(() => {
    if (isOpen && !dialog.current?.open) dialog.current?.showModal();
  }, [isOpen]);
  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    setBusy(true);
    setError(null);
    const out = await onConfirm(new FormData(e.currentTarget));
    setBusy(false);
    if (out.ok) {
      dialog.current?.close();
      if (out.message) announce({ tone: 'ok', text: out.message });
      return;
    }
    setFields(out.fields ?? {});
    setError(Object.keys(out.fields ?? {}).length ? null : out.error);
    if (!Object.keys(out.fields ?? {}).length) return;
    // Field errors: focus the first field named in them, inside the dialog.
    const first = Object.keys(out.fields ?? {})[0];
    const el = first ? dialog.current?.querySelector<HTMLElement>(`[name="${CSS.escape(first)}"]`) : null;
    el?.focus();
  }

  return (
    <>
      <Button
        type="button"
        variant={triggerVariant}
        className={triggerClassName}
        onClick={open}
        disabled={disabled}
        aria-label={triggerLabel}
        aria-haspopup="dialog"
      >
        {trigger}
      </Button>
      <dialog
        ref={dialog}
        onClose={() => setIsOpen(false)}
        aria-labelledby={`${uid}-title`}
        className="m-auto w-[min(36rem,calc(100vw-2rem))] rounded-xl border border-stone-300 p-0 text-stone-900 shadow-xl backdrop:bg-stone-900/50"
      >
        {isOpen ? (
          <form onSubmit={onSubmit} noValidate className="flex flex-col gap-3 p-4">
            <h2 id={`${uid}-title`} className="text-lg font-bold text-fir-900">
              {title}
            </h2>
            {error ? <Notice tone="danger">{error}</Notice> : null}
            {typeof children === 'function' ? children(fields, fieldId) : children}
            <div className="flex flex-wrap gap-2">
              <SubmitButton variant={tone === 'danger' ? 'danger' : 'primary'} disabled={busy}>
                {busy ? busyLabel : confirmLabel}
              </SubmitButton>
              <Button type="button" variant="secondary" onClick={() => dialog.current?.close()}>
                {dismissLabel}
              </Button>
            </div>
          </form>
        ) : null}
      </dialog>
    </>
  );
}
