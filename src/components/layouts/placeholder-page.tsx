import type { ReactNode } from 'react';
import { Card } from '@/components/ui/card';
import { PageHeader } from './page-header';

/**
 * A page whose real content is still being built. It says plainly what will be here,
 * so nobody mistakes an empty screen for missing data.
 */
export function PlaceholderPage({ title, description, upcoming }: { title: string; description: ReactNode; upcoming: string[] }) {
  return (
    <>
      <PageHeader title={title} description={description} />
      <Card title="What will appear here" description="This page is not ready yet.">
        <ul className="flex flex-col gap-2 text-sm text-ink">
          {upcoming.map((item) => (
            <li key={item} className="flex items-start gap-2">
              <span aria-hidden="true" className="mt-2 size-1.5 shrink-0 rounded-full bg-copper-500" />
              <span>{item}</span>
            </li>
          ))}
        </ul>
      </Card>
    </>
  );
}
