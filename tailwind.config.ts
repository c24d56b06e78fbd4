import type { Config } from 'tailwindcss';
import plugin from 'tailwindcss/plugin';

// Lightkeel's own identity: deep night blue, sail-foil silver, a sunlight-amber accent.
//
// Two themes from one set of names: every colour below is a CSS variable, set by the plugin at the end for the
// dark theme (the default), the light theme (chosen with the header's toggle, kept in localStorage as
// `lk-theme`, applied by public/theme.js before the page paints) and the system preference when nothing is
// chosen. In the light theme the scales turn over: `night` names the surfaces (950 the page, 900 a card), `foil`
// the text (50 the strongest), and `amber` darkens so that amber text and buttons keep AA contrast on white.

type Scale = Record<string, string>;
type Palette = { night: Scale; foil: Scale; amber: Scale; extra?: Record<string, string> };

export const darkPalette: Palette = {
  night: {
    50: '#eef2fb',
    100: '#d6def2',
    200: '#aebde4',
    300: '#7d93cf',
    400: '#5069b3',
    500: '#344c96',
    600: '#263a7a',
    700: '#1c2c60',
    800: '#131f47',
    900: '#0b1431',
    950: '#060b1f',
  },
  foil: {
    50: '#f7f8fa',
    100: '#eceff3',
    200: '#d9dee6',
    300: '#bcc4d1',
    400: '#98a3b5',
    500: '#8390a4',
    600: '#636e81',
    700: '#515a69',
    800: '#454c58',
    900: '#3c424c',
  },
  amber: { 300: '#ffd27a', 400: '#ffbe45', 500: '#f5a21b', 600: '#d9820b', 700: '#b3620b' },
};

export const lightPalette: Palette = {
  night: {
    50: '#0b1431',
    100: '#1c2c60',
    200: '#263a7a',
    300: '#344c96',
    400: '#5069b3',
    500: '#8e9bbb',
    600: '#c3cbdc',
    700: '#d9dfeb',
    800: '#e9edf5',
    900: '#ffffff',
    950: '#f5f6f9',
  },
  foil: {
    50: '#0a1022',
    100: '#161d30',
    200: '#283044',
    300: '#3b4457',
    400: '#4a5365',
    500: '#565f72',
    600: '#747e92',
    700: '#c4cbd7',
    800: '#dde2ea',
    900: '#eef1f5',
  },
  amber: { 300: '#874500', 400: '#934d00', 500: '#7a3f00', 600: '#6b3700', 700: '#5c2f00' },
  // Tailwind's own red, emerald and pale amber shades, used by alerts and badges, turned over the same way.
  extra: {
    '--color-amber-100': '#5c2f00',
    '--color-amber-200': '#6b3700',
    '--color-amber-950': '#fff3d6',
    '--color-red-100': '#5f1414',
    '--color-red-200': '#7a1b1b',
    '--color-red-300': '#9b1c1c',
    '--color-red-400': '#c53030',
    '--color-red-950': '#fdecec',
    '--color-emerald-100': '#053d2c',
    '--color-emerald-200': '#065f46',
    '--color-emerald-400': '#059669',
    '--color-emerald-950': '#e3f6ee',
  },
};

function variables(p: Palette): Record<string, string> {
  const out: Record<string, string> = {};
  for (const name of ['night', 'foil', 'amber'] as const)
    for (const [step, value] of Object.entries(p[name])) out[`--lk-${name}-${step}`] = value;
  return { ...out, ...p.extra };
}

const referTo = (name: 'night' | 'foil' | 'amber') =>
  Object.fromEntries(Object.keys(darkPalette[name]).map((step) => [step, `var(--lk-${name}-${step})`]));

export default {
  content: ['./index.html', './src/**/*.{ts,tsx}'],
  theme: {
    extend: {
      colors: { night: referTo('night'), foil: referTo('foil'), amber: referTo('amber') },
      fontFamily: {
        sans: ['"Nunito Sans"', 'system-ui', 'sans-serif'],
      },
    },
  },
  plugins: [
    plugin(({ addBase }) => {
      const light = { ...variables(lightPalette), colorScheme: 'light' };
      addBase({
        ':root': { ...variables(darkPalette), colorScheme: 'dark' },
        ':root[data-theme="light"]': light,
        '@media (prefers-color-scheme: light)': { ':root:not([data-theme="dark"])': light },
      });
    }),
  ],
} satisfies Config;
