/** Longest file name kept for display. */
const MAX_NAME_CHARS = 200;
const FALLBACK_NAME = 'photo';

/**
 * The name an uploader gave a photo, for display only: any folder part ("../", "C:\") and
 * control characters are dropped. Files on disk are never named after it.
 */
export function displayFileName(raw: string | undefined): string {
  const last = (raw ?? '').split(/[/\\]/).pop() ?? '';
  // eslint-disable-next-line no-control-regex
  const clean = last.replace(/[\u0000-\u001f\u007f]/g, '').replace(/^\.+/, '').trim().slice(0, MAX_NAME_CHARS);
  return clean || FALLBACK_NAME;
}
