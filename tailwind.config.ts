import type { Config } from 'tailwindcss';

// Fieldproof's own palette: deep teal ink, warm brass accent, paper background.
export default {
  content: ['./index.html', './src/**/*.{ts,tsx}'],
  theme: {
    extend: {
      fontFamily: {
        sans: ['"Noto Sans"', 'system-ui', 'sans-serif'],
      },
      colors: {
        ink: { 50: '#eef6f5', 100: '#d5e9e6', 200: '#a9d2cc', 300: '#76b5ad', 400: '#46948b', 500: '#2a776f', 600: '#1f5f59', 700: '#1a4c48', 800: '#163d3a', 900: '#102c2a' },
        brass: { 50: '#fbf6ea', 100: '#f5e8c6', 200: '#ebcf8a', 300: '#dfb354', 400: '#cf9a2e', 500: '#b27d1f', 600: '#8e6119', 700: '#6c4916' },
        paper: '#f7f5f0',
      },
    },
  },
} satisfies Config;
