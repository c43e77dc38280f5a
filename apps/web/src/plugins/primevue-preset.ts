// The theme in one place. The build turns it into the app's PrimeVue stylesheet (vite/primevue-theme.ts), so it
// runs in Node and the browser never loads it.
import { definePreset } from '@primeuix/themes';
import Aura from '@primeuix/themes/aura';
import { darkModeClass } from './dark-mode';

/** Fired brick with lime-mortar neutrals: the 600 step carries white text at better than 4.5:1. */
const brick = {
  50: '#fcf4f1',
  100: '#f8e4dc',
  200: '#f0c5b4',
  300: '#e59f86',
  400: '#d77657',
  500: '#c3573a',
  600: '#a4432b',
  700: '#873624',
  800: '#6e2e21',
  900: '#5b291f',
  950: '#31130d',
};

const slateSurface = {
  0: '#ffffff',
  50: '{slate.50}',
  100: '{slate.100}',
  200: '{slate.200}',
  300: '{slate.300}',
  400: '{slate.400}',
  500: '{slate.500}',
  600: '{slate.600}',
  700: '{slate.700}',
  800: '{slate.800}',
  900: '{slate.900}',
  950: '{slate.950}',
};

/**
 * Aura draws severity buttons, outlined and text buttons and message text from the 500/600 steps, which fall under
 * WCAG's 4.5:1 on white (red.500 with white text is 3.8:1). The light scheme moves them to 700, and hover and press one
 * step darker still.
 */
const severities = ['info', 'success', 'warn', 'help', 'danger'] as const;
const hue: Record<(typeof severities)[number], string> = { info: 'sky', success: 'green', warn: 'orange', help: 'purple', danger: 'red' };
const solidButtons = Object.fromEntries(
  severities.map((severity) => {
    const name = hue[severity];
    return [
      severity,
      {
        background: `{${name}.700}`,
        hoverBackground: `{${name}.800}`,
        activeBackground: `{${name}.900}`,
        borderColor: `{${name}.700}`,
        hoverBorderColor: `{${name}.800}`,
        activeBorderColor: `{${name}.900}`,
        focusRing: { color: `{${name}.700}`, shadow: 'none' },
      },
    ];
  }),
);
const lineButtons = {
  ...Object.fromEntries(severities.map((severity) => [severity, { color: `{${hue[severity]}.700}` }])),
  primary: { color: '{primary.700}' },
  secondary: { color: '{surface.600}' },
};
const messageHue = { info: 'blue', success: 'green', warn: 'yellow', error: 'red' } as const;
const messages = {
  ...Object.fromEntries(
    Object.entries(messageHue).map(([severity, name]) => [
      severity,
      { color: `{${name}.800}`, outlined: { color: `{${name}.800}` }, simple: { color: `{${name}.800}` } },
    ]),
  ),
  secondary: { color: '{surface.700}', outlined: { color: '{surface.700}' }, simple: { color: '{surface.700}' } },
};

export const HodboardPreset = definePreset(Aura, {
  components: {
    button: { colorScheme: { light: { root: solidButtons, outlined: lineButtons, text: lineButtons } } },
    message: { colorScheme: { light: messages } },
    togglebutton: { colorScheme: { light: { root: { color: '{surface.600}' } } } },
  },
  semantic: {
    primary: brick,
    focusRing: { width: '2px', style: 'solid', color: '{primary.color}', offset: '2px' },
    colorScheme: {
      light: {
        surface: slateSurface,
        primary: {
          color: '{primary.600}',
          contrastColor: '#ffffff',
          hoverColor: '{primary.700}',
          activeColor: '{primary.800}',
        },
        highlight: {
          background: '{primary.50}',
          focusBackground: '{primary.100}',
          color: '{primary.800}',
          focusColor: '{primary.900}',
        },
        text: { color: '{surface.800}', hoverColor: '{surface.900}', mutedColor: '{surface.600}', hoverMutedColor: '{surface.700}' },
      },
      dark: {
        surface: slateSurface,
        primary: {
          color: '{primary.400}',
          contrastColor: '{primary.950}',
          hoverColor: '{primary.300}',
          activeColor: '{primary.200}',
        },
        highlight: {
          background: 'color-mix(in srgb, {primary.400}, transparent 84%)',
          focusBackground: 'color-mix(in srgb, {primary.400}, transparent 76%)',
          color: 'rgba(255,255,255,.87)',
          focusColor: 'rgba(255,255,255,.87)',
        },
      },
    },
  },
});

export const themeOptions = { darkModeSelector: `.${darkModeClass}`, cssLayer: false } as const;
