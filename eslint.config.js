import fs from 'node:fs';
import { builtinModules } from 'node:module';
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

// What may import what: the layers of DEVELOPERS.md, checked on every import.
const zones = [
  {
    target: './shared',
    from: ['./src', './server'],
    message: 'shared/ is pure: it may not import src/ or server/.',
  },
  { target: './server', from: './src', message: 'server/ may not import the client.' },
  {
    target: './server/modules/**/*.router.ts',
    from: './server/db',
    message: 'Routers translate HTTP and call their service; only services touch the database.',
  },
  {
    target: './src/features',
    from: './src/app',
    message: 'Features do not import the app: routes in src/app compose features, not the other way.',
  },
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

// shared/ runs unchanged in the server, the browser and the tests: no runtime or framework in it
const SHARED_FORBIDDEN = [
  ...builtinModules,
  ...builtinModules.map((m) => `node:${m}`),
  'express',
  'express-*',
  'drizzle-orm',
  'drizzle-orm/*',
  'better-sqlite3',
  'react',
  'react/*',
  'react-dom',
  'react-dom/*',
  '@react-three/*',
  '@tanstack/*',
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
    files: ['shared/**/*.{ts,tsx}'],
    rules: {
      'no-restricted-imports': [
        'error',
        {
          patterns: [
            {
              group: SHARED_FORBIDDEN,
              message:
                'shared/ is pure TypeScript: no Node, Express, Drizzle or React (zod and pure libraries only).',
            },
          ],
        },
      ],
    },
  },
  {
    files: ['src/**/*.{ts,tsx}', 'tests/client/**/*.{ts,tsx}'],
    languageOptions: { globals: { ...globals.browser } },
    ...reactHooks.configs.flat.recommended,
  },
);
