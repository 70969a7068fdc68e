import { ConformanceRun } from './ConformanceRun.ts';
import { OutboxMail } from './OutboxMail.ts';
import { Release } from './Release.ts';
import { ReleaseDownload } from './ReleaseDownload.ts';
import { ReleaseFile } from './ReleaseFile.ts';
import { ReleaseReview } from './ReleaseReview.ts';

export { ConformanceRun, OutboxMail, Release, ReleaseDownload, ReleaseFile, ReleaseReview };

/** Listed explicitly for the data source (globs fail under Vitest, STACK.md). */
export const releaseEntities = [Release, ReleaseFile, ReleaseReview, ReleaseDownload, ConformanceRun, OutboxMail];
