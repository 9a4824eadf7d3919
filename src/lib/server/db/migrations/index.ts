/** Numbered migrations in order; listed by hand so that bundling keeps them. */
import * as initial from './0001-initial';

export const migrations = [{ name: '0001-initial', ...initial }];
