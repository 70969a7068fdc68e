import { ReleasesSchema1796174875152 } from './1796174875152-ReleasesSchema.ts';
import { ReleaseImmutability1796174875200 } from './1796174875200-ReleaseImmutability.ts';
import { OutboxDropsDeliveredText1796190000000 } from './1796190000000-OutboxDropsDeliveredText.ts';
import { ReleaseFilesInStore1796190000100 } from './1796190000100-ReleaseFilesInStore.ts';
import { ReviewMail1796221817403 } from './1796221817403-ReviewMail.ts';
import { ReleaseVerifications1796223943227 } from './1796223943227-ReleaseVerifications.ts';

/** Listed explicitly, in order, after the core migrations (globs fail under Vitest, STACK.md). */
export const releaseMigrations = [
  ReleasesSchema1796174875152,
  ReleaseImmutability1796174875200,
  OutboxDropsDeliveredText1796190000000,
  ReleaseFilesInStore1796190000100,
  ReviewMail1796221817403,
  ReleaseVerifications1796223943227,
];
