/**
 * The return-after-sign-in target, only when it is a path on this site.
 * Anything else (`//evil.example`, `https://…`, `/\\evil`, `javascript:`) falls back to `fallback`.
 */
export function safeRedirect(raw: unknown, fallback: string): string {
  if (typeof raw !== 'string' || raw.length > 2000) return fallback
  if (!raw.startsWith('/') || raw.startsWith('//') || raw.startsWith('/\\')) return fallback
  if (/[\u0000-\u001f]/.test(raw)) return fallback
  if (raw.startsWith('/sign-in')) return fallback
  return raw
}
