// Phaselot's design: a calm bench-green frame, paper-toned work area, and a compact type scale for
// tables read all day. Status colours are reserved for states (quarantine, pass, fail, hold). Every
// text colour reads at 4.5:1 or more on the card, the paper and the sunk paper, state colours also on
// their own 10 % tint over those (WCAG 2.1 AA).
import type { Config } from 'tailwindcss';

export default {
  content: ['./index.html', './src/**/*.{ts,tsx}'],
  theme: {
    extend: {
      // Below this width the side bar folds into a menu (tablets upright, phones).
      screens: { desk: '900px' },
      colors: {
        frame: { DEFAULT: '#234a41', deep: '#17322c', soft: '#3d6b60', line: '#2f5a50' },
        paper: { DEFAULT: '#f6f5f0', card: '#ffffff', sunk: '#eceae2', line: '#dcd9cd' },
        ink: { DEFAULT: '#1e2421', muted: '#545d58', faint: '#646b66' },
        signal: { DEFAULT: '#f2b84b', deep: '#7c5510' },
        state: {
          quarantine: '#7c5510',
          hold: '#574cae',
          pass: '#246841',
          fail: '#a3302a',
          info: '#295b80',
        },
      },
      fontFamily: {
        sans: ['"Plex Sans"', 'system-ui', 'sans-serif'],
        mono: ['"Plex Mono"', 'ui-monospace', 'monospace'],
      },
      fontSize: {
        '2xs': ['11px', '15px'],
        xs: ['12px', '16px'],
        sm: ['13px', '18px'],
        base: ['14px', '20px'],
        lg: ['16px', '22px'],
        xl: ['19px', '26px'],
        '2xl': ['23px', '30px'],
      },
    },
  },
} satisfies Config;
