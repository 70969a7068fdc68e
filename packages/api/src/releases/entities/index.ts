import { ConformanceRun } from './ConformanceRun.ts';
import { OutboxMail } from './OutboxMail.ts';
import { Release } from './Release.ts';
import { ReleaseDownload } from './ReleaseDownload.ts';
import { ReleaseFile } from './ReleaseFile.ts';
import { ReleaseReview } from './ReleaseReview.ts';
import { ReleaseVerification } from './ReleaseVerification.ts';
import { RtlEstimate } from './RtlEstimate.ts';

export { ConformanceRun, OutboxMail, Release, ReleaseDownload, ReleaseFile, ReleaseReview, ReleaseVerification, RtlEstimate };

/** Listed explicitly for the data source (globs fail under Vitest, STACK.md). */
export const releaseEntities = [Release, ReleaseFile, ReleaseReview, ReleaseDownload, ConformanceRun, OutboxMail, ReleaseVerification, RtlEstimate];
