// Applies the theme chosen with the header's toggle before the page paints (a file, as the CSP allows no inline script).
try {
  var chosen = localStorage.getItem('lk-theme');
  if (chosen === 'light' || chosen === 'dark') document.documentElement.dataset.theme = chosen;
} catch (e) {
  // Storage may be blocked: the system preference applies.
}
