import type { ReactNode } from 'react';
import { BrandMark } from './brand-mark.tsx';
import { SafetyNote } from './safety-note.tsx';

/** Signed-out pages: the product name and one card in the middle. */
export function AuthLayout({ children }: { children: ReactNode }) {
  return (
    <div className="flex min-h-dvh flex-col">
      <main className="flex flex-1 items-center justify-center px-4 py-10">
        <div className="w-full max-w-sm">
          <div className="mb-6 flex items-center gap-3">
            <BrandMark className="size-9" />
            <div>
              <p className="text-lg leading-tight font-semibold tracking-tight">Turnstone</p>
              <p className="text-sm leading-snug text-ink-muted">
                Vibration condition monitoring for motors, pumps, fans, gearboxes and compressors.
              </p>
            </div>
          </div>
          {children}
        </div>
      </main>
      <SafetyNote />
    </div>
  );
}
