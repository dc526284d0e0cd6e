/** Plain text from the api separates paragraphs with a blank line; this gives them one by one, trimmed. */
export function paragraphsOf(text: string): string[] {
  return text
    .replace(/\r\n?/g, '\n')
    .split(/\n[ \t]*\n/)
    .map((paragraph) => paragraph.trim())
    .filter((paragraph) => paragraph !== '');
}

/** 45 → "45 minutes", 90 → "1 hour 30 minutes". */
export function minutesInWords(minutes: number): string {
  const hours = Math.floor(minutes / 60);
  const rest = minutes % 60;
  const minutePart = rest === 1 ? '1 minute' : `${rest} minutes`;
  if (hours === 0) return minutePart;
  const hourPart = hours === 1 ? '1 hour' : `${hours} hours`;
  return rest === 0 ? hourPart : `${hourPart} ${minutePart}`;
}

/** The api words field errors as "does not match; check it"; on screen they start a sentence and end with a stop. */
export function asSentence(message: string): string {
  const trimmed = message.trim();
  const sentence = trimmed.charAt(0).toUpperCase() + trimmed.slice(1);
  return /[.!?]$/.test(sentence) ? sentence : `${sentence}.`;
}
