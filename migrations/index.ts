/** Every migration in order; the data source runs them on start-up. A merged migration is never edited. */
import { CreatedRecordTables20261201220000 } from './20261201220000-created-record-tables';
import { CreatedRuleSetsAndIdempotencyKeys20261201220100 } from './20261201220100-created-rule-sets-and-idempotency-keys';
import { CreatedIdentitiesAndReviewClosures20261201220200 } from './20261201220200-created-identities-and-review-closures';
import { ChangedRevisionContentToVerbatimJson20261201220300 } from './20261201220300-changed-revision-content-to-verbatim-json';
import { CreatedRuleSetAdoptions20261201220400 } from './20261201220400-created-rule-set-adoptions';
import { GuardedChainHeadsAndRuleTables20261201220500 } from './20261201220500-guarded-chain-heads-and-rule-tables';
import { CreatedAppendRevisionFunction20261201220600 } from './20261201220600-created-append-revision-function';
import { AddedLinkVersionsAndTokenIds20261202100000 } from './20261202100000-added-link-versions-and-token-ids';
import { ReplacedAppendRevisionWithOwnedChainFunctions20261202100100 } from './20261202100100-replaced-append-revision-with-owned-chain-functions';
import { CreatedReassignmentIndex20261202100200 } from './20261202100200-created-reassignment-index';
import { CreatedCommentRateIndex20261202110000 } from './20261202110000-created-comment-rate-index';
import { AddedTokenExpiry20261202110100 } from './20261202110100-added-token-expiry';
import { CreatedIdentityEvents20261202110200 } from './20261202110200-created-identity-events';
import { CreatedReassignmentIndex20261202120000 } from './20261202120000-created-reassignment-index';
import { ResolvedRevisionProductInAppendFunction20261202130000 } from './20261202130000-resolved-revision-product-in-append-function';
import { CreatedCaseInsensitiveProductCodeIndex20261204220000 } from './20261204220000-created-case-insensitive-product-code-index';
import { SealedLinksAndMovedWritesIntoFunctions20261204230000 } from './20261204230000-sealed-links-and-moved-writes-into-functions';
import { CreatedSigningKeyLedger20261204230100 } from './20261204230100-created-signing-key-ledger';
import { ChainedIdentityEventsAndAdoptions20261204230200 } from './20261204230200-chained-identity-events-and-adoptions';
import { CreatedAccountsAndSessions20261205000000 } from './20261205000000-created-accounts-and-sessions';
import { MovedAccountWritesIntoFunctions20261205000100 } from './20261205000100-moved-account-writes-into-functions';
import { CreatedJobQueueAndOutbox20261205000200 } from './20261205000200-created-job-queue-and-outbox';
import { CreatedDesignDrafts20261206010000 } from './20261206010000-created-design-drafts';
import { CreatedPasskeys20261206030000 } from './20261206030000-created-passkeys';
import { HidPasswordHashesAndReadCurrentRoles20261206030100 } from './20261206030100-hid-password-hashes-and-read-current-roles';
import { CreatedRenderedFiles20261206050000 } from './20261206050000-created-rendered-files';
import { CreatedSharedLimitCounters20261206050100 } from './20261206050100-created-shared-limit-counters';
import { LeasedPerUserAllowances20261206060000 } from './20261206060000-leased-per-user-allowances';
import { CreatedDesignFileJobIndex20261207020000 } from './20261207020000-created-design-file-job-index';
import { CreatedCalculationOpenedEventIndex20261207030000 } from './20261207030000-created-calculation-opened-event-index';

export const MIGRATIONS = [
  CreatedRecordTables20261201220000,
  CreatedRuleSetsAndIdempotencyKeys20261201220100,
  CreatedIdentitiesAndReviewClosures20261201220200,
  ChangedRevisionContentToVerbatimJson20261201220300,
  CreatedRuleSetAdoptions20261201220400,
  GuardedChainHeadsAndRuleTables20261201220500,
  CreatedAppendRevisionFunction20261201220600,
  AddedLinkVersionsAndTokenIds20261202100000,
  ReplacedAppendRevisionWithOwnedChainFunctions20261202100100,
  CreatedReassignmentIndex20261202100200,
  CreatedCommentRateIndex20261202110000,
  AddedTokenExpiry20261202110100,
  CreatedIdentityEvents20261202110200,
  CreatedReassignmentIndex20261202120000,
  ResolvedRevisionProductInAppendFunction20261202130000,
  CreatedCaseInsensitiveProductCodeIndex20261204220000,
  SealedLinksAndMovedWritesIntoFunctions20261204230000,
  CreatedSigningKeyLedger20261204230100,
  ChainedIdentityEventsAndAdoptions20261204230200,
  CreatedAccountsAndSessions20261205000000,
  MovedAccountWritesIntoFunctions20261205000100,
  CreatedJobQueueAndOutbox20261205000200,
  CreatedDesignDrafts20261206010000,
  CreatedPasskeys20261206030000,
  HidPasswordHashesAndReadCurrentRoles20261206030100,
  CreatedRenderedFiles20261206050000,
  CreatedSharedLimitCounters20261206050100,
  LeasedPerUserAllowances20261206060000,
  CreatedDesignFileJobIndex20261207020000,
  CreatedCalculationOpenedEventIndex20261207030000,
];
