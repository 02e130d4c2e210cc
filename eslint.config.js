import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import js from '@eslint/js';
import importPlugin from 'eslint-plugin-import';
import reactHooks from 'eslint-plugin-react-hooks';
import globals from 'globals';
import tseslint from 'typescript-eslint';

const root = path.dirname(fileURLToPath(import.meta.url));
const ALIASES = { '@/': 'src/', '@shared/': 'shared/' };
const EXTENSIONS = ['.ts', '.tsx', '.js', '.mjs', '.cjs', '.json'];

/**
 * eslint-plugin-import resolver for the tsconfig path aliases and extension-less TypeScript imports.
 * It lives in this file (which names itself as the resolver below) because no TypeScript resolver
 * package is among the pinned dependencies; Node 20.19+ can require() this ES module.
 */
export const interfaceVersion = 2;
export function resolve(source, file) {
  const alias = Object.keys(ALIASES).find((prefix) => source.startsWith(prefix));
  let base;
  if (alias) base = path.join(root, ALIASES[alias], source.slice(alias.length));
  else if (source.startsWith('.')) base = path.resolve(path.dirname(file), source);
  else return { found: false };
  const candidates = [
    base,
    ...EXTENSIONS.map((ext) => base + ext),
    ...EXTENSIONS.map((ext) => path.join(base, `index${ext}`)),
  ];
  const hit = candidates.find((candidate) => fs.existsSync(candidate) && fs.statSync(candidate).isFile());
  return hit ? { found: true, path: hit } : { found: false };
}

const featuresDir = path.join(root, 'src/features');
const features = fs.existsSync(featuresDir)
  ? fs
      .readdirSync(featuresDir, { withFileTypes: true })
      .filter((d) => d.isDirectory())
      .map((d) => d.name)
  : [];

// STYLE.md "What may import what"
const zones = [
  {
    target: './shared',
    from: ['./src', './server'],
    message: 'shared/ is pure: it may not import src/ or server/.',
  },
  { target: './server', from: './src', message: 'server/ may not import the client.' },
  {
    target: './src',
    from: './server',
    message: 'src/ may not import server/ (not even types): use shared/schemas.',
  },
  {
    target: ['./src/components', './src/lib', './src/config'],
    from: ['./src/features', './src/app'],
    message: 'components, lib and config import no feature and no app route.',
  },
  ...features.map((feature) => ({
    target: `./src/features/${feature}`,
    from: './src/features',
    except: [`./${feature}`],
    message: 'Features do not import each other; compose them in src/app/routes.',
  })),
];

export default tseslint.config(
  { ignores: ['dist/**', 'node_modules/**', 'drizzle/**', 'coverage/**', 'screenshots/**', 'data/**'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    files: ['**/*.{ts,tsx,js,mjs,cjs}'],
    languageOptions: { globals: { ...globals.node } },
    plugins: { import: importPlugin },
    settings: {
      'import/resolver': { [fileURLToPath(import.meta.url)]: {}, node: { extensions: EXTENSIONS } },
      'import/extensions': EXTENSIONS,
    },
    rules: {
      'import/no-cycle': ['error', { ignoreExternal: true }],
      'import/no-restricted-paths': ['error', { zones }],
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
    },
  },
  {
    files: ['src/**/*.{ts,tsx}', 'tests/client/**/*.{ts,tsx}'],
    languageOptions: { globals: { ...globals.browser } },
    ...reactHooks.configs.flat.recommended,
  },
);
