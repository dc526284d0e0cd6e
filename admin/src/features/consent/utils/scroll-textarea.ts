/**
 * Scrolls a textarea so the given character offset sits near the top third. Measures with an off-screen copy of the
 * textarea, because wrapped lines make "line × line height" wrong.
 */
export function scrollTextareaToOffset(textarea: HTMLTextAreaElement, offset: number): void {
  const copy = textarea.cloneNode() as HTMLTextAreaElement;
  const style = getComputedStyle(textarea);
  Object.assign(copy.style, {
    position: 'absolute',
    visibility: 'hidden',
    left: '-9999px',
    top: '0',
    height: '0',
    width: `${textarea.clientWidth}px`,
    boxSizing: 'content-box',
    paddingTop: '0',
    paddingBottom: '0',
    font: style.font,
    lineHeight: style.lineHeight,
    whiteSpace: style.whiteSpace,
    overflowWrap: style.overflowWrap,
  });
  copy.removeAttribute('id');
  copy.removeAttribute('name');
  copy.value = textarea.value.slice(0, offset);
  document.body.append(copy);
  const top = copy.scrollHeight;
  copy.remove();
  textarea.scrollTop = Math.max(0, top - textarea.clientHeight / 3);
}
