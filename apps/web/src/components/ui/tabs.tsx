import type { ReactNode } from 'react';
import { cn } from '../../lib/cn.ts';
import { focusItem, rovingTarget } from './roving-keys.ts';

/** Ids that tie a tab to its panel (`aria-controls` / `aria-labelledby`). */
export const tabId = (group: string, key: string) => `${group}-tab-${key}`;
export const panelId = (group: string, key: string) => `${group}-panel-${key}`;

/**
 * A tab list after the WAI-ARIA Authoring Practices tabs pattern: one Tab stop (the selected
 * tab), arrow keys, Home and End move between tabs and select them at once. Render the panel
 * with `<TabPanel group value>` so each tab names its panel and the panel its tab.
 */
export function TabList<T extends string>({
  group,
  label,
  tabs,
  value,
  onChange,
  className,
  tabClassName,
}: {
  /** A page-unique prefix for the ids. */
  group: string;
  label: string;
  tabs: readonly { key: T; label: ReactNode }[];
  value: T;
  onChange: (key: T) => void;
  className?: string;
  tabClassName: (selected: boolean) => string;
}) {
  const current = tabs.findIndex((t) => t.key === value);
  return (
    <div
      role="tablist"
      aria-label={label}
      className={className}
      onKeyDown={(e) => {
        const i = rovingTarget(e, tabs.length, current);
        if (i === null) return;
        onChange(tabs[i]!.key);
        focusItem(e, '[role="tab"]', i);
      }}
    >
      {tabs.map((t) => (
        <button
          key={t.key}
          id={tabId(group, t.key)}
          role="tab"
          type="button"
          aria-selected={t.key === value}
          // Only the selected tab's panel is rendered.
          aria-controls={t.key === value ? panelId(group, t.key) : undefined}
          tabIndex={t.key === value ? 0 : -1}
          onClick={() => onChange(t.key)}
          className={tabClassName(t.key === value)}
        >
          {t.label}
        </button>
      ))}
    </div>
  );
}

export function TabPanel({
  group,
  value,
  className,
  children,
}: {
  group: string;
  value: string;
  className?: string;
  children: ReactNode;
}) {
  return (
    <div
      role="tabpanel"
      id={panelId(group, value)}
      aria-labelledby={tabId(group, value)}
      className={cn(className)}
    >
      {children}
    </div>
  );
}
