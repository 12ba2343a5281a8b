import { SCREENING_CAUTION } from '../../shared/ui/cautions'

/** Escapes text for HTML mail bodies: names typed by users are never markup. */
export const escapeHtml = (s: string) =>
  s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;').replace(/'/g, '&#39;')

export interface Composed {
  subject: string
  text: string
  html: string
}

/**
 * Builds a plain-text and an HTML body from paragraphs and an optional call-to-action link.
 * Every Driftwarden e-mail ends with the screening caution.
 */
export function composeMail(input: { subject: string; greeting: string; paragraphs: string[]; action?: { label: string; url: string }; withCaution?: boolean }): Composed {
  const caution = input.withCaution === false ? [] : [SCREENING_CAUTION.summary, SCREENING_CAUTION.emergency]
  const text = [
    input.greeting,
    '',
    ...input.paragraphs.flatMap((p) => [p, '']),
    ...(input.action ? [`${input.action.label}: ${input.action.url}`, ''] : []),
    ...(caution.length ? ['--', ...caution] : []),
  ].join('\n')
  const p = (s: string) => `<p style="margin:0 0 12px">${escapeHtml(s)}</p>`
  const html = `<!doctype html><html><body style="font-family:Arial,sans-serif;color:#1b2a3a;max-width:620px">
${p(input.greeting)}
${input.paragraphs.map(p).join('\n')}
${input.action ? `<p><a href="${escapeHtml(input.action.url)}" style="background:#14375e;color:#fff;padding:10px 16px;border-radius:4px;text-decoration:none">${escapeHtml(input.action.label)}</a></p><p style="font-size:12px;color:#555">Or paste this link: ${escapeHtml(input.action.url)}</p>` : ''}
${caution.length ? `<div style="border-left:4px solid #c98a00;background:#fff6df;padding:8px 12px;margin-top:16px;font-size:13px"><strong>Caution.</strong> ${caution.map(escapeHtml).join(' ')}</div>` : ''}
</body></html>`
  return { subject: input.subject, text, html }
}
