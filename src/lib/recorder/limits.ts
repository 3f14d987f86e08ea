// How large one chunk of recorded events may be. The server refuses a bigger chunk with 413; the
// recorder cuts its chunks under these limits, so it never sends one the server would refuse.

/** Events in one chunk (the server refuses more). */
export const CHUNK_MAX_EVENTS = 5000;

/** Bytes of one chunk's JSON body (the server refuses more). */
export const CHUNK_MAX_BYTES = 256 * 1024;

/**
 * What the recorder aims for: a page that is closing hands its last chunk to `sendBeacon`, whose
 * body may be at most 64 KiB (Fetch standard, "keepalive" requests share a 64 KiB quota).
 */
export const CHUNK_TARGET_BYTES = 60 * 1024;
