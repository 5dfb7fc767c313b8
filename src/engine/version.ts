/** The engine's version, named in every record and part of every record's storage key. Kept equal to package.json (a test checks). */
export const ENGINE_VERSION = '0.3.0';
export const ENGINE_NAME = 'rhythmetric';
/** Version of the feature-record format; clients refuse versions they do not know. */
export const RECORD_SCHEMA = 'rhythmetric.record/1';
