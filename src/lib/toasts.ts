// A tiny store for transient messages (failed requests, confirmations), read by <Toaster/>.
import { useSyncExternalStore } from 'react';

export interface Toast {
  id: number;
  tone: 'error' | 'ok' | 'info';
  message: string;
}

let toasts: Toast[] = [];
let next = 1;
const listeners = new Set<() => void>();
const emit = () => listeners.forEach((l) => l());

export function showToast(message: string, tone: Toast['tone'] = 'info', ms = 6000) {
  // The same failure from several queries at once shows once.
  if (toasts.some((t) => t.message === message)) return;
  const toast = { id: next++, tone, message };
  toasts = [...toasts, toast].slice(-4);
  emit();
  setTimeout(() => dismissToast(toast.id), ms);
}

export function dismissToast(id: number) {
  toasts = toasts.filter((t) => t.id !== id);
  emit();
}

export function useToasts(): Toast[] {
  return useSyncExternalStore(
    (l) => {
      listeners.add(l);
      return () => listeners.delete(l);
    },
    () => toasts,
  );
}
