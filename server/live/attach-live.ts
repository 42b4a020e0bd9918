/**
 * Former home of the recording wiring, kept as an alias so existing imports still work; the
 * wiring now lives in the composition root. New code imports `server/compose/recording-root.js`.
 */
export {
  SHUTDOWN_FLUSH_MS,
  recordingAttachment as liveAttachment,
  attachRecording as attachLive,
  type RecordingOptions as LiveOptions,
} from '../compose/recording-root.js';
