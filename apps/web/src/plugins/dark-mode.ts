/** On <html> when the dark scheme is on; the theme's dark tokens and our own dark styles key off it. */
export const darkModeClass = 'hb-dark';
