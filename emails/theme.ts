// Brand colours shared with tailwind.config.ts (night blue, sail-foil silver, sunlight amber).
export const emailTheme = {
  night: '#0b1431',
  nightSoft: '#1c2a55',
  silver: '#d9dee6',
  silverDeep: '#5d6778',
  amber: '#f5a21b',
  ink: '#1a2033',
  paper: '#ffffff',
  page: '#eef1f5',
  fontFamily: "'Nunito Sans', 'Segoe UI', Helvetica, Arial, sans-serif",
} as const;
