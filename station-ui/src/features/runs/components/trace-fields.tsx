import type { ReactNode } from 'react';
import classes from './run-detail.module.css';

/** One labelled value of the run detail's traceability block. */
export function Field({ label, children, mono = false, testId }: { label: string; children: ReactNode; mono?: boolean; testId?: string }) {
  return (
    <div className={classes.field}>
      <dt className={classes.fieldLabel}>{label}</dt>
      <dd className={mono ? classes.monoValue : classes.value} data-testid={testId}>
        {children}
      </dd>
    </div>
  );
}

/** A titled list of fields; the list is named by its title for screen readers and tests. */
export function FieldGroup({ title, children }: { title: string; children: ReactNode }) {
  return (
    <div className={classes.group}>
      <h3 className={classes.groupTitle}>{title}</h3>
      <dl className={classes.list} aria-label={title}>
        {children}
      </dl>
    </div>
  );
}

export const missing = <span className={classes.dim}>not recorded</span>;
