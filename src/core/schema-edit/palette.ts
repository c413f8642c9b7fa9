/**
 * Slot colours: the eight colours of Okabe & Ito (2008), "Color Universal Design (CUD): How to make
 * figures and presentations that are friendly to colorblind people", chosen to stay distinguishable
 * with the common colour-vision deficiencies. Hex values and names from memory. Colour is never the
 * only cue (WCAG 2.2, 1.4.1): the slot name is always shown beside it.
 */
export interface PaletteColour {
  hex: string;
  name: string;
}

/** In proposal order: black last, as text on a black mark needs the most care. */
export const OKABE_ITO: readonly PaletteColour[] = [
  { hex: '#E69F00', name: 'orange' },
  { hex: '#56B4E9', name: 'sky blue' },
  { hex: '#009E73', name: 'bluish green' },
  { hex: '#F0E442', name: 'yellow' },
  { hex: '#0072B2', name: 'blue' },
  { hex: '#D55E00', name: 'vermillion' },
  { hex: '#CC79A7', name: 'reddish purple' },
  { hex: '#000000', name: 'black' },
];

/** The palette entry of `hex` (any case), or undefined when it is not a palette colour. */
export function paletteColourOf(hex: string): PaletteColour | undefined {
  const upper = hex.toUpperCase();
  return OKABE_ITO.find((c) => c.hex === upper);
}

export function colourProblem(colour: string): string | null {
  if (colour === '' || paletteColourOf(colour) !== undefined) return null;
  return `${colour} is not one of the eight colour-blind-safe colours; pick one of the swatches.`;
}

/**
 * Text colour readable on `hex`: black or white, whichever contrasts more (WCAG 2.2 relative luminance
 * and contrast ratio definitions, 1.4.3; the constants from memory).
 */
export function paletteTextOn(hex: string): '#000000' | '#FFFFFF' {
  const channel = (i: number) => {
    const c = parseInt(hex.slice(1 + 2 * i, 3 + 2 * i), 16) / 255;
    return c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
  };
  const luminance = 0.2126 * channel(0) + 0.7152 * channel(1) + 0.0722 * channel(2);
  const onBlack = (luminance + 0.05) / 0.05;
  const onWhite = 1.05 / (luminance + 0.05);
  return onBlack >= onWhite ? '#000000' : '#FFFFFF';
}
