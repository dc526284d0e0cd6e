// Turns the on-screen flow diagram into standalone SVG and PNG files. The drawing uses the theme's CSS variables,
// which mean nothing outside the page, so each one is replaced by its computed value first.

import { saveBlob } from '@/lib/save-blob';

const VARIABLE = /var\((--[\w-]+)\)/g;

/** The diagram as a standalone SVG document, colours resolved, on a white background. */
export function standaloneSvg(
  svg: SVGSVGElement,
  styles: Pick<CSSStyleDeclaration, 'getPropertyValue'> = getComputedStyle(document.documentElement),
): string {
  const copy = svg.cloneNode(true) as SVGSVGElement;
  copy.removeAttribute('class');
  copy.removeAttribute('style');
  copy.setAttribute('xmlns', 'http://www.w3.org/2000/svg');
  const resolve = (value: string) =>
    value.replace(VARIABLE, (_, name: string) => styles.getPropertyValue(name).trim() || '#000');
  for (const element of [copy, ...Array.from(copy.querySelectorAll('*'))]) {
    for (const attribute of Array.from(element.attributes)) {
      if (attribute.value.includes('var(')) element.setAttribute(attribute.name, resolve(attribute.value));
    }
  }
  const background = document.createElementNS('http://www.w3.org/2000/svg', 'rect');
  background.setAttribute('width', '100%');
  background.setAttribute('height', '100%');
  background.setAttribute('fill', '#ffffff');
  copy.insertBefore(background, copy.firstChild);
  return new XMLSerializer().serializeToString(copy);
}

export function downloadSvg(svg: SVGSVGElement, fileName: string): void {
  saveBlob(new Blob([standaloneSvg(svg)], { type: 'image/svg+xml' }), fileName);
}

/** Draws the standalone SVG on a canvas at twice its size and saves it as PNG. */
export async function downloadPng(svg: SVGSVGElement, fileName: string): Promise<void> {
  const text = standaloneSvg(svg);
  const [, , width, height] = (svg.getAttribute('viewBox') ?? '0 0 800 600').split(/\s+/).map(Number);
  const image = new Image();
  image.src = `data:image/svg+xml;charset=utf-8,${encodeURIComponent(text)}`;
  await image.decode();
  const canvas = document.createElement('canvas');
  canvas.width = Math.ceil((width ?? 800) * 2);
  canvas.height = Math.ceil((height ?? 600) * 2);
  const context = canvas.getContext('2d');
  if (!context) throw new Error('This browser cannot draw the diagram as an image.');
  context.scale(2, 2);
  context.drawImage(image, 0, 0, width ?? 800, height ?? 600);
  const blob = await new Promise<Blob | null>((resolve) => canvas.toBlob(resolve, 'image/png'));
  if (!blob) throw new Error('The image could not be made.');
  saveBlob(blob, fileName);
}
