/** The archive module: canonical JSON, input hashes, records and the record store (Node only). */
export { canonicalJson, CanonicalJsonError } from "./canonical.ts";
export {
  basisHashData, hashBasisSetFromBuilt, hashedInput, hashHex, inputHash, INPUT_HASH_PATTERN, specBasisAssignment,
} from "./hash.ts";
export type { BasisHashData, HashBasisSet, HashShell, ResolvedBasis } from "./hash.ts";
export { buildRecord, evaluateChecks, failedRecord, jsonSafe, RECORD_FORMAT, recordError } from "./record.ts";
export type {
  BuildRecordInput, CheckResult, CheckStatus, FailedRecordInput, FieldbookRecord, Provenance, ProvenanceInput,
  RecordError, RecordStatus, WallSeconds,
} from "./record.ts";
export {
  acquireLock, checkId, compareVersions, currentVersion, hasRecord, lastGood, listRecords, LOCK_NAME, LockHeldError,
  lockPath, processAlive, recordDir, recordPath, RECORDS_DIR, recordsDir, RecordStoreError, recordText, removeTempFiles,
  versionsOf, withLock, withLockAsync, writeRecord,
} from "./store.ts";
export type { LockInfo, StoreLock, WriteOptions, WriteResult } from "./store.ts";
