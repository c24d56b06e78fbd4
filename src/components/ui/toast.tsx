import { createContext, use, useCallback, useEffect, useRef, useState, type ReactNode } from 'react';
import { cn } from '@/lib/cn';

type Toast = { id: number; text: string; tone: 'success' | 'info' | 'error' };
type Notify = (text: string, tone?: Toast['tone']) => void;

const ToastContext = createContext<Notify>(() => undefined);

/** Short confirmations ("Saved") in one polite live region, each gone after a few seconds or when dismissed. */
export function ToastProvider({ children, timeoutMs = 6000 }: { children: ReactNode; timeoutMs?: number }) {
  const [toasts, setToasts] = useState<Toast[]>([]);
  const next = useRef(1);
  const notify = useCallback<Notify>((text, tone = 'success') => {
    const id = next.current++;
    setToasts((all) => [...all.slice(-2), { id, text, tone }]);
  }, []);
  const dismiss = (id: number) => setToasts((all) => all.filter((t) => t.id !== id));
  return (
    <ToastContext value={notify}>
      {children}
      <div
        role="status"
        aria-live={toasts.some((t) => t.tone === 'error') ? 'assertive' : 'polite'}
        className="pointer-events-none fixed inset-x-0 bottom-4 z-50 flex flex-col items-center gap-2 px-4"
      >
        {toasts.map((t) => (
          <ToastItem key={t.id} toast={t} timeoutMs={timeoutMs} onDismiss={() => dismiss(t.id)} />
        ))}
      </div>
    </ToastContext>
  );
}

function ToastItem({ toast, timeoutMs, onDismiss }: { toast: Toast; timeoutMs: number; onDismiss: () => void }) {
  useEffect(() => {
    const timer = setTimeout(onDismiss, timeoutMs);
    return () => clearTimeout(timer);
  }, [onDismiss, timeoutMs]);
  return (
    <div
      className={cn(
        'pointer-events-auto flex max-w-md items-center gap-3 rounded-xl border px-4 py-3 text-sm shadow-xl',
        toast.tone === 'error' ? 'border-red-400/60 bg-red-950 text-red-100' : 'border-foil-600 bg-night-800 text-foil-50',
      )}
    >
      <span className="min-w-0 flex-1">{toast.text}</span>
      <button type="button" onClick={onDismiss} className="rounded px-1 font-bold text-foil-300 hover:text-foil-50">
        <span aria-hidden="true">×</span>
        <span className="sr-only">Dismiss</span>
      </button>
    </div>
  );
}

/** Shows a toast: `const notify = useToast(); notify('Saved')`. */
export function useToast(): Notify {
  return use(ToastContext);
}
