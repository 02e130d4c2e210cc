import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { paths, safeRedirectTo } from '@/config/paths';
import { splitLinks } from '@/features/mailbox/components/linked-text';

describe('safeRedirectTo', () => {
  it('keeps same-origin paths and refuses other sites and the sign-in page itself', () => {
    expect(safeRedirectTo('/plans/3?tab=timeline')).toBe('/plans/3?tab=timeline');
    expect(safeRedirectTo('//evil.example/x')).toBe('/');
    expect(safeRedirectTo('/\\evil.example')).toBe('/');
    expect(safeRedirectTo('https://evil.example')).toBe('/');
    expect(safeRedirectTo(paths.signIn.getHref('/people'))).toBe('/');
    expect(safeRedirectTo(null)).toBe('/');
  });

  it('never yields an address that leaves this origin (property)', () => {
    fc.assert(
      fc.property(
        fc.oneof(
          fc.string(),
          fc.string().map((s) => `/${s}`),
          fc.string().map((s) => `//${s}`),
          fc.tuple(fc.constantFrom('\t', '\n', '\r', '\\', ' '), fc.domain()).map(([c, d]) => `/${c}/${d}`),
        ),
        (value) => {
          const target = new URL(safeRedirectTo(value), 'https://tetherwise.test/');
          expect(target.origin).toBe('https://tetherwise.test');
        },
      ),
    );
  });

  it('round-trips redirectTo through the sign-in address', () => {
    fc.assert(
      fc.property(fc.webPath({ size: 'small' }), (path) => {
        const href = paths.signIn.getHref(path);
        const back = new URL(href, 'https://t.test').searchParams.get('redirectTo') ?? '/';
        expect(back).toBe(path === '' ? '/' : path);
      }),
    );
  });
});

describe('splitLinks', () => {
  it('finds the set-password link in an invitation text, without the full stop after it', () => {
    const link = 'http://localhost:3000/set-password?token=abc_DEF-123';
    const parts = splitLinks(`Set your password here:\n\n${link}.\nThanks`);
    expect(parts).toEqual([
      { kind: 'text', text: 'Set your password here:\n\n' },
      { kind: 'link', href: link },
      { kind: 'text', text: '.\nThanks' },
    ]);
  });

  it('leaves other schemes as text', () => {
    expect(splitLinks('javascript:alert(1) ftp://x.example')).toEqual([
      { kind: 'text', text: 'javascript:alert(1) ftp://x.example' },
    ]);
  });

  it('loses no character and links only http(s) addresses (property)', () => {
    const piece = fc.oneof(
      fc.string(),
      fc.webUrl({ validSchemes: ['http', 'https'] }),
      fc.constantFrom('.', ', ', '\n', ') '),
    );
    fc.assert(
      fc.property(fc.array(piece, { maxLength: 8 }), (pieces) => {
        const text = pieces.join('');
        const parts = splitLinks(text);
        expect(parts.map((p) => (p.kind === 'link' ? p.href : p.text)).join('')).toBe(text);
        for (const part of parts) {
          if (part.kind === 'link') {
            expect(part.href).toMatch(/^https?:\/\/\S+$/);
            expect(part.href).not.toMatch(/[.,;:!?)\]]$/);
          }
        }
      }),
    );
  });
});
