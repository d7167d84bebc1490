import type { Config } from 'tailwindcss';

// Sablework's tokens (handbook/look.md): colours from the painter's bench. The palette replaces
// Tailwind's own so screens can only use these.
export default {
  content: ['./index.html', './src/**/*.{ts,tsx}'],
  theme: {
    colors: {
      transparent: 'transparent',
      current: 'currentColor',
      white: '#FFFFFF',
      sable: { 900: '#2B211C', 600: '#6B4F3F' },
      primer: { 100: '#F1EFEC', 300: '#D6D2CC' },
      bone: { 50: '#FBF8F3' },
      verdigris: { 600: '#286B5E', 100: '#DCEFEA' },
      varnish: { 500: '#C8871E' },
      oxide: { 600: '#B2432F' },
      glaze: { 500: '#4C5FA3' },
    },
    fontFamily: {
      sans: ['"Inter Variable"', 'Inter', 'system-ui', 'sans-serif'],
      mono: ['ui-monospace', 'SFMono-Regular', 'Menlo', 'monospace'],
    },
    // The six sizes of look.md: 12/14/16/20/24/32.
    fontSize: {
      xs: ['12px', { lineHeight: '1.5' }],
      sm: ['14px', { lineHeight: '1.5' }],
      base: ['16px', { lineHeight: '1.5' }],
      lg: ['20px', { lineHeight: '1.4' }],
      xl: ['24px', { lineHeight: '1.3' }],
      '2xl': ['32px', { lineHeight: '1.25' }],
    },
    extend: {
      borderRadius: {
        control: '6px',
        card: '10px',
      },
      boxShadow: {
        // The one shadow level.
        raised: '0 1px 2px rgba(43, 33, 28, 0.08), 0 4px 12px rgba(43, 33, 28, 0.06)',
      },
    },
  },
} satisfies Config;
