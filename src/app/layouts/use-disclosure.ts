import { useCallback, useEffect, useId, useRef, useState } from 'react';

/**
 * A disclosure (a menu or panel opened by a button): its open state, the id its button points at, and the refs for
 * the button and the element around both. It closes on Escape (focus returns to its button) or on a click outside.
 */
export function useDisclosure<C extends HTMLElement = HTMLDivElement>() {
  const [open, setOpen] = useState(false);
  const id = useId();
  const container = useRef<C>(null);
  const button = useRef<HTMLButtonElement>(null);
  const close = useCallback(() => setOpen(false), []);
  const toggle = useCallback(() => setOpen((v) => !v), []);

  useEffect(() => {
    if (!open) return;
    const onKey = (event: KeyboardEvent) => {
      if (event.key === 'Escape') {
        close();
        button.current?.focus();
      }
    };
    const onPointer = (event: PointerEvent) => {
      if (container.current && !container.current.contains(event.target as Node)) close();
    };
    document.addEventListener('keydown', onKey);
    document.addEventListener('pointerdown', onPointer);
    return () => {
      document.removeEventListener('keydown', onKey);
      document.removeEventListener('pointerdown', onPointer);
    };
  }, [open, close]);

  return { open, id, container, button, close, toggle };
}
