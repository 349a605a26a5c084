/**
 * ANSI Z535 safety colours, used ONLY on labels (screen and PDF) and hazard markers (never as UI accents).
 * sRGB approximations of the Z535.1 safety colours (from memory: safety red ≈ Pantone 186 C,
 * safety orange ≈ Pantone 151 C, safety yellow ≈ Pantone 109 C).
 */
export const SAFETY_COLORS = {
  'safety red': '#C8102E',
  'safety orange': '#FF8200',
  'safety yellow': '#FFD100',
  black: '#000000',
  white: '#FFFFFF',
} as const;

export function signalPanelColors(signalWord: 'DANGER' | 'WARNING'): { background: string; text: string } {
  return signalWord === 'DANGER'
    ? { background: SAFETY_COLORS['safety red'], text: SAFETY_COLORS.white }
    : { background: SAFETY_COLORS['safety orange'], text: SAFETY_COLORS.black };
}
