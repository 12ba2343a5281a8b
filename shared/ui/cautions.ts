/**
 * The caution wording shown with every screening result and response plan.
 * Kept here, free of any UI code, so the web client, PDFs and e-mails say exactly the same thing.
 */
export const SCREENING_CAUTION = {
  heading: 'Screening estimate, not a safety determination',
  /** One sentence for compact banners and e-mail footers. */
  summary:
    'Screening estimate only: real concentrations can be higher in places, and local codes, the authority having jurisdiction and qualified professionals have the final word.',
  points: [
    'Driftwarden results come from a simplified screening model. Real concentrations can be higher in places, for example along a jet, where air mixes poorly, or where a dense gas pools near the floor.',
    'It does not replace the site emergency action plan or the judgement of qualified people such as industrial hygienists and licensed engineers.',
    'Local codes and the authority having jurisdiction govern. Exposure limits are revised over time, so verify the current values before you rely on them.',
  ],
  emergency: 'In an emergency: evacuate, raise the alarm and call emergency services. Do not use this tool during a live incident.',
} as const

/**
 * The full caution as plain lines, with context-specific lines (for example "Jet release: reach along the jet
 * axis is understated") placed after the general points and before the emergency line.
 */
export function screeningCautionLines(extraLines: readonly string[] = []): string[] {
  return [SCREENING_CAUTION.heading, ...SCREENING_CAUTION.points, ...extraLines, SCREENING_CAUTION.emergency]
}

/** The full caution as one plain-text block (e-mails, PDF footers). */
export function screeningCautionText(extraLines: readonly string[] = []): string {
  return screeningCautionLines(extraLines).join('\n')
}
