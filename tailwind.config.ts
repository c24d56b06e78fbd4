import type { Config } from 'tailwindcss';

// Lightkeel's own identity: deep night blue, sail-foil silver, a sunlight-amber accent.
export default {
  content: ['./index.html', './src/**/*.{ts,tsx}'],
  theme: {
    extend: {
      colors: {
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
          500: '#7b879b',
          600: '#636e81',
          700: '#515a69',
          800: '#454c58',
          900: '#3c424c',
        },
        amber: {
          300: '#ffd27a',
          400: '#ffbe45',
          500: '#f5a21b',
          600: '#d9820b',
          700: '#b3620b',
        },
      },
      fontFamily: {
        sans: ['"Nunito Sans"', 'system-ui', 'sans-serif'],
      },
    },
  },
} satisfies Config;
