import type { Config } from 'tailwindcss';

// Kfield's own palette: slate neutrals, a deep teal accent, warm amber for warnings.
export default {
  content: ['./index.html', './src/**/*.{ts,tsx}'],
  theme: {
    extend: {
      fontFamily: {
        sans: ['"Roboto Flex"', 'system-ui', 'sans-serif'],
      },
      colors: {
        accent: {
          50: '#eefaf8',
          100: '#d5f2ee',
          200: '#aee4dd',
          500: '#1f8a80',
          600: '#17736b',
          700: '#135c56',
          800: '#114a46',
        },
      },
    },
  },
} satisfies Config;
