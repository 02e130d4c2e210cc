import type { ReactNode } from 'react';
import { BrandMark } from './brand-mark';

export function AuthLayout({ title, children }: { title: string; children: ReactNode }) {
  return (
    <div className="flex min-h-screen flex-col bg-ink-950 lg:flex-row">
      <div className="flex flex-col justify-between gap-8 px-8 py-10 text-ink-100 lg:w-[42%] lg:px-14 lg:py-14">
        <div className="flex items-center gap-3">
          <BrandMark className="size-9" />
          <span className="text-xl font-semibold tracking-tight text-white">Tetherwise</span>
        </div>
        <div className="max-w-md">
          <p className="text-3xl leading-tight font-semibold text-white">
            Routes, tether swaps and the two-person day, on one station model.
          </p>
          <p className="mt-4 text-sm text-ink-300">
            For EVA planners, hardware engineers and crew trainers working on the same exterior.
          </p>
        </div>
        <p className="text-xs text-ink-300">A planning aid. Check everything against certified procedures.</p>
      </div>
      <main className="flex flex-1 items-center justify-center bg-surface-page px-6 py-12">
        <div className="w-full max-w-sm">
          <h1 className="mb-6 text-2xl font-semibold tracking-tight text-text-strong">{title}</h1>
          {children}
        </div>
      </main>
    </div>
  );
}
