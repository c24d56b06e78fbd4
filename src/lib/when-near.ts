/**
 * Resolves once the element with this id comes within `marginPx` of the viewport or takes keyboard focus — or at
 * once when there is no such element yet (the page is being rendered in the browser, not hydrated from the
 * server's HTML) or no browser at all (server rendering). Used to fetch the code of server-rendered sections
 * below the first screen only when a visitor is about to see them.
 */
export function whenNear(id: string, marginPx = 0): Promise<void> {
  if (typeof document === 'undefined') return Promise.resolve();
  const element = document.getElementById(id);
  if (!element || typeof IntersectionObserver === 'undefined') return Promise.resolve();
  return new Promise((resolve) => {
    const done = () => {
      observer.disconnect();
      element.removeEventListener('focusin', done);
      resolve();
    };
    const observer = new IntersectionObserver((entries) => entries.some((e) => e.isIntersecting) && done(), {
      rootMargin: `0px 0px ${marginPx}px 0px`,
    });
    observer.observe(element);
    element.addEventListener('focusin', done);
  });
}
