/**
 * Emberline visual identity: a calm, high-contrast palette of deep ink and slate with a cool teal accent.
 * ANSI Z535.4 safety colours are NOT used here; they live in components/hazard.ts and only on labels and hazard markers.
 */
export const colors = {
  ink: '#0E2230',
  inkSoft: '#33495A',
  muted: '#5B6B78',
  line: '#C9D2DA',
  lineSoft: '#E3E8ED',
  surface: '#FFFFFF',
  canvas: '#F4F6F8',
  accent: '#0B6E78',
  accentInk: '#FFFFFF',
  accentSoft: '#DCEFF0',
  nav: '#0E2230',
  navInk: '#E8EEF2',
  navMuted: '#9FB2C0',
  danger: '#9B1C1C',
  dangerSoft: '#FBE9E9',
  caution: '#7A4B00',
  cautionSoft: '#FFF4DC',
  ok: '#1E6B3A',
  okSoft: '#E2F3E8',
  focus: '#1B7FD1',
} as const;

export const fonts = {
  text: 'Inter',
  textMedium: 'Inter-Medium',
  textBold: 'Inter-Bold',
  /** Tabular figures for every number shown. */
  numbers: 'PlexMono',
  numbersBold: 'PlexMono-SemiBold',
} as const;

export const space = { xs: 4, sm: 8, md: 12, lg: 16, xl: 24, xxl: 32 } as const;
export const radius = { sm: 6, md: 10, lg: 14 } as const;
/** Large touch targets for gloved field use (at least 48 px; common practice, no source). */
export const touch = { min: 48 } as const;
export const breakpoints = { wide: 1024 } as const;
