import { useEffect, useSyncExternalStore, type ReactNode } from 'react';
import { cn } from '@/lib/cn';

// A tiny store outside React so that non-component code (the query cache's error
// hooks) can raise a toast too.

export type ToastTone = 'success' | 'info' | 'error';

export interface ToastItem {
  id: number;
  tone: ToastTone;
  title: string;
  description?: string;
}

let items: ToastItem[] = [];
let nextId = 1;
const listeners = new Set<() => void>();

function emit() {
  for (const listener of listeners) listener();
}

function push(tone: ToastTone, title: string, description?: string): number {
  const id = nextId++;
  items = [...items, { id, tone, title, description }].slice(-4);
  emit();
  return id;
}

export const toast = {
  success: (title: string, description?: string) => push('success', title, description),
  info: (title: string, description?: string) => push('info', title, description),
  error: (title: string, description?: string) => push('error', title, description),
  dismiss(id: number) {
    items = items.filter((item) => item.id !== id);
    emit();
  },
};

function subscribe(listener: () => void) {
  listeners.add(listener);
  return () => listeners.delete(listener);
}

const toneStyles: Record<ToastTone, { box: string; label: string }> = {
  success: { box: 'border-moss-line bg-moss-bg text-moss-text', label: 'Done' },
  info: { box: 'border-slate-line bg-slate-bg text-slate-text', label: 'Note' },
  error: { box: 'border-brick-line bg-brick-bg text-brick-text', label: 'Problem' },
};

// Errors stay until dismissed so nobody has to read against a clock; confirmations fade.
const AUTO_DISMISS_MS = 6000;

function Toast({ item }: { item: ToastItem }) {
  useEffect(() => {
    if (item.tone === 'error') return;
    const timer = window.setTimeout(() => toast.dismiss(item.id), AUTO_DISMISS_MS);
    return () => window.clearTimeout(timer);
  }, [item]);

  const style = toneStyles[item.tone];
  return (
    <div className={cn('pointer-events-auto flex w-full items-start gap-3 rounded-panel border p-4 shadow-lift', style.box)}>
      <div className="min-w-0 flex-1">
        <p className="text-sm font-semibold">
          <span className="sr-only">{style.label}: </span>
          {item.title}
        </p>
        {item.description ? <p className="mt-1 text-sm">{item.description}</p> : null}
      </div>
      <button
        type="button"
        onClick={() => toast.dismiss(item.id)}
        className="focus-ring -m-1 rounded-control p-1 text-current hover:bg-black/5"
        aria-label={`Dismiss: ${item.title}`}
      >
        <svg aria-hidden="true" viewBox="0 0 20 20" className="size-4" fill="none" stroke="currentColor" strokeWidth="2">
          <path d="M5 5l10 10M15 5L5 15" strokeLinecap="round" />
        </svg>
      </button>
    </div>
  );
}

/** Mounts the two live regions once; they must exist before a message is added to be announced. */
export function ToastProvider({ children }: { children: ReactNode }) {
  const current = useSyncExternalStore(subscribe, () => items, () => items);
  return (
    <>
      {children}
      <div className="pointer-events-none fixed inset-x-0 bottom-0 z-50 flex flex-col items-end gap-2 p-4 sm:left-auto sm:w-96">
        <div role="alert" className="flex w-full flex-col gap-2">
          {current.filter((item) => item.tone === 'error').map((item) => (
            <Toast key={item.id} item={item} />
          ))}
        </div>
        <div role="status" aria-live="polite" className="flex w-full flex-col gap-2">
          {current.filter((item) => item.tone !== 'error').map((item) => (
            <Toast key={item.id} item={item} />
          ))}
        </div>
      </div>
    </>
  );
}
